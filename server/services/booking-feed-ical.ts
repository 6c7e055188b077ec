import ICAL from 'ical.js';
import { expandInterval, fromWallClock, isTimeZone, MAX_BOOKING_DAYS, DAY_MS, quantityInText } from '../../shared/domain/bookings';

// Reads an iCalendar feed (RFC 5545) into the occurrences inside a window: repeating events expanded
// on their own time zone's wall clock, EXDATE occurrences cancelled, RECURRENCE-ID occurrences moved,
// STATUS:CANCELLED events dropped. Pure: text in, occurrences out.

export interface FeedOccurrence {
  uid: string;
  start: number;
  end: number;
  summary: string;
  /** SUMMARY, DESCRIPTION and LOCATION, for finding a fleet number or a model's name. */
  text: string;
  bike: string | null;
  model: string | null;
  quantity: number | null;
}

export interface ParsedFeed {
  occurrences: FeedOccurrence[];
  /** Events left out, with the reason in words, e.g. "no end time". */
  unreadable: { uid: string; reason: string }[];
}

export class FeedParseError extends Error {}

type Comp = InstanceType<typeof ICAL.Component>;
type Prop = InstanceType<typeof ICAL.Property>;
type Time = InstanceType<typeof ICAL.Time>;

const fields = (t: Time) => Date.UTC(t.year, t.month - 1, t.day, t.hour, t.minute, t.second);

/** The instant of a DATE or DATE-TIME value, and the zone its repeats run in. */
function instantOf(t: Time, tzid: string | null, siteZone: string): { at: number; zone: string } {
  if (t.isDate) return { at: fromWallClock(fields(t), siteZone), zone: siteZone };
  if (t.zone === ICAL.Timezone.utcTimezone) return { at: fields(t), zone: 'UTC' };
  if (tzid && isTimeZone(tzid)) return { at: fromWallClock(fields(t), tzid), zone: tzid };
  // A zone the calendar defines itself (a VTIMEZONE under a non-IANA name): ical.js converts it.
  if (tzid && ICAL.TimezoneService.has(tzid)) {
    const zoned = new ICAL.Time({ year: t.year, month: t.month, day: t.day, hour: t.hour, minute: t.minute, second: t.second }, ICAL.TimezoneService.get(tzid));
    return { at: zoned.toUnixTime() * 1000, zone: siteZone };
  }
  return { at: fromWallClock(fields(t), siteZone), zone: siteZone };
}

const tzidOf = (p: Prop) => {
  const v = p.getParameter('tzid');
  return typeof v === 'string' ? v : null;
};

function propTimes(c: Comp, name: string, siteZone: string): number[] {
  return c.getAllProperties(name).flatMap((p) =>
    p.getValues().flatMap((v) => (v instanceof ICAL.Time ? [instantOf(v, tzidOf(p), siteZone).at] : [])),
  );
}

const str = (c: Comp, name: string) => {
  const v = c.getFirstPropertyValue(name);
  return typeof v === 'string' ? v.trim() : v == null ? '' : String(v).trim();
};

interface Timed {
  start: number;
  end: number;
  zone: string;
}

function timesOf(ev: Comp, siteZone: string): Timed | string {
  const sp = ev.getFirstProperty('dtstart');
  const st = sp?.getFirstValue();
  if (!sp || !(st instanceof ICAL.Time)) return 'no start time';
  const { at: start, zone } = instantOf(st, tzidOf(sp), siteZone);
  const ep = ev.getFirstProperty('dtend');
  const et = ep?.getFirstValue();
  let end: number;
  if (ep && et instanceof ICAL.Time) end = instantOf(et, tzidOf(ep), siteZone).at;
  else if (ev.hasProperty('duration')) end = start + (ev.getFirstPropertyValue('duration') as InstanceType<typeof ICAL.Duration>).toSeconds() * 1000;
  // RFC 5545 §3.6.1: a DATE start without an end lasts the day.
  else if (st.isDate) end = fromWallClock(fields(st) + DAY_MS, siteZone);
  else return 'no end time';
  if (!(end > start)) return 'an end that is not after its start';
  if (end - start > MAX_BOOKING_DAYS * DAY_MS) return `longer than ${MAX_BOOKING_DAYS} days`;
  return { start, end, zone };
}

function occurrence(ev: Comp, uid: string, start: number, end: number): FeedOccurrence {
  const summary = str(ev, 'summary');
  const q = Number(str(ev, 'x-lashline-quantity'));
  return {
    uid, start, end, summary,
    text: [summary, str(ev, 'description'), str(ev, 'location')].filter(Boolean).join('\n'),
    bike: str(ev, 'x-lashline-bike') || null,
    model: str(ev, 'x-lashline-model') || null,
    quantity: Number.isInteger(q) && q >= 1 ? q : null,
  };
}

export function parseFeed(text: string, window: { from: number; to: number }, siteZone: string): ParsedFeed {
  let cal: Comp;
  try {
    const jcal = ICAL.parse(text.replace(/^\uFEFF/, ''));
    cal = new ICAL.Component(Array.isArray(jcal[0]) ? jcal[0] : jcal);
  } catch (e) {
    throw new FeedParseError(`The calendar could not be read (${e instanceof Error ? e.message : String(e)}). Check that the address gives an .ics file.`);
  }
  if (cal.name !== 'vcalendar') throw new FeedParseError('The address does not give an iCalendar file (no BEGIN:VCALENDAR). Check the .ics link.');
  for (const tz of cal.getAllSubcomponents('vtimezone')) ICAL.TimezoneService.register(tz);

  const events = cal.getAllSubcomponents('vevent');
  const overrides = new Map<string, Comp[]>();
  const masters: Comp[] = [];
  for (const ev of events) {
    const uid = str(ev, 'uid');
    if (ev.hasProperty('recurrence-id')) overrides.set(uid, [...(overrides.get(uid) ?? []), ev]);
    else masters.push(ev);
  }
  const out: ParsedFeed = { occurrences: [], unreadable: [] };
  const inWindow = (s: number, e: number) => s < window.to && e > window.from;
  for (const ev of masters) {
    const uid = str(ev, 'uid') || `no-uid-${out.occurrences.length}-${out.unreadable.length}`;
    if (str(ev, 'status').toUpperCase() === 'CANCELLED') continue;
    const timed = timesOf(ev, siteZone);
    if (typeof timed === 'string') {
      out.unreadable.push({ uid, reason: timed });
      continue;
    }
    const moved = overrides.get(uid) ?? [];
    const replaced = new Set([...propTimes(ev, 'exdate', siteZone), ...moved.flatMap((o) => propTimes(o, 'recurrence-id', siteZone))]);
    const rule = ev.getFirstPropertyValue('rrule');
    let starts: { start: number; end: number }[];
    try {
      starts = expandInterval({ ...timed, rule: rule ? String(rule) : null, timeZone: timed.zone, from: window.from, to: window.to });
    } catch {
      out.unreadable.push({ uid, reason: `a repeat rule Lashline does not read (${String(rule)})` });
      continue;
    }
    const length = timed.end - timed.start;
    for (const at of propTimes(ev, 'rdate', siteZone)) if (inWindow(at, at + length)) starts.push({ start: at, end: at + length });
    for (const o of starts) if (!replaced.has(o.start)) out.occurrences.push(occurrence(ev, uid, o.start, o.end));
    for (const o of moved) {
      if (str(o, 'status').toUpperCase() === 'CANCELLED') continue;
      const t = timesOf(o, siteZone);
      if (typeof t === 'string') out.unreadable.push({ uid, reason: t });
      else if (inWindow(t.start, t.end)) out.occurrences.push(occurrence(o, uid, t.start, t.end));
    }
  }
  out.occurrences.sort((a, b) => a.start - b.start || a.uid.localeCompare(b.uid));
  return out;
}

// ── Which bikes an event needs ───────────────────────────────────────────────
export interface FeedTargets {
  /** The site's bikes that are not retired. */
  bikes: { id: string; fleetNumber: string; modelId: string }[];
  models: { id: string; name: string }[];
  defaultModelId: string | null;
  /** Bikes of a model at the site. */
  countOf: (modelId: string) => number;
}

export type Need = { bikeIds: string[] } | { modelId: string; quantity: number; capped: boolean } | null;

const escape = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
const mentions = (text: string, name: string) => new RegExp(`(?<![A-Za-z0-9])${escape(name)}(?![A-Za-z0-9])`, 'i').test(text);

/** The fleet numbers the event names (X-LASHLINE-BIKE or in its text), else a model and how many, else null. */
export function needOf(o: FeedOccurrence, t: FeedTargets): Need {
  const named = o.bike ? t.bikes.filter((b) => b.fleetNumber.toLowerCase() === o.bike!.toLowerCase()) : t.bikes.filter((b) => mentions(o.text, b.fleetNumber));
  if (named.length) return { bikeIds: named.map((b) => b.id) };
  if (o.bike) return null;
  // The longest name first, so "Breeze 125 Sport" wins over "Breeze 125".
  const byLength = [...t.models].sort((a, b) => b.name.length - a.name.length);
  const model = o.model ? t.models.find((m) => m.name.toLowerCase() === o.model!.toLowerCase()) : byLength.find((m) => mentions(o.text, m.name));
  const modelId = model?.id ?? (o.model ? null : t.defaultModelId);
  if (!modelId) return null;
  const want = o.quantity ?? quantityInText(o.text) ?? 1;
  const have = t.countOf(modelId);
  if (have < 1) return null;
  return { modelId, quantity: Math.min(want, have), capped: want > have };
}
