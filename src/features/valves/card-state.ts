import type { z } from 'zod';
import { clearanceFromFeelers, nextBladeUp, type Blade, type BladeKind } from '../../../shared/domain/feeler';
import { parseShimMarking } from '../../../shared/domain/shims';
import { toMicrons } from '../../../shared/domain/microns';
import type { PlanValve } from '../../../shared/domain/shim-plan';
import type { AsFoundSchema, ValveCard, ValveReadingInput, ValveSlotView } from '../../../shared/schemas/valves';
import { parseClearance, shimMarkingText, type ClearanceUnit } from './clearance-format';

export type Adjuster = ValveCard['adjuster'];
type AsFound = z.infer<typeof AsFoundSchema>;

/** What the technician has entered for one valve, kept as typed so a draft restores exactly. */
export interface ValveEntry {
  valveId: string;
  method: 'feeler' | 'direct';
  /** '' not chosen yet, 'none' when no blade enters, else the blade in mm. */
  slides: string;
  /** '' not tried, else the blade in mm. */
  stops: string;
  /** The stopping blade was chosen by hand, so a new sliding blade does not replace it. */
  stopsByHand: boolean;
  directText: string;
  directUnit: ClearanceUnit;
  shimText: string;
  fittedText: string;
  asLeftText: string;
  asLeftUnit: ClearanceUnit;
  screwAdjusted: boolean;
}

export type SpecState = 'in' | 'tight' | 'loose';

export interface EntryReading {
  asFound: AsFound | null;
  asFoundMm: number | null;
  /** The blade that would not enter: the true gap is below it. */
  asFoundBelowMm: number | null;
  asFoundError?: string;
  shimMm: number | null;
  shimError?: string;
  fittedMm: number | null;
  fittedError?: string;
  asLeftMm: number | null;
  asLeftError?: string;
  /** A different shim went in or the screw was turned: the valve must be measured again. */
  needsAsLeft: boolean;
  /** As left, else as found: what the valve runs with. */
  leftMm: number | null;
  spec: SpecState | null;
}

export function blankEntry(slot: ValveSlotView, unit: ClearanceUnit): ValveEntry {
  return {
    valveId: slot.valveId, method: 'feeler', slides: '', stops: '', stopsByHand: false, directText: '', directUnit: unit,
    shimText: slot.currentShimMm == null ? '' : shimMarkingText(slot.currentShimMm), fittedText: '', asLeftText: '', asLeftUnit: unit, screwAdjusted: false,
  };
}

function shim(text: string): { mm: number | null; error?: string } {
  if (!text.trim()) return { mm: null };
  try {
    return { mm: parseShimMarking(text) };
  } catch (e) {
    return { mm: null, error: (e as Error).message };
  }
}

function asFoundOf(e: ValveEntry): { asFound: AsFound | null; mm: number | null; below: number | null; error?: string } {
  if (e.method === 'direct') {
    const p = parseClearance(e.directText, e.directUnit);
    return { asFound: p.mm == null ? null : { method: 'direct', mm: p.mm }, mm: p.mm, below: null, error: p.error };
  }
  if (!e.slides && !e.stops) return { asFound: null, mm: null, below: null };
  const reading = { slidesMm: e.slides && e.slides !== 'none' ? Number(e.slides) : null, stopsMm: e.stops ? Number(e.stops) : null };
  try {
    const range = clearanceFromFeelers(reading);
    return { asFound: { method: 'feeler', ...reading }, mm: range.estimateMm, below: range.maxMm };
  } catch (err) {
    return { asFound: null, mm: null, below: null, error: (err as Error).message };
  }
}

export function specState(mm: number | null, slot: Pick<ValveSlotView, 'specMinMm' | 'specMaxMm'>): SpecState | null {
  if (mm == null) return null;
  const um = toMicrons(mm);
  return um < toMicrons(slot.specMinMm) ? 'tight' : um > toMicrons(slot.specMaxMm) ? 'loose' : 'in';
}

export function readEntry(e: ValveEntry, slot: ValveSlotView, adjuster: Adjuster): EntryReading {
  const found = asFoundOf(e);
  const isShim = adjuster === 'shim-under-bucket';
  const before = isShim ? shim(e.shimText) : { mm: null };
  const fitted = isShim ? shim(e.fittedText) : { mm: null };
  const left = parseClearance(e.asLeftText, e.asLeftUnit);
  const changed = fitted.mm != null && fitted.mm !== before.mm;
  const needsAsLeft = changed || (!isShim && e.screwAdjusted);
  // After an adjustment the as-found value says nothing about how the valve was left.
  const leftMm = needsAsLeft ? left.mm : (left.mm ?? found.mm);
  return {
    asFound: found.asFound, asFoundMm: found.mm, asFoundBelowMm: found.below, asFoundError: found.error,
    shimMm: before.mm, shimError: before.error, fittedMm: fitted.mm, fittedError: fitted.error,
    asLeftMm: left.mm, asLeftError: left.error,
    needsAsLeft, leftMm, spec: specState(leftMm, slot),
  };
}

/** A new sliding blade suggests the next blade up as the one that stops, unless that one was picked by hand and still fits. */
export function pickSlides(e: ValveEntry, value: string, series: readonly Blade[]): ValveEntry {
  const slidesMm = value === 'none' ? null : Number(value);
  const keep = e.stopsByHand && e.stops && (slidesMm == null || Number(e.stops) > slidesMm);
  if (keep) return { ...e, slides: value };
  const next = value === '' ? null : nextBladeUp(series, slidesMm);
  return { ...e, slides: value, stops: next == null ? '' : String(next), stopsByHand: false };
}

/** The reading as the sign-off sends it; null while the valve has no as-found value. */
export function toReadingInput(e: ValveEntry, r: EntryReading, adjuster: Adjuster): ValveReadingInput | null {
  if (!r.asFound) return null;
  const out: ValveReadingInput = { valveId: e.valveId, asFound: r.asFound };
  if (r.asLeftMm != null) out.asLeftMm = r.asLeftMm;
  if (adjuster === 'screw-and-locknut') {
    if (e.screwAdjusted) out.screwAdjusted = true;
    return out;
  }
  if (r.shimMm != null) out.shimBeforeMm = r.shimMm;
  if (r.fittedMm != null && r.fittedMm !== r.shimMm) out.shimAfterMm = r.fittedMm;
  return out;
}

/** What stops this valve being signed off, in words, before anything is sent. */
export function entryProblems(r: EntryReading): string[] {
  const out = [r.asFoundError, r.shimError, r.fittedError, r.asLeftError].filter((m): m is string => !!m);
  if (!r.asFound && !r.asFoundError) out.push('Record the as-found clearance.');
  if (r.needsAsLeft && r.asLeftMm == null && !r.asLeftError) out.push('Measure and enter the clearance after adjusting.');
  return out;
}

export function planValveOf(slot: ValveSlotView, r: EntryReading): PlanValve | null {
  if (r.asFoundMm == null || r.shimMm == null) return null;
  return { valveId: slot.valveId, currentShimMm: r.shimMm, measuredClearanceMm: r.asFoundMm, specMinMm: slot.specMinMm, specMaxMm: slot.specMaxMm };
}

export type { BladeKind };
