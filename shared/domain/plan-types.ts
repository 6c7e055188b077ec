// The workshop planner's inputs and outputs. Pure data: the server loads them from the database
// (server/services/workshop-plan-inputs.ts), the planner (shared/domain/planner.ts) places visits, and the
// plan board and the move check use the same shapes.
//
// Instants are epoch milliseconds (UTC); intervals are half-open [start, end). Calendar days are
// "YYYY-MM-DD" in the site's own time zone.

export interface Interval {
  start: number;
  end: number;
}

export interface PlanSite {
  id: string;
  name: string;
  timeZone: string;
  /** The workshop's opening hours inside the horizon, one interval per open day. */
  open: Interval[];
}

export interface PlanBay {
  id: string;
  siteId: string;
  name: string;
}

export interface PlanTechnician {
  id: string;
  name: string;
  siteId: string;
  /** Working time inside the horizon: pattern occurrences less time off, clipped to the site's opening hours. */
  shifts: Interval[];
}

export interface PlanBikeBooking extends Interval {
  bookingId: string;
  kind: 'hire' | 'lesson';
  title: string;
}

export interface PlanBike {
  id: string;
  fleetNumber: string;
  siteId: string;
  modelId: string;
  modelName: string;
  /** In service: counts towards the cover of its model's bookings at its site (a grounded bike does not). */
  available: boolean;
  /** Its own bookings (hires or lessons booked for this bike) overlapping the horizon. */
  bookings: PlanBikeBooking[];
}

/** A booking for `quantity` bikes of a model at a site: that many bikes of the model must stay out of the workshop. */
export interface ModelDemand extends Interval {
  bookingId: string;
  siteId: string;
  modelId: string;
  quantity: number;
  kind: 'hire' | 'lesson';
  title: string;
}

export interface PlanTask {
  id: string;
  bikeId: string;
  itemName: string;
  minutes: number;
  /** The day it falls due, at the bike's site. */
  dueDate: string;
  /** The end of that day at the site: work finished after this is late. */
  deadline: number;
  safetyCritical: boolean;
  /** Kilometres left before it falls due by distance, and the bike's usage; null when not distance-based. */
  remainingKm: number | null;
  usageKmPerDay: number | null;
}

/** A visit the planner must keep as it is: started, planned for today (the frozen horizon) or placed by a person. */
export interface FixedVisit {
  id: string;
  bikeId: string;
  siteId: string;
  bayId: string;
  technicianId: string;
  start: number;
  end: number;
  taskIds: string[];
}

export interface PlanInput {
  /** Planning horizon. */
  from: number;
  to: number;
  sites: PlanSite[];
  bays: PlanBay[];
  technicians: PlanTechnician[];
  bikes: PlanBike[];
  demands: ModelDemand[];
  /** Open tasks not in a fixed visit. */
  tasks: PlanTask[];
  fixed: FixedVisit[];
  /** Items falling due within this many days (or this many km of riding, whichever first) of a bike's earliest come in together. */
  windowDays: number;
  windowKm: number;
}

export interface PlannedVisit {
  /** Stable across runs for the same bike and first task, so a re-plan can keep a visit's id. */
  key: string;
  bikeId: string;
  siteId: string;
  bayId: string;
  technicianId: string;
  start: number;
  end: number;
  taskIds: string[];
  /** The earliest due date among its safety-critical items, else among all. */
  latestDate: string;
  /** Why it stands where it does, in words. */
  why: string[];
}

export interface UnplacedTask {
  taskId: string;
  bikeId: string;
  siteId: string;
  /** e.g. "No bay free at Airfield before 14 Dec; 6 h short." */
  reason: string;
  /** e.g. "Plan it at Quay Street, or overtime on Sat 12 Dec, or move hire H-123." */
  remedy: string;
}

/** The objective, compared in this order (lexicographically); every term is to be made small. */
export interface PlanObjective {
  /** Days late summed over safety-critical items (unplaced ones count as late to the horizon's end plus one day). */
  safetyLateDays: number;
  /** Days late summed over other items. */
  lateDays: number;
  /** Hours a visit keeps a bike of a model in the workshop while that model is booked at its site. */
  bookedHoursLost: number;
  visits: number;
  /** Largest less smallest planned minutes across a site's technicians, summed over sites. */
  loadSpread: number;
}

export interface PlanResult {
  visits: PlannedVisit[];
  unplaced: UnplacedTask[];
  objective: PlanObjective;
}

/** Where a person asks a visit to go. */
export interface Placement {
  start: number;
  bayId: string;
  technicianId: string;
}
