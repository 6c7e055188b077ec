/**
 * Seeded randomness for the demo scenario: the same seed gives the same fleet,
 * history and identifiers on every machine, so screenshots, tests and the
 * README can point at the same bikes.
 */

export interface Rng {
  /** Uniform in [0, 1). */
  next(): number;
  /** Uniform in [lo, hi). */
  range(lo: number, hi: number): number;
  /** Whole number in [lo, hi], both ends included. */
  int(lo: number, hi: number): number;
  chance(p: number): boolean;
  pick<T>(items: readonly T[]): T;
  /** A random (version 4) UUID, RFC 9562 §5.4, drawn from this generator. */
  uuid(): string;
}

/** FNV-1a, 32 bits: turns a readable seed such as "SM-07" into a generator state. */
export function hashSeed(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

/** mulberry32: tiny, fast and well mixed enough for invented data (not for secrets). */
export function createRng(seed: string): Rng {
  let state = hashSeed(seed);
  const next = () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4_294_967_296;
  };
  const int = (lo: number, hi: number) => lo + Math.floor(next() * (hi - lo + 1));
  return {
    next,
    range: (lo, hi) => lo + next() * (hi - lo),
    int,
    chance: (p) => next() < p,
    pick: (items) => items[Math.floor(next() * items.length)],
    uuid: () => {
      let hex = '';
      for (let i = 0; i < 4; i++) hex += Math.floor(next() * 4_294_967_296).toString(16).padStart(8, '0');
      // Version nibble 4, variant bits 10xx (RFC 9562 §4.1, §4.2).
      hex = `${hex.slice(0, 12)}4${hex.slice(13, 16)}${'89ab'[int(0, 3)]}${hex.slice(17)}`;
      return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`;
    },
  };
}
