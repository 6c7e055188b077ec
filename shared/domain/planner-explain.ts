// The planner's words: why a visit stands where it does, and why work could not go before its due date.
import type { PlanBike, PlanBikeBooking, PlanSite, PlanTask } from './plan-types';
import { lateDays, type PlanState, type Spot, type VisitGroup } from './planner-state';
import { DAY, overlapMs, union } from './planner-timeline';
import { bookingWords, dateWords, dayTimeWords, dayWords, hoursWords, kindWords, listWords, spanWords } from './planner-words';

function itemsLine(g: VisitGroup, bike: PlanBike): string {
  const dates = [...new Set(g.tasks.map((t) => t.dueDate))].sort();
  const parts = dates.map((d) => `${listWords(g.tasks.filter((t) => t.dueDate === d).map((t) => t.itemName))} due ${dateWords(d)}`);
  if (parts.length === 1) return `${parts[0]}.`;
  return `${parts.join('; ')}: brought together so ${bike.fleetNumber} is off the road once.`;
}

const bookingLine = (bike: PlanBike, b: PlanBikeBooking, zone: string) => `${bike.fleetNumber} is ${bookingWords(b)} ${spanWords(b, zone)}.`;

/** Why a visit stands where it does, in words. */
export function explainVisit(state: PlanState, g: VisitGroup, spot: Spot): string[] {
  const bike = state.bikes.get(g.bikeId)!;
  const site = state.sites.get(spot.siteId)!;
  const zone = site.timeZone;
  const why = [itemsLine(g, bike)];
  // Its own bookings that kept it from an earlier start.
  const before = bike.bookings.filter((b) => b.start < spot.start && b.end > state.input.from).sort((a, b) => b.end - a.end).slice(0, 2);
  for (const b of before.reverse()) why.push(bookingLine(bike, b, zone));

  state.unplace(g);
  const first = state.earliest(g);
  const freeOfCover = state.earliest(g, { cover: true });
  state.place(g, spot);
  if (freeOfCover && freeOfCover.start < spot.start) {
    const demand = state.input.demands.find((d) => d.siteId === bike.siteId && d.modelId === bike.modelId && d.start < freeOfCover.end && d.end > freeOfCover.start);
    if (demand) why.push(`${demand.quantity} ${bike.modelName} stay free at ${site.name} for ${kindWords(demand)} ${spanWords(demand, zone)}.`);
  }
  const late = g.tasks.some((t) => lateDays(t, spot.end) > 0);
  if (late) why.push('No bay and technician free before the due date: this is the earliest free slot.');
  else if (!first || first.start >= spot.start) why.push('Earliest free bay and technician before the due date.');
  else if (state.bookedLoss(g, spot.start, spot.end) < state.bookedLoss(g, first.start, first.end)) {
    why.push(`Later than the first free slot (${dayTimeWords(first.start, zone)}) so that the bike stays free while ${bike.modelName} are booked.`);
  } else if (first.technicianId !== spot.technicianId) {
    why.push(`Later than the first free slot (${dayTimeWords(first.start, zone)}) to share the work: ${techName(state, spot)} has less planned at ${site.name}.`);
  } else why.push(`Later than the first free slot (${dayTimeWords(first.start, zone)}), which went to work due sooner.`);
  why.push(`With ${techName(state, spot)} in ${state.input.bays.find((b) => b.id === spot.bayId)?.name ?? 'a bay'}.`);
  return why;
}

const techName = (state: PlanState, spot: Spot) => state.input.technicians.find((t) => t.id === spot.technicianId)?.name ?? 'a technician';

/** Why work is late or out of the plan, and a way out. `shortMinutes`: the site's work due by then that is late or left out. */
export function explainLeftOut(state: PlanState, g: VisitGroup, spot: Spot | undefined, shortMinutes: number): { reason: string; remedy: string } {
  const bike = state.bikes.get(g.bikeId);
  const site = bike ? state.sites.get(bike.siteId) : undefined;
  if (!bike || !site) return { reason: 'The bike is not at a site in this plan.', remedy: 'Give the bike a site, then plan again.' };
  const zone = site.timeZone;
  // Placed late: the first item it is late for; left out: the visit's latest day.
  const lateFor = spot ? g.tasks.filter((t) => lateDays(t, spot.end) > 0).sort((a, b) => a.deadline - b.deadline)[0] : undefined;
  const deadline = lateFor?.deadline ?? g.deadline;
  const due = dateWords(lateFor?.dueDate ?? g.latestDate);
  const lead = spot && lateFor ? `Placed on ${dayWords(spot.start, zone)}, ${daysLate(lateFor, spot)} after ${lateFor.itemName} falls due (${due}). ` : '';
  const techs = state.techsBySite.get(site.id) ?? [];
  const longest = Math.max(0, ...techs.flatMap((t) => t.shifts.map((s) => (s.end - s.start) / 60_000)));
  const remedies: string[] = [];
  const onTime = (s: Spot | undefined) => (s && s.end <= deadline ? s : undefined);
  if (spot) state.unplace(g);
  let reason: string;
  let canWait = false;
  let overdue = false;
  const noBays = !(state.baysBySite.get(site.id) ?? []).length;
  if (noBays) {
    reason = `${site.name} has no bays.`;
    remedies.push(`add a bay to ${site.name} in its settings`);
  }
  else if (!techs.some((t) => t.shifts.length)) reason = `No technician works at ${site.name} in the plan's days.`;
  else if (deadline <= state.input.from) {
    overdue = true;
    reason = `It was already overdue when this plan was made (due ${due}), so no time before its due date is left.`;
    remedies.push(
      g.tasks.some((t) => t.safetyCritical)
        ? `keep ${bike.fleetNumber} off hires and lessons until the work is signed off`
        : `do it at the first free time; move other work on the board to bring it sooner`,
    );
  }
  else if (g.minutes > longest) {
    reason = `It takes ${hoursWords(g.minutes)}; the longest shift at ${site.name} is ${hoursWords(longest)}.`;
    remedies.push('split the work into shorter tasks', 'plan a longer shift for one technician');
  } else if (!spot && deadline >= state.input.to) {
    canWait = true;
    reason = `No bay and technician free at ${site.name} up to ${dayWords(state.input.to - 1, zone)}; it falls due ${due}, so a later plan can take it.`;
  } else if (!onTime(state.earliest(g, { busy: true, cover: true }))) {
    const inWay = bike.bookings.filter((b) => b.start < deadline && b.end > state.input.from).sort((a, b) => a.start - b.start);
    if (inWay.length && onTime(state.earliest(g, { busy: true, cover: true, bookings: true }))) {
      reason = `${bike.fleetNumber} is booked whenever a technician could take it before ${due}: ${inWay.slice(0, 2).map((b) => `${b.kind} '${b.title}' ${spanWords(b, zone)}`).join(', ')}.`;
      const longestBooking = [...inWay].sort((a, b) => b.end - b.start - (a.end - a.start))[0];
      remedies.push(`move ${kindWords(longestBooking)} on ${dayWords(longestBooking.start, zone)}`);
    } else reason = `No technician at ${site.name} works a long enough stretch (${hoursWords(g.minutes)}) before ${due}.`;
  } else if (!onTime(state.earliest(g, { busy: true }))) {
    // Shifts and bookings leave room: the cover its model's bookings need takes it.
    const demand = state.input.demands
      .filter((d) => d.siteId === bike.siteId && d.modelId === bike.modelId && d.start < deadline && d.end > state.input.from)
      .sort((a, b) => b.quantity - a.quantity || a.start - b.start || (a.bookingId < b.bookingId ? -1 : 1))[0];
    reason = demand
      ? `Keeping ${demand.quantity} ${bike.modelName} free at ${site.name} for ${kindWords(demand)} ${spanWords(demand, zone)} leaves no room before ${due}.`
      : `Too few ${bike.modelName} stay free at ${site.name} for their bookings before ${due}.`;
    if (demand) remedies.push(`move ${kindWords(demand)} on ${dayWords(demand.start, zone)}`);
  } else reason = `No bay and technician free at ${site.name} before ${due}; ${hoursWords(shortMinutes)} short.`;

  for (const other of state.input.sites) {
    if (other.id === site.id || overdue) continue;
    const there = onTime(state.earliest(g, { cover: true }, other.id));
    if (there) remedies.unshift(`move ${bike.fleetNumber} to ${other.name} and plan it there (${dayTimeWords(there.start, other.timeZone)} is free)`);
  }
  const overtime = noBays || overdue ? undefined : overtimeDay(state, g, bike, site, deadline);
  if (overtime) remedies.push(`overtime for ${overtime.name} on ${overtime.day}`);
  if (spot) state.place(g, spot);
  if (!remedies.length) remedies.push('add working hours at the site before the due date');
  const ways = remedies.join(', or ');
  if (canWait) return { reason, remedy: `Nothing is needed yet; to do it sooner: ${ways}.` };
  return { reason: lead + reason, remedy: `${ways[0].toUpperCase()}${ways.slice(1)}.` };
}

function daysLate(task: PlanTask, spot: Spot): string {
  const n = lateDays(task, spot.end);
  return n === 1 ? '1 day' : `${n} days`;
}

/**
 * A day (24 hours counted back from the due date's end) on which the bike is free long enough,
 * latest first, and the site's technician with the least planned work then.
 */
function overtimeDay(state: PlanState, g: VisitGroup, bike: PlanBike, site: PlanSite, deadline: number): { name: string; day: string } | undefined {
  const techs = (state.techsBySite.get(site.id) ?? []).filter((t) => t.shifts.length);
  if (!techs.length) return undefined;
  const need = g.minutes * 60_000;
  for (let end = Math.min(deadline, state.input.to); end - DAY >= state.input.from - DAY; end -= DAY) {
    const start = Math.max(end - DAY, state.input.from);
    if (end - start < need) continue;
    const booked = overlapMs(start, end, union(bike.bookings));
    if (end - start - booked < need) continue;
    let best = techs[0];
    let bestMinutes = Infinity;
    for (const t of techs) {
      const busy = state.techLane.get(t.id)!.all().filter((b) => b.start >= start && b.start < end);
      const minutes = busy.reduce((n, b) => n + (b.end - b.start), 0);
      if (minutes < bestMinutes) {
        best = t;
        bestMinutes = minutes;
      }
    }
    return { name: best.name, day: dayWords(start, site.timeZone) };
  }
  return undefined;
}

