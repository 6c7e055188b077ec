import { sql } from 'drizzle-orm';
import {
  bigint,
  bigserial,
  check,
  boolean,
  date,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core';
import { MOVEMENT_KINDS, ORDER_STATES, PART_FAMILIES, PART_UNITS } from '../../shared/domain/parts';

/** A file sent with an e-mail: its name, media type and text content. */
export interface MailAttachment {
  filename: string;
  contentType: string;
  content: string;
}

// Clearances and shim sizes are stored in whole micrometres so that the
// arithmetic on them is exact (0.30 − 0.22 mm must be 80 µm, not 79.999…).

const createdAt = () => timestamp('created_at', { withTimezone: true }).notNull().defaultNow();

export const sites = pgTable('sites', {
  id: uuid('id').primaryKey().defaultRandom(),
  name: text('name').notNull().unique(),
  timeZone: text('time_zone').notNull().default('Europe/London'),
  bays: integer('bays').notNull().default(1),
  createdAt: createdAt(),
});

export const users = pgTable('users', {
  id: uuid('id').primaryKey().defaultRandom(),
  email: text('email').notNull().unique(),
  name: text('name').notNull(),
  role: text('role', { enum: ['admin', 'manager', 'technician', 'desk'] }).notNull(),
  passwordHash: text('password_hash'),
  disabled: boolean('disabled').notNull().default(false),
  // The feed address is signed with the server secret over (user, version); a reset bumps the version.
  calendarFeedVersion: integer('calendar_feed_version').notNull().default(1),
  inviteTokenHash: text('invite_token_hash'),
  inviteExpiresAt: timestamp('invite_expires_at', { withTimezone: true }),
  createdAt: createdAt(),
});

export const userSites = pgTable(
  'user_sites',
  {
    userId: uuid('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
    siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  },
  (t) => [primaryKey({ columns: [t.userId, t.siteId] })],
);

export const bikeModels = pgTable('bike_models', {
  id: uuid('id').primaryKey().defaultRandom(),
  name: text('name').notNull().unique(),
  cylinders: integer('cylinders').notNull(),
  intakeValvesPerCylinder: integer('intake_valves_per_cylinder').notNull(),
  exhaustValvesPerCylinder: integer('exhaust_valves_per_cylinder').notNull(),
  adjuster: text('adjuster', { enum: ['shim-under-bucket', 'screw-and-locknut'] }).notNull(),
  intakeMinUm: integer('intake_min_um').notNull(),
  intakeMaxUm: integer('intake_max_um').notNull(),
  exhaustMinUm: integer('exhaust_min_um').notNull(),
  exhaustMaxUm: integer('exhaust_max_um').notNull(),
  shimMinUm: integer('shim_min_um'),
  shimMaxUm: integer('shim_max_um'),
  shimStepUm: integer('shim_step_um'),
  createdAt: createdAt(),
});

export const serviceItems = pgTable(
  'service_items',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    modelId: uuid('model_id').notNull().references(() => bikeModels.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    category: text('category', {
      enum: ['oil', 'valves', 'chain', 'brakes', 'tyres', 'brake-fluid', 'inspection', 'other'],
    }).notNull(),
    everyKm: integer('every_km'),
    everyMonths: integer('every_months'),
    firstAtKm: integer('first_at_km'),
    rrule: text('rrule'),
    safetyCritical: boolean('safety_critical').notNull().default(false),
    estimatedMinutes: integer('estimated_minutes').notNull().default(30),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('service_items_model_name').on(t.modelId, t.name)],
);

export const bikes = pgTable(
  'bikes',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    fleetNumber: text('fleet_number').notNull().unique(),
    vin: text('vin'),
    registration: text('registration'),
    modelId: uuid('model_id').notNull().references(() => bikeModels.id),
    siteId: uuid('site_id').notNull().references(() => sites.id),
    odometerUnit: text('odometer_unit', { enum: ['km', 'mi'] }).notNull().default('km'),
    inServiceDate: date('in_service_date', { mode: 'string' }).notNull(),
    inServiceOdometer: doublePrecision('in_service_odometer').notNull().default(0),
    status: text('status', { enum: ['in_service', 'in_workshop', 'out_of_service', 'retired'] })
      .notNull()
      .default('in_service'),
    statusReason: text('status_reason'),
    createdAt: createdAt(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('bikes_site').on(t.siteId), index('bikes_model').on(t.modelId)],
);

// Every odometer value as typed (value + unit) and as continuous distance in km,
// which keeps adding up across a replaced or reset odometer.
export const odometerReadings = pgTable(
  'odometer_readings',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    bikeId: uuid('bike_id').notNull().references(() => bikes.id, { onDelete: 'cascade' }),
    date: date('date', { mode: 'string' }).notNull(),
    value: doublePrecision('value').notNull(),
    unit: text('unit', { enum: ['km', 'mi'] }).notNull(),
    odometerKm: doublePrecision('odometer_km').notNull(),
    reset: boolean('reset').notNull().default(false),
    source: text('source', { enum: ['check-in', 'service', 'import', 'setup'] }).notNull().default('check-in'),
    recordedBy: uuid('recorded_by').references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [
    index('odometer_readings_bike_date').on(t.bikeId, t.date, t.odometerKm),
    // The highest reading of a bike is one index probe (its latest odometer, its current km).
    index('odometer_readings_bike_km').on(t.bikeId, t.odometerKm),
    // The odometer fitted now (the latest replacement) is one probe too, not a walk through every reading.
    index('odometer_readings_bike_resets').on(t.bikeId, t.odometerKm).where(sql`${t.reset}`),
  ],
);

export const sessions = pgTable(
  'sessions',
  {
    sid: text('sid').primaryKey(),
    sess: jsonb('sess').notNull(),
    userId: uuid('user_id'),
    expire: timestamp('expire', { withTimezone: true }).notNull(),
  },
  (t) => [index('sessions_expire').on(t.expire), index('sessions_user').on(t.userId)],
);

/**
 * The stored answer of an unsafe request sent with an Idempotency-Key, kept a day per person and key:
 * a repeat with the same body gets the same answer again and changes nothing; `status` null while
 * the first request is still being worked on.
 */
export const idempotentRequests = pgTable(
  'idempotent_requests',
  {
    userId: uuid('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
    key: text('key').notNull(),
    /** SHA-256 of the method, the path and the body as sent. */
    fingerprint: text('fingerprint').notNull(),
    method: text('method').notNull(),
    path: text('path').notNull(),
    status: integer('status'),
    contentType: text('content_type'),
    body: text('body'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.key] }), index('idempotent_requests_created').on(t.createdAt)],
);

/**
 * A counter every write to the fleet's tables moves on (statement triggers, see the migrations),
 * in the writing transaction: a cached answer read at version n is good while the counter says n,
 * on every app instance sharing the database.
 */
export const dataVersions = pgTable('data_versions', {
  scope: text('scope').primaryKey(),
  n: bigint('n', { mode: 'number' }).notNull().default(0),
});

export const auditLog = pgTable(
  'audit_log',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
    userId: uuid('user_id').references(() => users.id),
    action: text('action').notNull(),
    entity: text('entity').notNull(),
    entityId: text('entity_id'),
    changes: jsonb('changes'),
  },
  (t) => [index('audit_log_entity').on(t.entity, t.entityId)],
);

export const settings = pgTable('settings', {
  key: text('key').primaryKey(),
  value: jsonb('value').notNull(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().default(sql`now()`),
});

// ── Service record, due state and work ───────────────────────────────────────

export const serviceRecords = pgTable(
  'service_records',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    bikeId: uuid('bike_id').notNull().references(() => bikes.id, { onDelete: 'cascade' }),
    serviceItemId: uuid('service_item_id').notNull().references(() => serviceItems.id, { onDelete: 'cascade' }),
    date: date('date', { mode: 'string' }).notNull(),
    odometerKm: doublePrecision('odometer_km').notNull(),
    taskId: uuid('task_id'),
    doneBy: uuid('done_by').references(() => users.id),
    notes: text('notes'),
    createdAt: createdAt(),
  },
  (t) => [index('service_records_bike_item').on(t.bikeId, t.serviceItemId, t.date)],
);

/**
 * The latest due computation per bike and service item, written by the scan and by check-ins. Derived
 * data, rewritten whole by every scan: no foreign keys (a first scan writes a row per bike and item,
 * and checking two keys per row doubled its cost); triggers on bikes and service_items remove a
 * deleted one's rows as a cascade would (migration 0003), and every read joins both tables.
 */
export const dueStates = pgTable(
  'due_states',
  {
    bikeId: uuid('bike_id').notNull(),
    serviceItemId: uuid('service_item_id').notNull(),
    status: text('status', { enum: ['ok', 'soon', 'overdue'] }).notNull(),
    dueAtKm: doublePrecision('due_at_km'),
    dueByDate: date('due_by_date', { mode: 'string' }),
    projectedDateForKm: date('projected_date_for_km', { mode: 'string' }),
    dueDate: date('due_date', { mode: 'string' }),
    trigger: text('trigger', { enum: ['km', 'calendar'] }),
    currentKm: doublePrecision('current_km').notNull(),
    remainingKm: doublePrecision('remaining_km'),
    remainingDays: integer('remaining_days'),
    usageKmPerDay: doublePrecision('usage_km_per_day'),
    baselineDate: date('baseline_date', { mode: 'string' }).notNull(),
    baselineKm: doublePrecision('baseline_km').notNull(),
    computedAt: timestamp('computed_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.bikeId, t.serviceItemId] }), index('due_states_due_date').on(t.dueDate)],
);

export const serviceTasks = pgTable(
  'service_tasks',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    bikeId: uuid('bike_id').notNull().references(() => bikes.id, { onDelete: 'cascade' }),
    serviceItemId: uuid('service_item_id').notNull().references(() => serviceItems.id, { onDelete: 'cascade' }),
    // One task per due cycle: the cycle is named by the baseline it counts from.
    cycleKey: text('cycle_key').notNull(),
    status: text('status', { enum: ['open', 'in_progress', 'done', 'cancelled'] }).notNull().default('open'),
    origin: text('origin', { enum: ['due-scan', 'trend', 'manual'] }).notNull().default('due-scan'),
    assigneeId: uuid('assignee_id').references(() => users.id),
    dueDate: date('due_date', { mode: 'string' }),
    estimatedMinutes: integer('estimated_minutes').notNull().default(30),
    note: text('note'),
    // Readings typed on a task card before it is closed, so a locked screen or another tablet loses nothing.
    draft: jsonb('draft'),
    version: integer('version').notNull().default(1),
    raisedAt: timestamp('raised_at', { withTimezone: true }).notNull().defaultNow(),
    startedAt: timestamp('started_at', { withTimezone: true }),
    closedAt: timestamp('closed_at', { withTimezone: true }),
    closedBy: uuid('closed_by').references(() => users.id),
  },
  (t) => [
    uniqueIndex('service_tasks_cycle').on(t.bikeId, t.serviceItemId, t.cycleKey),
    index('service_tasks_assignee').on(t.assigneeId, t.status),
  ],
);

export const defects = pgTable(
  'defects',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    bikeId: uuid('bike_id').notNull().references(() => bikes.id, { onDelete: 'cascade' }),
    category: text('category', { enum: ['brakes', 'tyres', 'engine', 'chain', 'lights', 'bodywork', 'other'] }).notNull(),
    text: text('text').notNull(),
    safetyCritical: boolean('safety_critical').notNull().default(false),
    reportedBy: uuid('reported_by').references(() => users.id),
    reportedAt: timestamp('reported_at', { withTimezone: true }).notNull().defaultNow(),
    resolvedAt: timestamp('resolved_at', { withTimezone: true }),
  },
  (t) => [index('defects_bike').on(t.bikeId)],
);

/** Claimed once per job and time slot by whichever instance gets there first. */
export const jobRuns = pgTable(
  'job_runs',
  {
    job: text('job').notNull(),
    slot: text('slot').notNull(),
    startedAt: timestamp('started_at', { withTimezone: true }).notNull().defaultNow(),
    /** The process (one id per start) that runs or ran it: a run whose process died is claimed again. */
    owner: text('owner'),
    finishedAt: timestamp('finished_at', { withTimezone: true }),
    result: jsonb('result'),
  },
  (t) => [primaryKey({ columns: [t.job, t.slot] })],
);

export const outbox = pgTable(
  'outbox',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    // e.g. "digest:2026-W49:<user id>": the same digest is never queued twice for one person.
    dedupeKey: text('dedupe_key').notNull().unique(),
    to: text('to').notNull(),
    subject: text('subject').notNull(),
    text: text('text').notNull(),
    html: text('html').notNull(),
    /** Files sent with the message (a purchase order's CSV): small text files only. */
    attachments: jsonb('attachments').$type<MailAttachment[]>(),
    status: text('status', { enum: ['pending', 'sent', 'failed'] }).notNull().default('pending'),
    attempts: integer('attempts').notNull().default(0),
    nextAttemptAt: timestamp('next_attempt_at', { withTimezone: true }).notNull().defaultNow(),
    lastError: text('last_error'),
    createdAt: createdAt(),
    sentAt: timestamp('sent_at', { withTimezone: true }),
  },
  (t) => [index('outbox_pending').on(t.status, t.nextAttemptAt)],
);

/** What the built-in mail catcher received when no SMTP server is configured. */
export const caughtMail = pgTable('caught_mail', {
  id: uuid('id').primaryKey().defaultRandom(),
  to: text('to').notNull(),
  from: text('from').notNull(),
  subject: text('subject').notNull(),
  raw: text('raw').notNull(),
  receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
});

// ── Valve work and shim stock ────────────────────────────────────────────────

export const valveChecks = pgTable(
  'valve_checks',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    bikeId: uuid('bike_id').notNull().references(() => bikes.id, { onDelete: 'cascade' }),
    taskId: uuid('task_id').references(() => serviceTasks.id),
    date: date('date', { mode: 'string' }).notNull(),
    odometerKm: doublePrecision('odometer_km').notNull(),
    checkedBy: uuid('checked_by').references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [index('valve_checks_bike').on(t.bikeId, t.odometerKm)],
);

export const valveReadings = pgTable(
  'valve_readings',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    checkId: uuid('check_id').notNull().references(() => valveChecks.id, { onDelete: 'cascade' }),
    cylinder: integer('cylinder').notNull(),
    side: text('side', { enum: ['intake', 'exhaust'] }).notNull(),
    position: integer('position').notNull(),
    asFoundUm: integer('as_found_um').notNull(),
    asLeftUm: integer('as_left_um'),
    shimBeforeUm: integer('shim_before_um'),
    shimAfterUm: integer('shim_after_um'),
    method: text('method', { enum: ['feeler', 'direct'] }).notNull().default('feeler'),
  },
  (t) => [uniqueIndex('valve_readings_valve').on(t.checkId, t.cylinder, t.side, t.position)],
);

export const shimStock = pgTable(
  'shim_stock',
  {
    siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
    sizeUm: integer('size_um').notNull(),
    condition: text('condition', { enum: ['new', 'used'] }).notNull(),
    count: integer('count').notNull().default(0),
    minCount: integer('min_count').notNull().default(0),
  },
  (t) => [primaryKey({ columns: [t.siteId, t.sizeUm, t.condition] })],
);

/**
 * One ledger for a site's stock: a movement is either of shims (size and condition) or of a
 * catalogue part. For a part, the sum of its movements at a site is its on-hand figure.
 */
export const stockMovements = pgTable(
  'stock_movements',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
    sizeUm: integer('size_um'),
    condition: text('condition', { enum: ['new', 'used'] }),
    partId: uuid('part_id').references(() => parts.id, { onDelete: 'cascade' }),
    kind: text('kind', { enum: MOVEMENT_KINDS }),
    delta: doublePrecision('delta').notNull(),
    reason: text('reason').notNull(),
    taskId: uuid('task_id'),
    purchaseOrderId: uuid('purchase_order_id'),
    by: uuid('by').references(() => users.id),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('stock_movements_part').on(t.siteId, t.partId, t.at),
    check('stock_movements_shim_or_part', sql`(${t.partId} is null) = (${t.sizeUm} is not null)`),
  ],
);

// ── Parts, their stock and orders ────────────────────────────────────────────

export const suppliers = pgTable('suppliers', {
  id: uuid('id').primaryKey().defaultRandom(),
  name: text('name').notNull().unique(),
  email: text('email').notNull(),
  createdAt: createdAt(),
});

export const parts = pgTable('parts', {
  id: uuid('id').primaryKey().defaultRandom(),
  partNumber: text('part_number').notNull().unique(),
  name: text('name').notNull(),
  family: text('family', { enum: PART_FAMILIES }).notNull(),
  unit: text('unit', { enum: PART_UNITS }).notNull(),
  packSize: doublePrecision('pack_size').notNull().default(1),
  supplierId: uuid('supplier_id').references(() => suppliers.id),
  leadTimeDays: integer('lead_time_days').notNull().default(7),
  unitCostPence: integer('unit_cost_pence').notNull().default(0),
  createdAt: createdAt(),
});

/** What one service of an item uses: `share` is the part of services that need it (pads at one inspection in four). */
export const serviceItemParts = pgTable(
  'service_item_parts',
  {
    serviceItemId: uuid('service_item_id').notNull().references(() => serviceItems.id, { onDelete: 'cascade' }),
    partId: uuid('part_id').notNull().references(() => parts.id, { onDelete: 'cascade' }),
    quantity: doublePrecision('quantity').notNull(),
    share: doublePrecision('share').notNull().default(1),
  },
  (t) => [primaryKey({ columns: [t.serviceItemId, t.partId] })],
);

export const partStock = pgTable(
  'part_stock',
  {
    siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
    partId: uuid('part_id').notNull().references(() => parts.id, { onDelete: 'cascade' }),
    onHand: doublePrecision('on_hand').notNull().default(0),
    minimum: doublePrecision('minimum').notNull().default(0),
  },
  (t) => [primaryKey({ columns: [t.siteId, t.partId] }), check('part_stock_not_negative', sql`${t.onHand} >= 0`)],
);

export const purchaseOrders = pgTable(
  'purchase_orders',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    number: integer('number').notNull().unique(),
    siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
    supplierId: uuid('supplier_id').notNull().references(() => suppliers.id),
    status: text('status', { enum: ORDER_STATES }).notNull().default('draft'),
    note: text('note'),
    createdBy: uuid('created_by').references(() => users.id),
    createdAt: createdAt(),
    sentAt: timestamp('sent_at', { withTimezone: true }),
    receivedAt: timestamp('received_at', { withTimezone: true }),
  },
  (t) => [index('purchase_orders_site').on(t.siteId, t.status)],
);

export const purchaseOrderLines = pgTable(
  'purchase_order_lines',
  {
    orderId: uuid('order_id').notNull().references(() => purchaseOrders.id, { onDelete: 'cascade' }),
    partId: uuid('part_id').notNull().references(() => parts.id),
    quantity: doublePrecision('quantity').notNull(),
    received: doublePrecision('received').notNull().default(0),
  },
  (t) => [primaryKey({ columns: [t.orderId, t.partId] })],
);

// ── Readings with limits, attachments ────────────────────────────────────────

/** What a service item asks the technician to record, with its unit and limits. */
export const readingTemplates = pgTable(
  'reading_templates',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    serviceItemId: uuid('service_item_id').notNull().references(() => serviceItems.id, { onDelete: 'cascade' }),
    label: text('label').notNull(),
    kind: text('kind', { enum: ['measure', 'check', 'date'] }).notNull(),
    unit: text('unit'),
    min: doublePrecision('min'),
    max: doublePrecision('max'),
    // A value outside a safety-critical limit grounds the bike at once.
    safetyCritical: boolean('safety_critical').notNull().default(false),
    position: integer('position').notNull().default(0),
  },
  (t) => [index('reading_templates_item').on(t.serviceItemId, t.position)],
);

export const serviceReadings = pgTable(
  'service_readings',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    serviceRecordId: uuid('service_record_id').notNull().references(() => serviceRecords.id, { onDelete: 'cascade' }),
    templateId: uuid('template_id').references(() => readingTemplates.id, { onDelete: 'set null' }),
    label: text('label').notNull(),
    kind: text('kind', { enum: ['measure', 'check', 'date'] }).notNull(),
    unit: text('unit'),
    value: doublePrecision('value'),
    done: boolean('done'),
    dateValue: date('date_value', { mode: 'string' }),
    min: doublePrecision('min'),
    max: doublePrecision('max'),
    outOfLimits: boolean('out_of_limits').notNull().default(false),
    safetyCritical: boolean('safety_critical').notNull().default(false),
  },
  (t) => [index('service_readings_record').on(t.serviceRecordId)],
);

export const attachments = pgTable(
  'attachments',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
    bikeId: uuid('bike_id').notNull().references(() => bikes.id, { onDelete: 'cascade' }),
    defectId: uuid('defect_id').references(() => defects.id, { onDelete: 'cascade' }),
    taskId: uuid('task_id').references(() => serviceTasks.id, { onDelete: 'cascade' }),
    storageKey: text('storage_key').notNull().unique(),
    thumbKey: text('thumb_key'),
    mime: text('mime').notNull(),
    bytes: integer('bytes').notNull(),
    width: integer('width'),
    height: integer('height'),
    originalName: text('original_name'),
    uploadedBy: uuid('uploaded_by').references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [index('attachments_bike').on(t.bikeId)],
);

// ── Workshop planning: capacity, bookings, visits ───────────────────────────

/** A workshop bay (lift) at a site. A site's `bays` count and its bay rows are kept equal. */
export const bays = pgTable(
  'bays',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    position: integer('position').notNull().default(0),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('bays_site_name').on(t.siteId, t.name)],
);

/** When a site's workshop is open, per ISO weekday (1 = Monday … 7 = Sunday), local time "HH:MM". No row: closed that day. */
export const siteHours = pgTable(
  'site_hours',
  {
    siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
    weekday: integer('weekday').notNull(),
    opensAt: text('opens_at').notNull(),
    closesAt: text('closes_at').notNull(),
  },
  (t) => [primaryKey({ columns: [t.siteId, t.weekday] })],
);

/**
 * A technician's working pattern at a site: an RFC 5545 RRULE (without DTSTART) counted from `startsOn`,
 * e.g. FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR or FREQ=WEEKLY;INTERVAL=2;BYDAY=SA, with local times of day.
 */
export const workPatterns = pgTable(
  'work_patterns',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    userId: uuid('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
    siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
    rrule: text('rrule').notNull(),
    startsOn: date('starts_on', { mode: 'string' }).notNull(),
    endsOn: date('ends_on', { mode: 'string' }),
    startTime: text('start_time').notNull(),
    endTime: text('end_time').notNull(),
    label: text('label'),
    createdAt: createdAt(),
  },
  (t) => [index('work_patterns_user').on(t.userId)],
);

/** Whole days a technician is away (first and last day included). */
export const timeOff = pgTable(
  'time_off',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    userId: uuid('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
    firstDay: date('first_day', { mode: 'string' }).notNull(),
    lastDay: date('last_day', { mode: 'string' }).notNull(),
    reason: text('reason'),
    createdBy: uuid('created_by').references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [index('time_off_user').on(t.userId, t.firstDay)],
);

/** An iCalendar (RFC 5545) feed of the operator's hires or lessons, fetched by the booking-sync job. */
export const bookingFeeds = pgTable('booking_feeds', {
  id: uuid('id').primaryKey().defaultRandom(),
  siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  name: text('name').notNull(),
  url: text('url').notNull(),
  kind: text('kind', { enum: ['hire', 'lesson'] }).notNull().default('hire'),
  /** The model an event stands for when it names no fleet number and no model. */
  defaultModelId: uuid('default_model_id').references(() => bikeModels.id, { onDelete: 'set null' }),
  lastAttemptAt: timestamp('last_attempt_at', { withTimezone: true }),
  lastGoodAt: timestamp('last_good_at', { withTimezone: true }),
  lastError: text('last_error'),
  eventCount: integer('event_count').notNull().default(0),
  createdBy: uuid('created_by').references(() => users.id),
  createdAt: createdAt(),
});

/**
 * When bikes are needed: a hire or a lesson block, for one bike or for `quantity` bikes of a model at a
 * site. `rrule` (RFC 5545, without DTSTART: the start is `startAt`) repeats it; feed rows are the feed's
 * occurrences, replaced whole on every good fetch.
 */
export const bookings = pgTable(
  'bookings',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
    kind: text('kind', { enum: ['hire', 'lesson'] }).notNull(),
    bikeId: uuid('bike_id').references(() => bikes.id, { onDelete: 'cascade' }),
    modelId: uuid('model_id').references(() => bikeModels.id, { onDelete: 'cascade' }),
    quantity: integer('quantity').notNull().default(1),
    startAt: timestamp('start_at', { withTimezone: true }).notNull(),
    endAt: timestamp('end_at', { withTimezone: true }).notNull(),
    rrule: text('rrule'),
    title: text('title').notNull().default(''),
    source: text('source', { enum: ['manual', 'csv', 'feed'] }).notNull().default('manual'),
    feedId: uuid('feed_id').references(() => bookingFeeds.id, { onDelete: 'cascade' }),
    externalUid: text('external_uid'),
    createdBy: uuid('created_by').references(() => users.id),
    createdAt: createdAt(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('bookings_site_start').on(t.siteId, t.startAt),
    index('bookings_bike').on(t.bikeId),
    index('bookings_feed').on(t.feedId),
    check('bookings_bike_or_model', sql`(${t.bikeId} is null) <> (${t.modelId} is null)`),
    check('bookings_times', sql`${t.endAt} > ${t.startAt}`),
    check('bookings_quantity', sql`${t.quantity} >= 1`),
  ],
);

/**
 * A bike's time in the workshop: its tasks, where (bay), with whom, and the latest day it may happen.
 * The id is the calendar UID; `sequence` rises on every move (RFC 5545 §3.8.7.4). A pinned visit was
 * placed by a person and the planner leaves it where it is.
 */
export const visits = pgTable(
  'visits',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
    bikeId: uuid('bike_id').notNull().references(() => bikes.id, { onDelete: 'cascade' }),
    bayId: uuid('bay_id').notNull().references(() => bays.id, { onDelete: 'cascade' }),
    technicianId: uuid('technician_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
    startAt: timestamp('start_at', { withTimezone: true }).notNull(),
    endAt: timestamp('end_at', { withTimezone: true }).notNull(),
    latestDate: date('latest_date', { mode: 'string' }).notNull(),
    status: text('status', { enum: ['planned', 'done', 'cancelled'] }).notNull().default('planned'),
    sequence: integer('sequence').notNull().default(0),
    pinned: boolean('pinned').notNull().default(false),
    /** Why it stands where it does, in words: its due dates, the bookings around it. */
    why: jsonb('why').$type<string[]>().notNull().default([]),
    createdAt: createdAt(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('visits_site_start').on(t.siteId, t.startAt), index('visits_bike').on(t.bikeId), index('visits_technician').on(t.technicianId, t.startAt)],
);

/** The tasks a visit does; a task is in one visit at most. */
export const visitTasks = pgTable(
  'visit_tasks',
  {
    taskId: uuid('task_id').primaryKey().references(() => serviceTasks.id, { onDelete: 'cascade' }),
    visitId: uuid('visit_id').notNull().references(() => visits.id, { onDelete: 'cascade' }),
  },
  (t) => [index('visit_tasks_visit').on(t.visitId)],
);

/** Work the last plan could not place before its due date, with the reason and a way out, in words. */
export const unplacedTasks = pgTable('unplaced_tasks', {
  taskId: uuid('task_id').primaryKey().references(() => serviceTasks.id, { onDelete: 'cascade' }),
  bikeId: uuid('bike_id').notNull().references(() => bikes.id, { onDelete: 'cascade' }),
  siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  reason: text('reason').notNull(),
  remedy: text('remedy').notNull(),
  computedAt: timestamp('computed_at', { withTimezone: true }).notNull().defaultNow(),
});
