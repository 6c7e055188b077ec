// The check behind moving a visit by hand: every clash with the rest of the plan, in words.
import type { PlanInput, Placement } from './plan-types';
import { PlanState, coverKey } from './planner-state';
import { QUARTER } from './planner-timeline';
import { bookingWords, dateWords, dayTimeWords, dayWords, isoDayOf, kindWords, listWords, spanWords, timesWords } from './planner-words';

/**
 * What stands in the way of putting a visit at `at`, with `input.fixed` holding every other visit.
 * An empty list means the move is allowed.
 */
export function checkPlacement(input: PlanInput, visit: { id: string; bikeId: string; taskIds: string[] }, at: Placement): string[] {
  const others = input.fixed.filter((f) => f.id !== visit.id);
  const state = new PlanState({ ...input, fixed: others });
  const bike = state.bikes.get(visit.bikeId);
  if (!bike || !state.sites.has(bike.siteId)) return ['That bike is not at a site in this plan: reload the plan and try again.'];
  const bay = input.bays.find((b) => b.id === at.bayId);
  if (!bay || !state.sites.has(bay.siteId)) return ['That bay is not in this plan: pick one of the bays on the board.'];
  const tasks = visit.taskIds.map((id) => input.tasks.find((t) => t.id === id));
  if (!tasks.length || tasks.some((t) => !t)) return ["Some of this visit's work is no longer open: reload the plan and try again."];
  const site = state.sites.get(bay.siteId)!;
  const zone = site.timeZone;
  const fleet = (bikeId: string) => state.bikes.get(bikeId)?.fleetNumber ?? 'another bike';
  const bayName = (bayId: string) => input.bays.find((b) => b.id === bayId)?.name ?? 'another bay';
  const start = at.start;
  const end = start + tasks.reduce((n, t) => n + t!.minutes, 0) * 60_000;
  const span = { start, end };
  const out: string[] = [];

  if (!Number.isFinite(start) || start % QUARTER !== 0) out.push('Visits start on the quarter hour: pick a start at :00, :15, :30 or :45.');
  if (start < input.from || end > input.to) {
    out.push(`That is outside the plan's days: pick a start between ${dayTimeWords(input.from, zone)} and ${dayTimeWords(input.to - (end - start), zone)}.`);
  }
  if (bay.siteId !== bike.siteId) {
    out.push(`${bay.name} is at ${site.name}, but ${bike.fleetNumber} is kept at ${state.sites.get(bike.siteId)!.name}: pick a bay there.`);
  }
  for (const f of others) {
    if (f.bayId === bay.id && f.start < end && f.end > start) out.push(`${bay.name} at ${site.name} is taken ${timesWords(f, zone, start)} by ${fleet(f.bikeId)}.`);
  }

  const tech = input.technicians.find((t) => t.id === at.technicianId && t.siteId === bay.siteId);
  if (!tech) {
    const elsewhere = input.technicians.find((t) => t.id === at.technicianId);
    out.push(
      elsewhere
        ? `${elsewhere.name} works at ${state.sites.get(elsewhere.siteId)?.name ?? 'another site'}, not ${site.name}: pick a technician of ${site.name}.`
        : 'That technician is not in this plan: pick one of the technicians on the board.',
    );
  } else {
    if (!tech.shifts.some((s) => s.start <= start && end <= s.end)) {
      const day = isoDayOf(start, zone);
      const sameDay = tech.shifts.filter((s) => isoDayOf(s.start, zone) === day).sort((a, b) => a.start - b.start);
      out.push(
        sameDay.length
          ? `${tech.name} works ${listWords(sameDay.map((s) => timesWords(s, zone, start)))} on ${dayWords(start, zone)}; the visit would run ${timesWords(span, zone, start)}.`
          : `${tech.name} is not working on ${dayWords(start, zone)}.`,
      );
    }
    for (const f of others) {
      if (f.technicianId === tech.id && f.start < end && f.end > start) out.push(`${tech.name} is busy ${timesWords(f, zone, start)} with ${fleet(f.bikeId)}.`);
    }
  }

  for (const b of bike.bookings) {
    if (b.start < end && b.end > start) out.push(`${bike.fleetNumber} is ${bookingWords(b)} ${spanWords(b, zone)}.`);
  }
  for (const f of others) {
    if (f.bikeId === bike.id && f.start < end && f.end > start) out.push(`${bike.fleetNumber} is already in the workshop ${timesWords(f, zone, start)} (${bayName(f.bayId)}).`);
  }

  const cover = bike.available ? state.cover.get(coverKey(bike.siteId, bike.modelId)) : undefined;
  if (cover) {
    for (const seg of cover.segments(start, end)) {
      if (seg.demand === 0 || seg.end <= seg.start) continue;
      const away = state.bookingLane.get(bike.id)!.conflict(seg.start, seg.end) ?? state.bikeVisitLane.get(bike.id)!.conflict(seg.start, seg.end);
      const left = seg.slack + seg.demand - (away ? 0 : 1);
      if (left >= seg.demand) continue;
      const asking = input.demands.filter((d) => d.siteId === bike.siteId && d.modelId === bike.modelId && d.start <= seg.start && d.end > seg.start);
      const homeSite = state.sites.get(bike.siteId)!;
      out.push(`Only ${Math.max(0, left)} ${bike.modelName} would be left at ${homeSite.name} for ${listWords(asking.map(kindWords))} (needs ${seg.demand}).`);
      break;
    }
  }

  const dueFirst = tasks
    .filter((t) => t!.safetyCritical && t!.deadline < end)
    .sort((a, b) => a!.deadline - b!.deadline || (a!.id < b!.id ? -1 : 1))[0];
  if (dueFirst) out.push(`That is after ${bike.fleetNumber}'s ${dueFirst.itemName} falls due on ${dateWords(dueFirst.dueDate)}.`);
  return out;
}
