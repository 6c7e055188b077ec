import { describe, it, expect } from 'vitest';
import { addMonths, differenceInCalendarDays, format, isSaturday, nextMonday, parseISO } from 'date-fns';
import { TZDate } from '@date-fns/tz';
import { linearRegression } from 'simple-statistics';
import rrulePkg from 'rrule';
import { buildScenario, PRE_SEASON_RULE, type Scenario } from '../../server/demo/scenario';
import { buildCapacity } from '../../server/demo/capacity-demo';
import { siteOpenIntervals, technicianShifts } from '../../shared/domain/shifts';

const { rrulestr } = rrulePkg;
const TODAY = '2026-06-15';
const S = buildScenario(TODAY);
// In season, deep winter, just before the pre-season inspection, on it, and at month ends.
const TODAYS = ['2026-06-15', '2026-12-01', '2027-01-31', '2027-02-26', '2027-03-01', '2026-08-28', '2025-10-31'];
const SCENARIOS = TODAYS.map(buildScenario);

// RFC 9562 §5.4: version 4, variant 10xx.
const UUID_V4 = /^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/;
// ISO 3779: 17 characters, digits and capital letters except I, O and Q.
const VIN = /^[A-HJ-NPR-Z0-9]{17}$/;
const KM_PER_MILE = 1.609344; // exact (international yard and pound agreement, 1959)

const bike = (s: Scenario, fleet: string) => s.bikes.find((b) => b.fleetNumber === fleet)!;
const readingsOf = (s: Scenario, bikeId: string) => s.odometerReadings.filter((r) => r.bikeId === bikeId);
const userByName = (s: Scenario, name: string) => s.users.find((u) => u.name === name)!;
const days = (a: string, b: string) => differenceInCalendarDays(parseISO(b), parseISO(a));

/**
 * Due state by "whichever comes first" (factory maintenance charts), months
 * added with date-fns (clamps to the end of a short month). Soon = due within
 * 7 days, by the calendar or at the last 28 days' riding rate.
 */
function dueState(s: Scenario, fleet: string, category: string) {
  const b = bike(s, fleet);
  const item = s.serviceItems.find((i) => i.modelId === b.modelId && i.category === category)!;
  const rs = readingsOf(s, b.id);
  const km = rs.at(-1)!.odometerKm;
  const back = rs.filter((r) => days(r.date, s.today) >= 28).at(-1) ?? rs[0];
  const rate = (km - back.odometerKm) / Math.max(1, Math.min(28, days(b.inServiceDate, s.today)));
  const last = s.serviceRecords.filter((r) => r.bikeId === b.id && r.serviceItemId === item.id).at(-1);
  const step = last ? item.everyKm : (item.firstAtKm ?? item.everyKm);
  const remainingKm = step == null ? Infinity : (last?.odometerKm ?? rs[0].odometerKm) + step - km;
  const remainingDays = item.everyMonths == null ? Infinity
    : differenceInCalendarDays(addMonths(parseISO(last?.date ?? b.inServiceDate), item.everyMonths), parseISO(s.today));
  const daysLeft = Math.min(remainingDays, remainingKm / Math.max(rate, 1e-9));
  const status = remainingKm <= 0 || remainingDays <= 0 ? 'overdue' : daysLeft <= 7 ? 'soon' : 'ok';
  return { status, remainingKm, remainingDays, daysLeft, last, km };
}

describe('demo scenario: the operator', () => {
  it('is the same scenario for the same day', () => {
    expect(buildScenario(TODAY)).toEqual(S);
  });

  it('refuses a day that is not a calendar date', () => {
    expect(() => buildScenario('2026-02-30')).toThrow(RangeError);
    expect(() => buildScenario('15/06/2026')).toThrow(RangeError);
  });

  it('has two London sites, six people on the reserved .test domain (RFC 2606) and their sites', () => {
    expect(S.sites.map((s) => [s.name, s.bays, s.timeZone])).toEqual([['Quay Street', 2, 'Europe/London'], ['Airfield', 1, 'Europe/London']]);
    expect(S.users.map((u) => u.email)).toEqual(['ada', 'imogen', 'tomasz', 'priya', 'cal', 'ruth'].map((n) => `${n}@saltmarsh.test`));
    for (const name of ['Ada Okafor', 'Imogen Marsh']) expect(S.userSites.filter((x) => x.userId === userByName(S, name).id)).toHaveLength(2);
    expect(S.userSites).toHaveLength(8);
  });

  it('gives every row a distinct random (version 4) UUID', () => {
    const all = [S.sites, S.users, S.models, S.serviceItems, S.bikes, S.odometerReadings, S.serviceRecords, S.valveChecks, S.valveReadings, S.defects]
      .flat().map((r) => r.id);
    expect(all.every((id) => UUID_V4.test(id))).toBe(true);
    expect(new Set(all).size).toBe(all.length);
  });

  it('stores specs in micrometres: 0.10 ± 0.02 mm is 80–120 µm; shims 1.20–3.50 mm by 0.05 for shim-under-bucket only', () => {
    const breeze = S.models.find((m) => m.name === 'Breeze 125')!;
    expect([breeze.intakeMinUm, breeze.intakeMaxUm, breeze.exhaustMinUm, breeze.exhaustMaxUm]).toEqual([80, 120, 80, 120]);
    for (const m of S.models) {
      const shims = m.adjuster === 'shim-under-bucket' ? [1200, 3500, 50] : [null, null, null];
      expect([m.shimMinUm, m.shimMaxUm, m.shimStepUm]).toEqual(shims);
    }
  });

  it('plans six items per model, no chain on the scooter, pre-season on 1 March (RFC 5545 rule read by rrule)', () => {
    for (const m of S.models) expect(S.serviceItems.filter((i) => i.modelId === m.id)).toHaveLength(m.name === 'Breeze 125' ? 5 : 6);
    const rule = rrulestr(PRE_SEASON_RULE, { dtstart: new Date(Date.UTC(2020, 0, 1)) });
    expect(rule.after(new Date(Date.UTC(2026, 2, 2)))?.toISOString().slice(0, 10)).toBe('2027-03-01');
    const inspections = new Set(S.serviceItems.filter((i) => i.rrule).map((i) => i.id));
    const occurrences = new Set(rule.between(new Date(Date.UTC(2023, 0, 1)), parseISO(`${TODAY}T00:00:00Z`), true).map((d) => d.toISOString().slice(0, 10)));
    const done = S.serviceRecords.filter((r) => inspections.has(r.serviceItemId));
    expect(done.length).toBeGreaterThan(24);
    expect(done.every((r) => occurrences.has(r.date))).toBe(true);
    const ridgeValves = S.serviceItems.find((i) => i.category === 'valves' && i.modelId === S.models.find((m) => m.name === 'Ridgeback 400')!.id)!;
    expect([ridgeValves.everyKm, ridgeValves.everyMonths, ridgeValves.firstAtKm]).toEqual([24000, 24, 1000]);
  });
});

describe('demo scenario: fleet and odometer', () => {
  it('has 24 bikes SM-01…SM-24 with invented registrations and ISO 3779-shaped VINs or none', () => {
    expect(S.bikes.map((b) => b.fleetNumber)).toEqual(Array.from({ length: 24 }, (_, i) => `SM-${String(i + 1).padStart(2, '0')}`));
    expect(S.bikes.every((b) => b.vin === null || VIN.test(b.vin!))).toBe(true);
    expect(new Set(S.bikes.map((b) => b.registration)).size).toBe(24);
    const oldest = addMonths(parseISO(TODAY), -30);
    const historyStart = addMonths(parseISO(TODAY), -18);
    expect(S.historyStart).toBe(format(historyStart, 'yyyy-MM-dd'));
    expect(S.bikes.every((b) => parseISO(b.inServiceDate) >= oldest)).toBe(true);
    expect(S.bikes.filter((b) => parseISO(b.inServiceDate) <= historyStart).length).toBeGreaterThanOrEqual(16);
  });

  it.each(TODAYS.map((t, i) => [t, SCENARIOS[i]] as const))('on %s: readings never go backwards, nor past today', (today, s) => {
    for (const b of s.bikes) {
      const rs = readingsOf(s, b.id);
      expect(rs[0]).toMatchObject({ source: 'setup', date: b.inServiceDate, value: b.inServiceOdometer });
      for (let i = 1; i < rs.length; i++) {
        expect(rs[i].date >= rs[i - 1].date && rs[i].odometerKm >= rs[i - 1].odometerKm).toBe(true);
        // One check-in per day out, and no rental day goes past 150 km.
        if (rs[i - 1].source === 'check-in') expect(rs[i].odometerKm - rs[i - 1].odometerKm).toBeLessThanOrEqual(151);
      }
      expect(rs.at(-1)!.date <= today).toBe(true);
      expect(rs.filter((r) => r.source === 'check-in').every((r) => r.date >= s.historyStart)).toBe(true);
    }
    const dates = [...s.serviceRecords, ...s.valveChecks].map((r) => r.date);
    expect(dates.every((d) => d <= today)).toBe(true);
  });

  it('records check-ins by the desk person of the bike’s own site', () => {
    const desk = { 'Quay Street': userByName(S, 'Cal Brennan').id, Airfield: userByName(S, 'Ruth Ibbot').id };
    for (const b of S.bikes) {
      const site = S.sites.find((x) => x.id === b.siteId)!.name as keyof typeof desk;
      expect(readingsOf(S, b.id).filter((r) => r.source === 'check-in').every((r) => r.recordedBy === desk[site])).toBe(true);
    }
  });

  it('has one Airfield bike reading miles, each value converted at 1.609344 km a mile', () => {
    const miles = S.bikes.filter((b) => b.odometerUnit === 'mi');
    expect(miles.map((b) => b.fleetNumber)).toEqual([S.story.milesBike]);
    expect(S.sites.find((x) => x.id === miles[0].siteId)!.name).toBe('Airfield');
    for (const r of readingsOf(S, miles[0].id)) {
      expect(r.unit).toBe('mi');
      expect(r.odometerKm).toBeCloseTo(r.value * KM_PER_MILE, 5);
    }
  });

  it('keeps the distance continuous across the one documented odometer replacement', () => {
    const resets = S.odometerReadings.filter((r) => r.reset);
    expect(resets).toHaveLength(1);
    const rs = readingsOf(S, resets[0].bikeId);
    const at = rs.indexOf(resets[0]);
    expect(resets[0].value).toBeLessThan(rs[at - 1].value);
    expect(resets[0].odometerKm).toBe(rs[at - 1].odometerKm);
    for (const r of rs.slice(at)) expect(r.odometerKm).toBeCloseTo(resets[0].odometerKm + (r.value - resets[0].value), 6);
  });
});

describe('demo scenario: what is due today', () => {
  it.each(TODAYS.map((t, i) => [t, SCENARIOS[i]] as const))('on %s: the built-in due states hold and most bikes are fine', (_, s) => {
    const overdue = dueState(s, s.story.overdueOilByKm, 'oil');
    expect(overdue.status).toBe('overdue');
    expect(overdue.remainingKm).toBeLessThan(-1000); // ridden far past the due distance…
    expect(overdue.remainingDays).toBeGreaterThan(30); // …well before the calendar date
    const calendar = dueState(s, s.story.oilDueByCalendar, 'oil');
    expect(calendar.status).toBe('overdue');
    expect(calendar.remainingDays).toBeLessThanOrEqual(0);
    expect(calendar.remainingKm).toBeGreaterThan(4000); // barely ridden since
    for (const { fleetNumber, category } of s.story.dueSoon) {
      const soon = dueState(s, fleetNumber, category);
      expect([fleetNumber, soon.status]).toEqual([fleetNumber, 'soon']);
      expect(soon.daysLeft).toBeGreaterThan(0);
    }
    // Busy hire bikes may have their 1,000 km chain lube coming up; every other bike is fine.
    const stories = new Set([s.story.overdueOilByKm, s.story.oilDueByCalendar, s.story.grounded, ...s.story.dueSoon.map((x) => x.fleetNumber)]);
    const flagged = s.bikes.filter((b) => !stories.has(b.fleetNumber) &&
      s.serviceItems.some((i) => i.modelId === b.modelId && !i.rrule && dueState(s, b.fleetNumber, i.category).status !== 'ok'));
    expect(flagged.length).toBeLessThanOrEqual(2);
  });

  it('grounds one bike for a tyre below the 1.0 mm limit (GB Construction and Use Regulations 1986, reg. 27)', () => {
    const grounded = S.bikes.filter((b) => b.status === 'out_of_service');
    expect(grounded.map((b) => b.fleetNumber)).toEqual([S.story.grounded]);
    expect(grounded[0].statusReason).toMatch(/0\.8 mm.*1\.0 mm/);
    const [defect] = S.defects;
    expect(defect).toMatchObject({ bikeId: grounded[0].id, category: 'tyres', safetyCritical: true, resolvedAt: null });
    const inspection = dueState(S, S.story.grounded, 'brakes').last!;
    expect(inspection.date).toBe(defect.reportedAt.toISOString().slice(0, 10));
    expect(readingsOf(S, grounded[0].id).at(-1)!.date).toBe(inspection.date);
  });
});

describe('demo scenario: valves and shims', () => {
  const ridgeback = S.models.find((m) => m.name === 'Ridgeback 400')!;
  const checksOf = (fleet: string) => S.valveChecks.filter((c) => c.bikeId === bike(S, fleet).id);
  const series = (fleet: string, cylinder: number, position: number) =>
    checksOf(fleet).map((c) => ({ km: c.odometerKm, r: S.valveReadings.find((r) => r.checkId === c.id && r.cylinder === cylinder && r.side === 'exhaust' && r.position === position)! }));

  it('reads every valve at every check; shims change by the manuals’ rule new = old + measured − left', () => {
    for (const c of S.valveChecks) {
      const m = S.models.find((x) => x.id === bike(S, S.bikes.find((b) => b.id === c.bikeId)!.fleetNumber).modelId)!;
      const rs = S.valveReadings.filter((r) => r.checkId === c.id);
      expect(rs).toHaveLength(m.cylinders * (m.intakeValvesPerCylinder + m.exhaustValvesPerCylinder));
      for (const r of rs) {
        if (m.adjuster === 'screw-and-locknut' || r.asLeftUm === null) expect([r.shimBeforeUm, r.shimAfterUm]).toEqual([null, null]);
        else expect(r.shimAfterUm! - r.shimBeforeUm!).toBe(r.asFoundUm - r.asLeftUm);
        if (r.shimAfterUm !== null) expect(r.shimAfterUm % 50).toBe(0);
      }
    }
    expect(S.valveReadings.filter((r) => r.asLeftUm !== null).length).toBeGreaterThanOrEqual(3);
  });

  it('has a Ridgeback whose cylinder-2 exhausts close up at every check and leave spec before the next one', () => {
    expect(bike(S, S.story.tighteningBike).modelId).toBe(ridgeback.id);
    for (const v of S.story.tighteningValves) {
      const s = series(S.story.tighteningBike, v.cylinder, v.position);
      const found = s.map((x) => x.r.asFoundUm);
      expect(found).toEqual(v.asFoundUm);
      expect(found.every((f, i) => i === 0 || f < found[i - 1])).toBe(true);
      expect(found.at(-1)).toBeLessThanOrEqual(215);
      expect(s.at(-1)!.km - s[0].km).toBeGreaterThan(40_000);
      expect(s.every((x) => x.r.asLeftUm === null && x.r.asFoundUm >= ridgeback.exhaustMinUm)).toBe(true);
      // Least squares (simple-statistics) projected to the next check, 24,000 km on.
      const { m, b } = linearRegression(s.map((x) => [x.km, x.r.asFoundUm]));
      expect(m * (s.at(-1)!.km + 24_000) + b).toBeLessThan(ridgeback.exhaustMinUm);
    }
  });

  it('shows the same closing-up on cylinder-2 exhausts of other Ridgebacks', () => {
    const others = S.bikes.filter((b) => b.modelId === ridgeback.id && b.fleetNumber !== S.story.tighteningBike && checksOf(b.fleetNumber).length >= 2);
    const closing = others.filter((b) => [1, 2].every((p) => { const s = series(b.fleetNumber, 2, p); return s.at(-1)!.r.asFoundUm < s[0].r.asFoundUm; }));
    expect(closing.length).toBeGreaterThanOrEqual(3);
  });

  it('stocks every size 1.20–3.50 mm at both sites, with nothing of the sizes the tightening valves will need', () => {
    for (const site of S.sites) {
      const rows = S.shimStock.filter((r) => r.siteId === site.id);
      expect(rows.filter((r) => r.condition === 'new')).toHaveLength(47);
      expect(rows.every((r) => r.count >= 0 && r.count <= 4)).toBe(true);
      expect(rows.filter((r) => r.count === 0).length).toBeGreaterThanOrEqual(2);
    }
    const quay = S.shimStock.filter((r) => r.siteId === S.sites[0].id);
    for (const v of S.story.tighteningValves) {
      // New shim = old + measured − target (workshop manuals), target mid-spec 0.25 mm, for a found 0.16–0.19 mm.
      for (let found = 160; found < 200; found += 10) {
        const exact = v.shimUm + found - 250;
        for (const size of [Math.floor(exact / 50) * 50, Math.ceil(exact / 50) * 50]) {
          expect(quay.filter((r) => r.sizeUm === size).reduce((n, r) => n + r.count, 0)).toBe(0);
        }
      }
    }
  });
});

describe('demo workshop capacity', () => {
  const LONDON = 'Europe/London';
  const HOUR = 3_600_000;
  it.each(TODAYS)('bays, hours, patterns and a day off as the scenario tells them (today %s)', (today) => {
    const s = buildScenario(today);
    const c = buildCapacity(s);
    const site = (name: string) => s.sites.find((x) => x.name === name)!;
    for (const x of s.sites) expect(c.bays.filter((b) => b.siteId === x.id).length).toBe(x.bays);
    expect(c.bays.filter((b) => b.siteId === site('Quay Street').id).length).toBe(2);
    expect(c.bays.filter((b) => b.siteId === site('Airfield').id).length).toBe(1);

    // Two weeks from the Monday after today, checked day by day with date-fns.
    const monday = format(nextMonday(parseISO(today)), 'yyyy-MM-dd');
    const from = new TZDate(`${monday}T00:00:00`, LONDON).getTime();
    const to = from + 14 * 24 * HOUR + HOUR;
    const shifts = (siteName: string, person: string) => {
      const x = site(siteName);
      const open = siteOpenIntervals(c.siteHours.filter((h) => h.siteId === x.id), LONDON, from, to);
      const id = userByName(s, person).id;
      const ps = c.workPatterns.filter((p) => p.userId === id).map((p) => ({ rrule: p.rrule, startsOn: p.startsOn, endsOn: p.endsOn ?? null, startTime: p.startTime, endTime: p.endTime }));
      return technicianShifts(ps, c.timeOff.filter((o) => o.userId === id), open, LONDON, from, to);
    };
    const tomasz = shifts('Quay Street', 'Tomasz Reed');
    const weekdays = tomasz.filter((i) => !isSaturday(new TZDate(i.start, LONDON)));
    const saturdays = tomasz.filter((i) => isSaturday(new TZDate(i.start, LONDON)));
    expect(weekdays.length).toBe(10);
    expect(weekdays.every((i) => i.end - i.start === 8.5 * HOUR)).toBe(true);
    // Every other Saturday: one of the two in any fortnight, 08:00–12:30.
    expect(saturdays.length).toBe(1);
    expect(saturdays[0].end - saturdays[0].start).toBe(4.5 * HOUR);

    // Priya: Tuesday to Saturday over the coming week less one day off on a day she works.
    const [off] = c.timeOff;
    expect(off.firstDay).toBe(off.lastDay);
    expect(differenceInCalendarDays(parseISO(off.firstDay), parseISO(today))).toBeGreaterThanOrEqual(1);
    expect(differenceInCalendarDays(parseISO(off.firstDay), parseISO(today))).toBeLessThanOrEqual(7);
    const rule = c.workPatterns.find((p) => p.userId === userByName(s, 'Priya Vale').id)!;
    const works = rrulestr(`RRULE:${rule.rrule}`, { dtstart: new Date(`${rule.startsOn}T00:00:00Z`) });
    expect(works.between(new Date(`${off.firstDay}T00:00:00Z`), new Date(`${off.firstDay}T00:00:01Z`), true)).toHaveLength(1);
    const weekFrom = new TZDate(`${today}T00:00:00`, LONDON).getTime() + 24 * HOUR;
    const priyaWeek = technicianShifts(
      [{ rrule: rule.rrule, startsOn: rule.startsOn, endsOn: null, startTime: rule.startTime, endTime: rule.endTime }], c.timeOff, [{ start: weekFrom, end: weekFrom + 7 * 24 * HOUR }], LONDON, weekFrom, weekFrom + 7 * 24 * HOUR,
    );
    expect(priyaWeek.length).toBe(4);
    expect(priyaWeek.map((i) => format(new TZDate(i.start, LONDON), 'yyyy-MM-dd'))).not.toContain(off.firstDay);
  });
});
