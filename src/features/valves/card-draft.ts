import type { BladeKind } from '../../../shared/domain/feeler';
import type { ValveCard } from '../../../shared/schemas/valves';
import type { ServerDraft } from './api';
import { blankEntry, readEntry, type ValveEntry } from './card-state';
import type { ClearanceUnit } from './clearance-format';

/** Everything typed on one valve card, with the moment it last changed. */
export interface CardDraft {
  gauge: BladeKind;
  unit: ClearanceUnit;
  notes: string;
  /** '' for today. */
  date: string;
  entries: ValveEntry[];
  savedAt: string;
}

export type DraftSource = 'device' | 'server' | null;

type Rec = Record<string, unknown>;
const str = (v: unknown, d: string) => (typeof v === 'string' ? v : d);
const unitOf = (v: unknown, d: ClearanceUnit): ClearanceUnit => (v === 'mm' || v === 'in' ? v : d);
const isRec = (v: unknown): v is Rec => typeof v === 'object' && v !== null && !Array.isArray(v);

/** A stored entry read defensively: it may come from an older screen or another tablet. */
function entryFrom(rec: Rec | undefined, blank: ValveEntry): ValveEntry {
  if (!rec) return blank;
  return {
    valveId: blank.valveId,
    method: rec.method === 'direct' ? 'direct' : 'feeler',
    slides: str(rec.slides, blank.slides),
    stops: str(rec.stops, blank.stops),
    stopsByHand: rec.stopsByHand === true,
    directText: str(rec.directText, blank.directText),
    directUnit: unitOf(rec.directUnit, blank.directUnit),
    shimText: str(rec.shimText, blank.shimText),
    fittedText: str(rec.fittedText, blank.fittedText),
    asLeftText: str(rec.asLeftText, blank.asLeftText),
    asLeftUnit: unitOf(rec.asLeftUnit, blank.asLeftUnit),
    screwAdjusted: rec.screwAdjusted === true,
  };
}

function serverDraft(v: unknown): { readings: Rec[]; savedAt: string } | null {
  if (!isRec(v) || !Array.isArray(v.readings)) return null;
  return { readings: v.readings.filter(isRec), savedAt: str(v.savedAt, '') };
}

/**
 * The card opens with the newer of the two drafts: the one on this device or the one
 * another tablet saved to Lashline. Notes stay on the device (the server draft holds readings).
 */
export function openDraft(card: ValveCard, local: Partial<CardDraft> | null): { draft: CardDraft; source: DraftSource; serverBehind: boolean } {
  const server = serverDraft(card.draft);
  const localAt = local?.savedAt ?? '';
  const useServer = !!server && server.readings.length > 0 && server.savedAt > localAt;
  const unit = unitOf(local?.unit, 'mm');
  const records: Rec[] = useServer ? server.readings : (local?.entries ?? []).filter(isRec) as unknown as Rec[];
  const gauge: BladeKind = (useServer ? server.readings[0]?.gauge : local?.gauge) === 'inch' ? 'inch' : 'metric';
  const entries = card.valves.map((slot) => entryFrom(records.find((r) => r.valveId === slot.valveId), blankEntry(slot, unit)));
  const source: DraftSource = useServer ? 'server' : local?.entries?.length ? 'device' : null;
  return {
    draft: { gauge, unit, notes: str(local?.notes, ''), date: str(local?.date, ''), entries, savedAt: useServer ? server.savedAt : localAt },
    source,
    serverBehind: source === 'device' && localAt > (server?.savedAt ?? ''),
  };
}

/** The draft as Lashline stores it: each valve's entry plus the reading fields the reorder list reads. */
export function toServerDraft(d: CardDraft, card: ValveCard): ServerDraft {
  return {
    savedAt: d.savedAt,
    readings: d.entries.map((e) => {
      const slot = card.valves.find((v) => v.valveId === e.valveId)!;
      const r = readEntry(e, slot, card.adjuster);
      return { ...e, gauge: d.gauge, asFound: r.asFound ?? undefined, shimBeforeMm: r.shimMm ?? undefined };
    }),
  };
}

const key = (taskId: string) => `lashline.draft.valve-card.${taskId}`;

export function readLocal(taskId: string): Partial<CardDraft> | null {
  try {
    const raw = localStorage.getItem(key(taskId));
    return raw ? (JSON.parse(raw) as Partial<CardDraft>) : null;
  } catch {
    return null;
  }
}

export function writeLocal(taskId: string, d: CardDraft) {
  try {
    localStorage.setItem(key(taskId), JSON.stringify(d));
  } catch {
    // Storage full or blocked: the server copy is still made.
  }
}

export function removeLocal(taskId: string) {
  try {
    localStorage.removeItem(key(taskId));
  } catch {
    // Blocked storage held nothing to forget.
  }
}
