export const ROLES = ['admin', 'manager', 'technician', 'desk'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Administrator',
  manager: 'Fleet manager',
  technician: 'Technician',
  desk: 'Front desk',
};

/** Where each role lands after signing in. */
export const ROLE_HOME: Record<Role, string> = {
  admin: '/admin/people',
  manager: '/this-week',
  technician: '/tasks',
  desk: '/check-in',
};
