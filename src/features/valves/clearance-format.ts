import { fromMicrons, inchToMicrons, toMicrons } from '../../../shared/domain/microns';
import { mmToInch } from '../../../shared/domain/units';

export type ClearanceUnit = 'mm' | 'in';

/** mm to 0.001, shown with two decimals unless the third one counts (inch blades: 0.152). */
export function fmtMm(mm: number): string {
  const s = fromMicrons(toMicrons(mm)).toFixed(3);
  return s.endsWith('0') ? s.slice(0, -1) : s;
}

/** Inches to four places, as feeler blades in thou and tenths are read. */
export const fmtIn = (mm: number) => mmToInch(mm).toFixed(4);

/** A clearance in both units, the chosen one first: "0.21 mm (0.0083 in)". */
export function clearanceText(mm: number | null | undefined, unit: ClearanceUnit): string {
  if (mm == null) return '—';
  return unit === 'mm' ? `${fmtMm(mm)} mm (${fmtIn(mm)} in)` : `${fmtIn(mm)} in (${fmtMm(mm)} mm)`;
}

export function specText(minMm: number, maxMm: number, unit: ClearanceUnit): string {
  const mm = `${fmtMm(minMm)}–${fmtMm(maxMm)} mm`;
  const inch = `${fmtIn(minMm)}–${fmtIn(maxMm)} in`;
  return unit === 'mm' ? `${mm} (${inch})` : `${inch} (${mm})`;
}

/** A shim thickness: "2.55 mm", or "2.575 mm" when a micrometer reading has a third place. */
export const fmtShim = (mm: number) => `${fmtMm(mm)} mm`;

/** How a shim reads when etched: hundredths ("255"), or mm when it falls between hundredths. */
export function shimMarkingText(mm: number): string {
  const um = toMicrons(mm);
  return um % 10 === 0 ? String(um / 10).padStart(3, '0') : fmtMm(mm);
}

export interface Parsed {
  mm: number | null;
  error?: string;
}

/** A typed clearance in the unit it was typed in, to whole micrometres of mm. */
export function parseClearance(text: string, unit: ClearanceUnit): Parsed {
  const t = text.trim().replace(',', '.');
  if (!t) return { mm: null };
  if (!/^\d*\.?\d+$/.test(t)) return { mm: null, error: unit === 'mm' ? 'Type the clearance in mm, e.g. 0.21' : 'Type the clearance in inches, e.g. 0.008' };
  const v = Number(t);
  const mm = unit === 'mm' ? fromMicrons(toMicrons(v)) : fromMicrons(inchToMicrons(v));
  if (mm > 5) return { mm: null, error: unit === 'mm' ? 'More than 5 mm cannot be a clearance: check the reading' : 'More than 0.2 in cannot be a clearance: type inches, e.g. 0.008' };
  return { mm };
}
