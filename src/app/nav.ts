import { ROLE_HOME, type Role } from '../../shared/roles';

export interface NavItem {
  to: string;
  label: string;
}

interface NavEntry extends NavItem {
  roles: readonly Role[];
  /** A role that sees the same screen under another name: the technician's tasks are their own. */
  labelFor?: Partial<Record<Role, string>>;
}

/** Every screen in the navigation once, in the order the bar shows them. */
const ENTRIES: readonly NavEntry[] = [
  { to: '/admin/people', label: 'People', roles: ['admin'] },
  { to: '/admin/sites', label: 'Sites', roles: ['admin'] },
  { to: '/admin/mail', label: 'Mail and jobs', roles: ['admin'] },
  { to: '/admin/settings', label: 'Settings', roles: ['admin'] },
  { to: '/admin/backup', label: 'Backup', roles: ['admin'] },
  { to: '/this-week', label: 'This week', roles: ['manager', 'admin'] },
  { to: '/tasks', label: 'Tasks', roles: ['technician', 'manager'], labelFor: { technician: 'My tasks' } },
  { to: '/plan', label: 'Plan', roles: ['technician', 'manager', 'admin'] },
  { to: '/workshop', label: 'Workshop', roles: ['manager', 'admin'] },
  { to: '/check-in', label: 'Check-in', roles: ['desk', 'technician', 'manager'] },
  { to: '/bookings', label: 'Bookings', roles: ['desk', 'manager', 'admin'] },
  { to: '/fleet', label: 'Fleet', roles: ['desk', 'technician', 'manager', 'admin'] },
  { to: '/valves', label: 'Valve trends', roles: ['manager'] },
  { to: '/stock', label: 'Shim stock', roles: ['technician', 'manager'] },
  { to: '/parts', label: 'Parts and stock', roles: ['technician', 'manager'] },
  { to: '/plans', label: 'Models and plans', roles: ['manager', 'admin'] },
  { to: '/import', label: 'Import', roles: ['manager'] },
];

/** Navigation follows the role: each sees what their work needs, and the first item is where they land. */
export function navFor(role: Role): NavItem[] {
  const mine = ENTRIES.filter((e) => e.roles.includes(role)).map((e) => ({ to: e.to, label: e.labelFor?.[role] ?? e.label }));
  return [...mine.filter((n) => n.to === ROLE_HOME[role]), ...mine.filter((n) => n.to !== ROLE_HOME[role])];
}
