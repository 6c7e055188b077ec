import type { Role } from '../../shared/roles';

export interface NavItem {
  to: string;
  label: string;
  roles: Role[];
}

/** Navigation follows the role: each sees what their work needs, first thing first. */
export const NAV: NavItem[] = [
  { to: '/fleet', label: 'Fleet', roles: ['manager', 'technician', 'desk', 'admin'] },
  { to: '/admin/people', label: 'People', roles: ['admin'] },
  { to: '/admin/sites', label: 'Sites', roles: ['admin'] },
];

export const navFor = (role: Role) => NAV.filter((n) => n.roles.includes(role));
