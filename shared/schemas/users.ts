import { z } from 'zod';
import { ROLES } from '../roles';
import { IdSchema } from './common';
import { PasswordSchema } from './auth';

export const UserSchema = z.object({
  id: IdSchema,
  email: z.string(),
  name: z.string(),
  role: z.enum(ROLES),
  disabled: z.boolean(),
  siteIds: z.array(IdSchema),
  hasPassword: z.boolean(),
});
export type User = z.infer<typeof UserSchema>;
export const UserListSchema = z.object({ items: z.array(UserSchema) });

export const InviteSchema = z.object({
  name: z.string().trim().min(1, 'Enter the person’s name.').max(120),
  email: z.string().trim().toLowerCase().email('Enter an e-mail address, e.g. name@example.test.').max(254),
  role: z.enum(ROLES, { message: 'Choose a role: admin, manager, technician or desk.' }),
  siteIds: z.array(IdSchema).min(1, 'Choose at least one site.'),
});
export type Invite = z.infer<typeof InviteSchema>;
export const InviteResultSchema = z.object({ user: UserSchema, invitePath: z.string() });

export const UserUpdateSchema = z
  .object({
    role: z.enum(ROLES).optional(),
    disabled: z.boolean().optional(),
    siteIds: z.array(IdSchema).min(1, 'Choose at least one site.').optional(),
    name: z.string().trim().min(1).max(120).optional(),
  })
  .refine((v) => Object.keys(v).length > 0, 'Send at least one of role, disabled, siteIds, name.');
export type UserUpdate = z.infer<typeof UserUpdateSchema>;

export const AcceptInviteSchema = z.object({
  token: z.string().min(20).max(200),
  password: PasswordSchema,
});
