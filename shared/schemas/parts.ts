import { z } from 'zod';
import { IdSchema, MAX_TEXT } from './common';
import { MOVEMENT_KINDS, ORDER_STATES, PART_FAMILIES, PART_UNITS } from '../domain/parts';

export const PartUnitSchema = z.enum(PART_UNITS, { message: `Use one of the units: ${PART_UNITS.join(', ')}.` });

export const PartSchema = z.object({
  id: IdSchema,
  partNumber: z.string(),
  name: z.string(),
  family: z.enum(PART_FAMILIES),
  unit: PartUnitSchema,
  packSize: z.number(),
  leadTimeDays: z.number().int(),
  unitCostPence: z.number().int(),
  supplier: z.object({ id: IdSchema, name: z.string() }).nullable(),
  /** Which services use it and how much, for the catalogue screen. */
  usedBy: z.array(z.object({ model: z.string(), item: z.string(), quantity: z.number(), share: z.number() })),
});
export type Part = z.infer<typeof PartSchema>;
export const PartListSchema = z.object({ items: z.array(PartSchema) });

/** What a service used from the shelf, as typed on the task card ("used 1.1 L"); zero leaves a part out. */
export const PartsUsedSchema = z
  .array(
    z.object({
      partId: IdSchema,
      quantity: z.number({ message: 'Type what was used as a number.' }).finite().min(0, 'What was used cannot be negative.').max(1000, 'That is more than one service uses: check the quantity.'),
      unit: PartUnitSchema,
    }),
  )
  .max(40, 'At most 40 parts on one task.')
  .refine((ls) => new Set(ls.map((l) => l.partId)).size === ls.length, { message: 'A part is listed twice: give one figure per part.' });
export type PartsUsed = z.infer<typeof PartsUsedSchema>;

/** A part the card offers: what the service usually takes, pre-filled when every service uses it. */
export const TaskPartSchema = z.object({
  partId: IdSchema,
  partNumber: z.string(),
  name: z.string(),
  unit: PartUnitSchema,
  usual: z.number(),
  /** Share of services that use it (pads at a brake check: now and then). */
  share: z.number(),
  suggested: z.number(),
  onHand: z.number(),
});
export type TaskPart = z.infer<typeof TaskPartSchema>;

export const SiteParamQuerySchema = z.object({ site: IdSchema });

export const StockLineSchema = z.object({
  partId: IdSchema,
  partNumber: z.string(),
  name: z.string(),
  family: z.enum(PART_FAMILIES),
  unit: PartUnitSchema,
  onHand: z.number(),
  minimum: z.number(),
  onOrder: z.number(),
});
export type StockLine = z.infer<typeof StockLineSchema>;

export const StockMovementRowSchema = z.object({
  id: IdSchema,
  partId: IdSchema,
  kind: z.enum(MOVEMENT_KINDS),
  delta: z.number(),
  reason: z.string(),
  by: z.string().nullable(),
  at: z.string(),
});

export const StockViewSchema = z.object({
  siteId: IdSchema,
  items: z.array(StockLineSchema),
  recent: z.array(StockMovementRowSchema),
});
export type StockView = z.infer<typeof StockViewSchema>;

const Quantity = z.number({ message: 'Type the quantity as a number.' }).finite().max(1_000_000, 'That is more than any shelf holds: check the quantity.');

export const StockMovementCreateSchema = z
  .object({
    siteId: IdSchema,
    partId: IdSchema,
    kind: z.enum(MOVEMENT_KINDS, { message: `Choose what happened: ${MOVEMENT_KINDS.join(', ')}.` }),
    /** Positive; for a stock-take it is the count on the shelf. */
    quantity: Quantity,
    unit: PartUnitSchema,
    note: z.string().trim().max(MAX_TEXT).optional(),
    /** The other site of a transfer. */
    otherSiteId: IdSchema.optional(),
  })
  .refine((m) => !(m.kind === 'transfer-out' || m.kind === 'transfer-in') || (m.otherSiteId && m.otherSiteId !== m.siteId), {
    message: 'A transfer needs the other site, and it must differ from this one.',
    path: ['otherSiteId'],
  });
export type StockMovementCreate = z.infer<typeof StockMovementCreateSchema>;

export const ForecastQuerySchema = z.object({
  site: IdSchema,
  weeks: z.coerce.number({ message: 'Give the weeks as a whole number.' }).int('Give the weeks as a whole number.').min(1, 'At least one week.').max(26, 'At most 26 weeks ahead.').default(8),
});
export type ForecastQuery = z.infer<typeof ForecastQuerySchema>;

export const ForecastPartSchema = z.object({
  partId: IdSchema,
  siteId: IdSchema,
  partNumber: z.string(),
  name: z.string(),
  unit: PartUnitSchema,
  onHand: z.number(),
  onOrder: z.number(),
  minimum: z.number(),
  leadTimeDays: z.number(),
  weeks: z.array(z.object({ weekStart: z.string(), p50: z.number(), p90: z.number(), cumulativeP50: z.number(), cumulativeP90: z.number() })),
  /** Monday of the week the cautious need passes what is on hand; null when it lasts. */
  runsOutWeek: z.string().nullable(),
  /** True when it runs out before an order placed today could arrive. */
  shortBeforeDelivery: z.boolean(),
  suggested: z.object({ quantity: z.number(), packs: z.number(), leadTimeNeed: z.number() }),
});
export type ForecastPart = z.infer<typeof ForecastPartSchema>;
export const ForecastSchema = z.object({ siteId: IdSchema, today: z.string(), runs: z.number(), parts: z.array(ForecastPartSchema) });
export type Forecast = z.infer<typeof ForecastSchema>;

// ── Purchase orders ──────────────────────────────────────────────────────────

export const OrderLineSchema = z.object({
  partId: IdSchema,
  partNumber: z.string(),
  name: z.string(),
  unit: PartUnitSchema,
  packSize: z.number(),
  quantity: z.number(),
  received: z.number(),
  unitCostPence: z.number().int(),
});

export const PurchaseOrderSchema = z.object({
  id: IdSchema,
  /** Shown as "PO-0007". */
  number: z.number().int(),
  siteId: IdSchema,
  supplier: z.object({ id: IdSchema, name: z.string(), email: z.string() }),
  status: z.enum(ORDER_STATES),
  note: z.string().nullable(),
  createdAt: z.string(),
  sentAt: z.string().nullable(),
  receivedAt: z.string().nullable(),
  lines: z.array(OrderLineSchema),
});
export type PurchaseOrder = z.infer<typeof PurchaseOrderSchema>;
export const PurchaseOrderListSchema = z.object({ items: z.array(PurchaseOrderSchema) });

export const PurchaseOrderListQuerySchema = z.object({
  site: IdSchema,
  status: z.enum(ORDER_STATES, { message: `Filter by one of: ${ORDER_STATES.join(', ')}.` }).optional(),
});

const OrderQuantity = z
  .number({ message: 'Type the quantity as a number.' })
  .finite()
  .positive('Order a quantity above zero, or leave the part off the order.')
  .max(100_000, 'That is more than any order needs: check the quantity.');

export const PurchaseOrderCreateSchema = z
  .object({
    siteId: IdSchema,
    supplierId: IdSchema,
    lines: z.array(z.object({ partId: IdSchema, quantity: OrderQuantity })).min(1, 'Add at least one part to the order.').max(200, 'At most 200 lines on one order.'),
    note: z.string().trim().max(MAX_TEXT).optional(),
  })
  .refine((o) => new Set(o.lines.map((l) => l.partId)).size === o.lines.length, { message: 'A part is listed twice: give one line per part.', path: ['lines'] });
export type PurchaseOrderCreate = z.infer<typeof PurchaseOrderCreateSchema>;

export const PurchaseOrderReceiveSchema = z.object({
  lines: z.array(z.object({ partId: IdSchema, quantity: z.number({ message: 'Type what arrived as a number.' }).finite() })).min(1, 'Type what arrived for at least one line.').max(200),
  note: z.string().trim().max(MAX_TEXT).optional(),
});
export type PurchaseOrderReceive = z.infer<typeof PurchaseOrderReceiveSchema>;

/** Turns the cautious suggestions of a site into one draft per supplier. */
export const DraftFromForecastSchema = z.object({ siteId: IdSchema });

/** A part that runs out before an order placed today could arrive, for the manager's week board. */
export const ShortageSchema = z.object({
  siteId: IdSchema,
  siteName: z.string(),
  partId: IdSchema,
  partNumber: z.string(),
  name: z.string(),
  unit: PartUnitSchema,
  onHand: z.number(),
  onOrder: z.number(),
  leadTimeDays: z.number(),
  runsOutWeek: z.string().nullable(),
  suggested: z.number(),
  /** Orders not yet received that hold the part: a draft still to send, or one on its way. */
  orders: z.array(z.object({ id: IdSchema, number: z.number().int(), status: z.enum(ORDER_STATES) })),
});
export type Shortage = z.infer<typeof ShortageSchema>;
export const ShortageListSchema = z.object({ items: z.array(ShortageSchema) });
