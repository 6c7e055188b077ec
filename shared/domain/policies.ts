import type { Role } from '../roles';

export interface Actor {
  id: string;
  role: Role;
  siteIds: readonly string[];
}

/** Records belong to a site; people see and act on the sites they work at (administrators on all). */
export const canSeeSite = (actor: Actor, siteId: string) => actor.siteIds.includes(siteId);

export const canManageFleet = (actor: Actor) => actor.role === 'manager' || actor.role === 'admin';
export const canChangeStatus = (actor: Actor) => actor.role !== 'desk';
export const canAdminister = (actor: Actor) => actor.role === 'admin';
