import { useQuery } from '@tanstack/react-query';
import { DataTable, type Columns } from '../../../components/ui/data-table';
import { ErrorPanel, Loading, PageHeader } from '../../../components/ui/states';
import { referenceQueries } from '../../../lib/reference-queries';
import { useMe } from '../../../lib/use-me';
import { ROLES, ROLE_LABELS, type Role } from '../../../../shared/roles';
import type { User } from '../../../../shared/schemas/users';
import { userQueries, useUpdateUser } from '../api';
import { InviteForm } from '../components/invite-form';

function RoleCell({ user }: { user: User }) {
  const update = useUpdateUser();
  const me = useMe();
  return (
    <select
      aria-label={`Role of ${user.name}`}
      className="min-h-tap rounded-card border-2 border-ink-line bg-paper-raised px-2"
      value={user.role}
      disabled={user.id === me.id || update.isPending}
      onChange={(e) => update.mutate({ id: user.id, role: e.target.value as Role })}
    >
      {ROLES.map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
    </select>
  );
}

function AccessCell({ user }: { user: User }) {
  const update = useUpdateUser();
  const me = useMe();
  if (user.id === me.id) return <span className="text-ink-muted">you</span>;
  return (
    <button
      type="button"
      className={`min-h-tap rounded-card border-2 px-3 font-semibold ${user.disabled ? 'border-state-ok' : 'border-state-stop text-state-stop'}`}
      disabled={update.isPending}
      onClick={() => update.mutate({ id: user.id, disabled: !user.disabled })}
    >
      {user.disabled ? 'Enable account' : 'Disable account'}
    </button>
  );
}

export function PeopleRoute() {
  const users = useQuery(userQueries.list());
  const sites = useQuery(referenceQueries.sites());
  const siteName = (id: string) => sites.data?.items.find((s) => s.id === id)?.name ?? '…';
  const columns: Columns<User> = [
    { id: 'name', accessorKey: 'name', header: 'Name', cell: (c) => <span className="font-semibold">{c.row.original.name}</span> },
    { id: 'email', accessorKey: 'email', header: 'E-mail' },
    { id: 'role', accessorKey: 'role', header: 'Role', cell: (c) => <RoleCell user={c.row.original} /> },
    { id: 'sites', accessorFn: (u) => u.siteIds.map(siteName).join(', '), header: 'Sites' },
    {
      id: 'state',
      accessorFn: (u) => (u.disabled ? 'Disabled' : u.hasPassword ? 'Active' : 'Invited'),
      header: 'Account',
    },
    { id: 'access', header: '', enableSorting: false, cell: (c) => <AccessCell user={c.row.original} /> },
  ];
  return (
    <>
      <PageHeader title="People" />
      <div className="flex flex-col gap-6">
        <InviteForm />
        {users.isPending ? <Loading what="people" /> : users.error ? <ErrorPanel error={users.error} /> : (
          <DataTable caption="People" columns={columns} data={users.data.items} initialSort={[{ id: 'name', desc: false }]} />
        )}
      </div>
    </>
  );
}
