import { z } from 'zod';
import { ROLES } from '../roles';
import { IdSchema } from './common';

export const PASSWORD_MIN = 8;
export const PASSWORD_MAX = 128;

export const LoginSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter your e-mail address, e.g. name@example.test.').max(254),
  password: z.string().min(1, 'Enter your password.').max(PASSWORD_MAX),
});
export type Login = z.infer<typeof LoginSchema>;

export const SessionUserSchema = z.object({
  id: IdSchema,
  email: z.string(),
  name: z.string(),
  role: z.enum(ROLES),
  siteIds: z.array(IdSchema),
});
export type SessionUser = z.infer<typeof SessionUserSchema>;

export const MeSchema = z.object({ user: SessionUserSchema });
export const LoginResultSchema = z.object({ user: SessionUserSchema, csrfToken: z.string() });
export const CsrfSchema = z.object({ token: z.string() });

export const PasswordSchema = z
  .string()
  .min(PASSWORD_MIN, `Use at least ${PASSWORD_MIN} characters.`)
  .max(PASSWORD_MAX, `Use at most ${PASSWORD_MAX} characters.`);

export const SetupSchema = z.object({
  name: z.string().trim().min(1, 'Enter your name.').max(120),
  email: z.string().trim().toLowerCase().email('Enter an e-mail address, e.g. name@example.test.').max(254),
  password: PasswordSchema,
  siteName: z.string().trim().min(1, 'Name your first site, e.g. the depot.').max(120),
  timeZone: z.string().trim().min(1).max(64).default('Europe/London'),
});
export type Setup = z.infer<typeof SetupSchema>;
