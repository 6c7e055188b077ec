import { useState, type FormEvent } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { Button } from '../../../components/ui/button';
import { DataTable, type Columns } from '../../../components/ui/data-table';
import { TextField } from '../../../components/ui/field';
import { ErrorPanel, Loading, PageHeader } from '../../../components/ui/states';
import { ApiError } from '../../../lib/api-client';
import { referenceQueries } from '../../../lib/reference-queries';
import { SiteCreateSchema, type Site } from '../../../../shared/schemas/reference';
import { useCreateSite } from '../api';

const columns: Columns<Site> = [
  { id: 'name', accessorKey: 'name', header: 'Site' },
  { id: 'tz', accessorKey: 'timeZone', header: 'Time zone' },
  { id: 'bays', accessorKey: 'bays', header: 'Workshop bays', cell: (c) => <span className="num">{c.row.original.bays}</span> },
];

export function SitesRoute() {
  const sites = useQuery(referenceQueries.sites());
  const create = useCreateSite();
  const [form, setForm] = useState({ name: '', timeZone: 'Europe/London', bays: '1' });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = SiteCreateSchema.safeParse({ ...form, bays: Number(form.bays) });
    if (!parsed.success) return setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
    setErrors({});
    create.mutate(parsed.data, { onSuccess: () => setForm({ name: '', timeZone: form.timeZone, bays: '1' }) });
  };
  const err = create.error instanceof ApiError ? create.error : null;
  return (
    <>
      <PageHeader title="Sites" />
      <form onSubmit={submit} noValidate aria-label="Add a site" className="mb-6 grid gap-4 rounded-card border-2 border-ink-line bg-paper-raised p-5 md:grid-cols-4">
        <TextField label="Name" value={form.name} onChange={(x) => setForm({ ...form, name: x.target.value })} error={errors.name ?? err?.field('name')} />
        <TextField label="Time zone" value={form.timeZone} onChange={(x) => setForm({ ...form, timeZone: x.target.value })} error={errors.timeZone ?? err?.field('timeZone')} hint="Due dates follow the site's calendar." />
        <TextField label="Workshop bays" inputMode="numeric" value={form.bays} onChange={(x) => setForm({ ...form, bays: x.target.value })} error={errors.bays}
          hint={<>Named Bay 1, Bay 2 …; rename them and set opening hours and working time under <Link to="/workshop" className="text-accent underline">Workshop</Link>.</>} />
        <div className="flex items-end"><Button type="submit" disabled={create.isPending}>Add site</Button></div>
        {err && !err.details.length && <p role="alert" className="text-state-stop md:col-span-4">{err.message}</p>}
      </form>
      {sites.isPending ? <Loading what="sites" /> : sites.error ? <ErrorPanel error={sites.error} /> : <DataTable caption="Sites" columns={columns} data={sites.data.items} />}
    </>
  );
}
