import { describe, expect, it } from 'vitest';
import ICAL from 'ical.js';
import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns';
import { FeedParseError, needOf, parseFeed, type FeedOccurrence } from '../../server/services/booking-feed-ical';

const LONDON = 'Europe/London';
const at = (y: number, m: number, d: number, h: number, tz = LONDON, min = 0) => new TZDate(y, m - 1, d, h, min, 0, tz).getTime();
const all = { from: Date.UTC(1990, 0, 1), to: Date.UTC(2030, 0, 1) };
const crlf = (s: string) => s.trim().split('\n').map((l) => l.replace(/^ {4}/, '')).join('\r\n') + '\r\n';

// RFC 5545 §4, first example: one event in UTC, with a folded DESCRIPTION.
const RFC_EXAMPLE_1 = crlf(`
    BEGIN:VCALENDAR
    PRODID:-//xyz Corp//NONSGML PDA Calendar Version 1.0//EN
    VERSION:2.0
    BEGIN:VEVENT
    DTSTAMP:19960704T120000Z
    UID:uid1@example.com
    ORGANIZER:mailto:jsmith@example.com
    DTSTART:19960918T143000Z
    DTEND:19960920T220000Z
    STATUS:CONFIRMED
    CATEGORIES:CONFERENCE
    SUMMARY:Networld+Interop Conference
    DESCRIPTION:Networld+Interop Conference
      and Exhibit\\nAtlanta World Congress Center\\n
     Atlanta\\, Georgia
    END:VEVENT
    END:VCALENDAR`);

// RFC 5545 §4, second example: a VTIMEZONE for America/New_York and an event in it.
const RFC_EXAMPLE_2 = crlf(`
    BEGIN:VCALENDAR
    PRODID:-//RDU Software//NONSGML HandCal//EN
    VERSION:2.0
    BEGIN:VTIMEZONE
    TZID:America/New_York
    BEGIN:STANDARD
    DTSTART:19981025T020000
    TZOFFSETFROM:-0400
    TZOFFSETTO:-0500
    TZNAME:EST
    END:STANDARD
    BEGIN:DAYLIGHT
    DTSTART:19990404T020000
    TZOFFSETFROM:-0500
    TZOFFSETTO:-0400
    TZNAME:EDT
    END:DAYLIGHT
    END:VTIMEZONE
    BEGIN:VEVENT
    DTSTAMP:19980309T231000Z
    UID:guid-1.example.com
    ORGANIZER;ROLE=CHAIR:mailto:mrbig@example.com
    ATTENDEE;RSVP=TRUE;ROLE=REQ-PARTICIPANT;CUTYPE=GROUP:
     mailto:employee-A@example.com
    DESCRIPTION:Project XYZ Review Meeting
    CATEGORIES:MEETING
    CLASS:PUBLIC
    CREATED:19980309T130000Z
    SUMMARY:XYZ Project Review
    DTSTART;TZID=America/New_York:19980312T083000
    DTEND;TZID=America/New_York:19980312T093000
    LOCATION:1CP Conference Room 4350
    END:VEVENT
    END:VCALENDAR`);

// RFC 5545 §3.6.1: "an anniversary", a yearly all-day event without an end.
const RFC_ANNIVERSARY = crlf(`
    BEGIN:VCALENDAR
    PRODID:-//Saltmarsh test//EN
    VERSION:2.0
    BEGIN:VEVENT
    UID:19970901T130000Z-123403@example.com
    DTSTAMP:19970901T130000Z
    DTSTART;VALUE=DATE:19971102
    SUMMARY:Our Blissful Anniversary
    TRANSP:TRANSPARENT
    CLASS:CONFIDENTIAL
    CATEGORIES:ANNIVERSARY,PERSONAL,SPECIAL OCCASION
    RRULE:FREQ=YEARLY
    END:VEVENT
    END:VCALENDAR`);

describe('the RFC 5545 example calendars', () => {
  it('§4 example 1: the conference in UTC, with its unfolded description', () => {
    const { occurrences } = parseFeed(RFC_EXAMPLE_1, all, LONDON);
    expect(occurrences).toHaveLength(1);
    expect(occurrences[0]).toMatchObject({ uid: 'uid1@example.com', start: Date.UTC(1996, 8, 18, 14, 30), end: Date.UTC(1996, 8, 20, 22), summary: 'Networld+Interop Conference' });
    // RFC 5545 §3.1 unfolding and §3.3.11 escapes: "\n" is a line break, "\," a comma.
    expect(occurrences[0].text).toContain('Atlanta, Georgia');
  });

  it('§4 example 2: 08:30 in New York on 12 March 1998 is 13:30 UTC (EST, UTC−5, as its VTIMEZONE says)', () => {
    const { occurrences } = parseFeed(RFC_EXAMPLE_2, all, LONDON);
    expect(occurrences.map((o) => [o.start, o.end, o.summary])).toEqual([[Date.UTC(1998, 2, 12, 13, 30), Date.UTC(1998, 2, 12, 14, 30), 'XYZ Project Review']]);
    expect(occurrences[0].text).toContain('1CP Conference Room 4350');
  });

  it('§3.6.1 anniversary: a DATE start lasts the whole day, every 2 November', () => {
    const { occurrences } = parseFeed(RFC_ANNIVERSARY, { from: Date.UTC(2000, 0, 1), to: Date.UTC(2003, 0, 1) }, LONDON);
    expect(occurrences.map((o) => [o.start, o.end])).toEqual([2000, 2001, 2002].map((y) => [at(y, 11, 2, 0), at(y, 11, 3, 0)]));
  });

  it('refuses text that is not a calendar, in words', () => {
    expect(() => parseFeed('<html>Not found</html>', all, LONDON)).toThrow(FeedParseError);
    expect(() => parseFeed('BEGIN:VCARD\r\nEND:VCARD\r\n', all, LONDON)).toThrow(/iCalendar/);
  });
});

// A weekly lesson on Saturdays 09:00–12:00 London from 3 Oct 2026: 10 Oct cancelled (EXDATE), 17 Oct moved
// to Sunday 18 Oct 10:00–13:00 (RECURRENCE-ID), 24 Oct called off (an override with STATUS:CANCELLED),
// and a separate cancelled event dropped.
const LESSONS = crlf(`
    BEGIN:VCALENDAR
    PRODID:-//Saltmarsh test//EN
    VERSION:2.0
    BEGIN:VEVENT
    UID:lessons@saltmarsh.test
    DTSTAMP:20260901T000000Z
    DTSTART;TZID=Europe/London:20261003T090000
    DTEND;TZID=Europe/London:20261003T120000
    RRULE:FREQ=WEEKLY;COUNT=6
    EXDATE;TZID=Europe/London:20261010T090000
    SUMMARY:Lesson block Breeze 125 x4
    END:VEVENT
    BEGIN:VEVENT
    UID:lessons@saltmarsh.test
    DTSTAMP:20260901T000000Z
    RECURRENCE-ID;TZID=Europe/London:20261017T090000
    DTSTART;TZID=Europe/London:20261018T100000
    DTEND;TZID=Europe/London:20261018T130000
    SUMMARY:Lesson block Breeze 125 x4 (moved to Sunday)
    END:VEVENT
    BEGIN:VEVENT
    UID:lessons@saltmarsh.test
    DTSTAMP:20260901T000000Z
    RECURRENCE-ID;TZID=Europe/London:20261024T090000
    DTSTART;TZID=Europe/London:20261024T090000
    DTEND;TZID=Europe/London:20261024T120000
    STATUS:CANCELLED
    SUMMARY:Lesson block called off
    END:VEVENT
    BEGIN:VEVENT
    UID:gone@saltmarsh.test
    DTSTAMP:20260901T000000Z
    DTSTART:20261005T090000Z
    DTEND:20261005T170000Z
    STATUS:CANCELLED
    SUMMARY:Hire SM-07
    END:VEVENT
    END:VCALENDAR`);

describe('a feed with a moved and a cancelled occurrence', () => {
  const { occurrences } = parseFeed(LESSONS, { from: Date.UTC(2026, 8, 1), to: Date.UTC(2026, 11, 31) }, LONDON);

  it('lists 3, 18 (moved), 31 Oct and 7 Nov, each on the London wall clock across the October change', () => {
    expect(occurrences.map((o) => [o.start, o.end])).toEqual([
      [at(2026, 10, 3, 9), at(2026, 10, 3, 12)],
      [at(2026, 10, 18, 10), at(2026, 10, 18, 13)],
      [at(2026, 10, 31, 9), at(2026, 10, 31, 12)],
      [at(2026, 11, 7, 9), at(2026, 11, 7, 12)],
    ]);
    expect(occurrences[1].summary).toMatch(/moved to Sunday/);
  });

  it('agrees with ical.js’s own recurrence expansion (RRULE less EXDATE, exceptions related)', () => {
    const cal = new ICAL.Component(ICAL.parse(LESSONS));
    const events = cal.getAllSubcomponents('vevent').filter((v) => v.getFirstPropertyValue('uid') === 'lessons@saltmarsh.test');
    const master = new ICAL.Event(events.find((v) => !v.hasProperty('recurrence-id')));
    const cancelled = new Set<string>();
    for (const ex of events.filter((v) => v.hasProperty('recurrence-id'))) {
      master.relateException(ex);
      if (ex.getFirstPropertyValue('status') === 'CANCELLED') cancelled.add((ex.getFirstPropertyValue('recurrence-id') as InstanceType<typeof ICAL.Time>).toString());
    }
    const it = master.iterator();
    // Without a VTIMEZONE ical.js keeps Europe/London times as wall-clock values: compare wall clocks.
    const want: string[] = [];
    for (let next = it.next(); next; next = it.next()) {
      const d = master.getOccurrenceDetails(next);
      if (!cancelled.has(d.recurrenceId.toString())) want.push(d.startDate.toString());
    }
    expect(occurrences.map((o) => format(new TZDate(o.start, LONDON), "yyyy-MM-dd'T'HH:mm:ss"))).toEqual(want);
  });
});

describe('which bikes an event needs', () => {
  const targets = {
    bikes: [{ id: 'b1', fleetNumber: 'SM-1', modelId: 'strider' }, { id: 'b10', fleetNumber: 'SM-10', modelId: 'strider' }, { id: 'b12', fleetNumber: 'SM-12', modelId: 'breeze' }],
    models: [{ id: 'breeze', name: 'Breeze 125' }, { id: 'strider', name: 'Strider 125' }],
    defaultModelId: null as string | null,
    countOf: (m: string) => (m === 'breeze' ? 3 : 2),
  };
  const occ = (text: string, over: Partial<FeedOccurrence> = {}): FeedOccurrence => ({ uid: 'u', start: 0, end: 1, summary: text, text, bike: null, model: null, quantity: null, ...over });

  it('finds fleet numbers as whole words (SM-10 is not SM-1)', () => {
    expect(needOf(occ('Hire of SM-10 for the day'), targets)).toEqual({ bikeIds: ['b10'] });
    expect(needOf(occ('SM-1 and SM-12, pair hire'), targets)).toEqual({ bikeIds: ['b1', 'b12'] });
    expect(needOf(occ('anything', { bike: 'sm-12' }), targets)).toEqual({ bikeIds: ['b12'] });
    expect(needOf(occ('anything', { bike: 'SM-99' }), targets)).toBeNull();
  });

  it('finds a model and a count, capped at the bikes the site has', () => {
    expect(needOf(occ('Breeze 125 ×2 group ride'), targets)).toEqual({ modelId: 'breeze', quantity: 2, capped: false });
    expect(needOf(occ('Lesson', { model: 'Strider 125', quantity: 5 }), targets)).toEqual({ modelId: 'strider', quantity: 2, capped: true });
    expect(needOf(occ('Walk-in hire'), targets)).toBeNull();
    expect(needOf(occ('Walk-in hire'), { ...targets, defaultModelId: 'breeze' })).toEqual({ modelId: 'breeze', quantity: 1, capped: false });
  });
});
