import { hash, verify } from '@node-rs/argon2';
import { COMMON_PASSWORDS } from './common-passwords';

// argon2id with 19 MiB, 2 passes, 1 lane: the minimum OWASP recommends for argon2id.
// `algorithm: 2` is Argon2id in @node-rs/argon2's (const) enum, which isolated modules cannot import.
const OPTIONS = { algorithm: 2, memoryCost: 19456, timeCost: 2, parallelism: 1 } as const;

export const hashPassword = (plain: string) => hash(plain, OPTIONS);

export async function verifyPassword(stored: string | null, plain: string): Promise<boolean> {
  // Without a stored hash, still spend the time of a verification so that timing does not tell
  // an unknown account from a wrong password.
  const target = stored ?? DUMMY_HASH ?? (DUMMY_HASH = await hashPassword('lashline-timing-equaliser'));
  try {
    const ok = await verify(target, plain);
    return stored ? ok : false;
  } catch {
    return false;
  }
}
let DUMMY_HASH: string | undefined;

/** A reason the password is refused, or null when it is acceptable. */
export function passwordProblem(plain: string, context: string[] = []): string | null {
  const lower = plain.toLowerCase();
  if (COMMON_PASSWORDS.has(lower)) return 'That password is on a list of common passwords. Choose a longer phrase of your own.';
  if (context.some((c) => c.length >= 4 && lower.includes(c.toLowerCase())))
    return 'Do not use your name or e-mail address in the password.';
  return null;
}
