import { useState, type FormEvent } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { referenceQueries } from '../../../lib/reference-queries';
import { ROLES, ROLE_LABELS } from '../../../../shared/roles';
import { InviteSchema } from '../../../../shared/schemas/users';
import { useInvite } from '../api';

export function InviteForm() {
  const invite = useInvite();
  const sites = useQuery(referenceQueries.sites());
  const [form, setForm] = useState({ name: '', email: '', role: 'desk', siteIds: [] as string[] });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [link, setLink] = useState<string>();
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = InviteSchema.safeParse(form);
    if (!parsed.success) return setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
    setErrors({});
    invite.mutate(parsed.data, {
      onSuccess: (r) => {
        setLink(`${window.location.origin}${r.invitePath}`);
        setForm({ name: '', email: '', role: form.role, siteIds: form.siteIds });
      },
    });
  };
  const err = invite.error instanceof ApiError ? invite.error : null;
  const e = (k: string) => errors[k] ?? err?.field(k);
  const toggleSite = (id: string) =>
    setForm({ ...form, siteIds: form.siteIds.includes(id) ? form.siteIds.filter((s) => s !== id) : [...form.siteIds, id] });
  return (
    <form onSubmit={submit} noValidate aria-label="Invite a person" className="grid gap-4 rounded-card border-2 border-ink-line bg-paper-raised p-5 md:grid-cols-4">
      <h2 className="text-xl font-bold md:col-span-4">Invite a person</h2>
      <TextField label="Name" value={form.name} onChange={(x) => setForm({ ...form, name: x.target.value })} error={e('name')} />
      <TextField label="E-mail" type="email" value={form.email} onChange={(x) => setForm({ ...form, email: x.target.value })} error={e('email')} />
      <SelectField label="Role" value={form.role} onChange={(x) => setForm({ ...form, role: x.target.value })} error={e('role')}>
        {ROLES.map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
      </SelectField>
      <fieldset>
        <legend className="mb-1 font-semibold">Sites</legend>
        {sites.data?.items.map((s) => (
          <label key={s.id} className="flex min-h-tap items-center gap-2">
            <input type="checkbox" className="h-5 w-5" checked={form.siteIds.includes(s.id)} onChange={() => toggleSite(s.id)} />
            {s.name}
          </label>
        ))}
        {e('siteIds') && <p role="alert" className="text-sm text-state-stop">⚠ {e('siteIds')}</p>}
      </fieldset>
      <div className="md:col-span-4">
        <Button type="submit" disabled={invite.isPending}>Create invitation</Button>
        {err && !err.details.length && <p role="alert" className="mt-2 text-state-stop">{err.message}</p>}
        {link && (
          <p className="mt-3 rounded-card bg-state-ok-soft p-3">
            Invitation ready. Send this link to the person; it works once, for 7 days:{' '}
            <code className="break-all font-semibold">{link}</code>
          </p>
        )}
      </div>
    </form>
  );
}
