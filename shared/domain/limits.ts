export interface Limit {
  min: number | null;
  max: number | null;
}

/** Whether a measured value lies outside its limits (the limits themselves are within). */
export function outsideLimits(value: number, l: Limit) {
  return (l.min !== null && value < l.min) || (l.max !== null && value > l.max);
}

export function describeLimit(l: Limit, unit: string | null) {
  const u = unit ? ` ${unit}` : '';
  if (l.min !== null && l.max !== null) return `${l.min}–${l.max}${u}`;
  if (l.min !== null) return `at least ${l.min}${u}`;
  if (l.max !== null) return `at most ${l.max}${u}`;
  return 'no limit';
}

/**
 * Default limits Lashline proposes for new reading templates. They are defaults: the maker's service
 * manual and the law of the place of use decide.
 */
export const DEFAULT_LIMITS = {
  // Great Britain: at least 1 mm across three-quarters of the tread width, all the way round, for
  // motorcycles over 50 cc (Road Vehicles (Construction and Use) Regulations 1986, reg. 27(1)(g)(ii)).
  tyreTreadMinMm: 1.0,
  // Replacing pads at about 1 mm of friction material is common practice.
  brakePadMinMm: 1.0,
  // Midway along the lower run; 25–40 mm as general guidance (common practice).
  chainSlackMm: { min: 25, max: 40 },
  // From memory, typical of small singles: check the maker's manual.
  sparkPlugGapMm: { min: 0.8, max: 0.9 },
  // A rested 12 V lead-acid battery below about 12.4 V is undercharged (from memory).
  batteryMinV: 12.4,
} as const;
