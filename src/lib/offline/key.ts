/**
 * A random RFC 4122 version 4 UUID for an Idempotency-Key. `crypto.randomUUID` exists only on
 * secure pages (HTTPS or localhost); a workshop tablet on the LAN's plain address gets one built
 * from `crypto.getRandomValues`, which every page has.
 */
export function newKey(): string {
  if (typeof crypto.randomUUID === 'function' && globalThis.isSecureContext !== false) return crypto.randomUUID();
  const b = crypto.getRandomValues(new Uint8Array(16));
  b[6] = (b[6] & 0x0f) | 0x40;
  b[8] = (b[8] & 0x3f) | 0x80;
  const h = [...b].map((x) => x.toString(16).padStart(2, '0')).join('');
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`;
}
