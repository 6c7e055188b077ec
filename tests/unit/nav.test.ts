import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { navFor } from '../../src/app/nav';
import { ROLES, ROLE_HOME } from '../../shared/roles';

const router = readFileSync(new URL('../../src/app/router.tsx', import.meta.url), 'utf8');

describe('navigation per role', () => {
  it.each(ROLES)('starts with where %s lands, lists each screen once, and every screen has a route', (role) => {
    const nav = navFor(role);
    expect(nav[0].to).toBe(ROLE_HOME[role]);
    expect(new Set(nav.map((n) => n.to)).size).toBe(nav.length);
    for (const n of nav) expect(router).toContain(`'${n.to}'`);
  });

  it('names the technician’s tasks as their own and the manager’s as everyone’s', () => {
    expect(navFor('technician').find((n) => n.to === '/tasks')?.label).toBe('My tasks');
    expect(navFor('manager').find((n) => n.to === '/tasks')?.label).toBe('Tasks');
    expect(navFor('desk').map((n) => n.to)).toEqual(['/check-in', '/bookings', '/fleet']);
  });

  it.each(['technician', 'manager'] as const)('shows %s parts and stock right after shim stock', (role) => {
    const to = navFor(role).map((n) => n.to);
    expect(to[to.indexOf('/stock') + 1]).toBe('/parts');
    expect(navFor(role).find((n) => n.to === '/parts')?.label).toBe('Parts and stock');
  });

  it.each(['desk', 'admin'] as const)('keeps parts and stock off the %s menu', (role) => {
    expect(navFor(role).some((n) => n.to === '/parts')).toBe(false);
  });
});
