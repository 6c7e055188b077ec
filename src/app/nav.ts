import type { Role } from '../../shared/roles';

export interface NavItem {
  to: string;
  label: string;
}

/** Navigation follows the role: each sees what their work needs, and the first item is where they land. */
const NAV: Record<Role, NavItem[]> = {
  desk: [
    { to: '/check-in', label: 'Check-in' },
    { to: '/fleet', label: 'Fleet' },
  ],
  technician: [
    { to: '/tasks', label: 'My tasks' },
    { to: '/check-in', label: 'Check-in' },
    { to: '/fleet', label: 'Fleet' },
    { to: '/stock', label: 'Shim stock' },
  ],
  manager: [
    { to: '/this-week', label: 'This week' },
    { to: '/fleet', label: 'Fleet' },
    { to: '/tasks', label: 'Tasks' },
    { to: '/check-in', label: 'Check-in' },
    { to: '/valves', label: 'Valve trends' },
    { to: '/stock', label: 'Shim stock' },
    { to: '/plans', label: 'Models and plans' },
    { to: '/import', label: 'Import' },
  ],
  admin: [
    { to: '/admin/people', label: 'People' },
    { to: '/admin/sites', label: 'Sites' },
    { to: '/admin/mail', label: 'Mail and jobs' },
    { to: '/admin/settings', label: 'Settings' },
    { to: '/admin/backup', label: 'Backup' },
    { to: '/fleet', label: 'Fleet' },
    { to: '/this-week', label: 'This week' },
    { to: '/plans', label: 'Models and plans' },
  ],
};

export const navFor = (role: Role) => NAV[role];
