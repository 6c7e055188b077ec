import { useState, type FormEvent } from 'react';
import { useNavigate } from 'react-router-dom';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { SetupSchema } from '../../../../shared/schemas/auth';
import { useSetup } from '../api';
import { AuthFrame } from '../components/auth-frame';

/** The first start on an empty database asks for the first administrator and site. */
export function SetupRoute() {
  const setup = useSetup();
  const navigate = useNavigate();
  const [form, setForm] = useState({ name: '', email: '', password: '', siteName: '', timeZone: Intl.DateTimeFormat().resolvedOptions().timeZone });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const set = (k: keyof typeof form) => (e: { target: { value: string } }) => setForm({ ...form, [k]: e.target.value });
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = SetupSchema.safeParse(form);
    if (!parsed.success) return setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
    setErrors({});
    setup.mutate(parsed.data, { onSuccess: () => navigate('/admin/people', { replace: true }) });
  };
  const err = setup.error instanceof ApiError ? setup.error : null;
  const e = (k: string) => errors[k] ?? err?.field(k);
  return (
    <AuthFrame title="Set up Lashline">
      <p className="mb-4 text-ink-soft">This database is empty. Create the first administrator and your first site.</p>
      <form onSubmit={submit} noValidate className="flex flex-col gap-4">
        <TextField label="Your name" value={form.name} onChange={set('name')} error={e('name')} />
        <TextField label="E-mail" type="email" value={form.email} onChange={set('email')} error={e('email')} />
        <TextField label="Password" type="password" autoComplete="new-password" value={form.password} onChange={set('password')} error={e('password')} hint="At least 8 characters; a phrase is best." />
        <TextField label="First site" value={form.siteName} onChange={set('siteName')} error={e('siteName')} hint="e.g. the depot or the training ground" />
        <TextField label="Time zone" value={form.timeZone} onChange={set('timeZone')} error={e('timeZone')} />
        {err && !err.details.length && <p role="alert" className="text-state-stop">{err.message}</p>}
        <Button type="submit" disabled={setup.isPending}>Create and sign in</Button>
      </form>
    </AuthFrame>
  );
}
