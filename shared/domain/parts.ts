/**
 * Parts and consumables: units, the stock ledger's rules, and what to order. Pure functions, shared
 * by the server (which judges every movement) and the client (which shows the same words first).
 */

export const PART_UNITS = ['each', 'set', 'litre'] as const;
export type PartUnit = (typeof PART_UNITS)[number];

export const PART_FAMILIES = ['oil', 'filter', 'brakes', 'tyres', 'chain', 'fluid', 'gasket', 'plug', 'other'] as const;
export type PartFamily = (typeof PART_FAMILIES)[number];

/** Why stock moved. Transfers are booked as a pair: out of one site, into another. */
export const MOVEMENT_KINDS = ['received', 'used', 'stock-take', 'transfer-in', 'transfer-out', 'write-off'] as const;
export type MovementKind = (typeof MOVEMENT_KINDS)[number];

/** A movement's kind in words, for the ledger's reasons and the screens. */
export const MOVEMENT_WORDS: Record<MovementKind, string> = {
  received: 'Received',
  used: 'Used',
  'stock-take': 'Stock-take',
  'transfer-in': 'Transfer in',
  'transfer-out': 'Transfer out',
  'write-off': 'Written off',
};

export const ORDER_STATES = ['draft', 'sent', 'part-received', 'received', 'cancelled'] as const;
export type OrderState = (typeof ORDER_STATES)[number];

export const UNIT_WORDS: Record<PartUnit, { one: string; many: string; short: string }> = {
  each: { one: 'piece', many: 'pieces', short: '' },
  set: { one: 'set', many: 'sets', short: ' sets' },
  litre: { one: 'litre', many: 'litres', short: ' L' },
};

/** Quantities are kept to a millilitre (or a thousandth of a piece): enough for oil, exact for counts. */
export function roundQty(q: number): number {
  return Math.round(q * 1000) / 1000;
}

export function formatQty(q: number, unit: PartUnit): string {
  const n = roundQty(q);
  const text = Number.isInteger(n) ? String(n) : n.toFixed(unit === 'litre' ? 2 : 3).replace(/0+$/, '').replace(/\.$/, '');
  return unit === 'litre' ? `${text} L` : unit === 'set' ? `${text} ${n === 1 ? 'set' : 'sets'}` : text;
}

/** Counted units come whole: half a filter is a typing slip, not a use. */
export function wholeUnitsOnly(unit: PartUnit): boolean {
  return unit !== 'litre';
}

export interface MovementCheck {
  kind: MovementKind;
  /** The quantity as typed, always positive; the kind says which way it moves. */
  quantity: number;
  /** The unit the person typed in; it must be the part's own. */
  unit: PartUnit;
}

export type MovementVerdict = { ok: true; delta: number } | { ok: false; error: string };

/**
 * Judges one movement of a part at a site against its unit and what is on hand. A stock-take's
 * quantity is the count itself; the ledger books the difference.
 */
export function judgeMovement(part: { name: string; unit: PartUnit }, onHand: number, m: MovementCheck): MovementVerdict {
  if (!Number.isFinite(m.quantity)) return { ok: false, error: 'Type the quantity as a number.' };
  if (m.unit !== part.unit)
    return { ok: false, error: `${part.name} is counted in ${UNIT_WORDS[part.unit].many}, not ${UNIT_WORDS[m.unit].many}. Give the quantity in ${UNIT_WORDS[part.unit].many}.` };
  if (m.quantity < 0) return { ok: false, error: `A quantity cannot be negative. Choose the kind of movement (used, written off, sent to another site) to take stock out.` };
  if (wholeUnitsOnly(part.unit) && !Number.isInteger(roundQty(m.quantity)))
    return { ok: false, error: `${part.name} comes in whole ${UNIT_WORDS[part.unit].many}: ${m.quantity} is not a whole number.` };
  if (m.kind === 'stock-take') return { ok: true, delta: roundQty(m.quantity - onHand) };
  if (m.quantity === 0) return { ok: false, error: 'A movement of nothing changes nothing: type how many.' };
  const out = m.kind === 'used' || m.kind === 'write-off' || m.kind === 'transfer-out';
  if (out && roundQty(m.quantity) > roundQty(onHand))
    return {
      ok: false,
      error: `Only ${formatQty(onHand, part.unit)} of ${part.name} is on hand here, so ${formatQty(m.quantity, part.unit)} cannot go out. Count the shelf (stock-take) or book what arrived first.`,
    };
  return { ok: true, delta: roundQty(out ? -m.quantity : m.quantity) };
}

/**
 * Reorder point: demand over the lead time plus safety stock, s = x̂_L + SS, with the safety
 * stock for a service factor k and a per-period standard deviation σ of demand over L periods
 * SS = k·σ·√L (independent periods).
 */
export function reorderPoint(o: { demandPerPeriod: number; leadTimePeriods: number; safetyStock: number }): number {
  return o.demandPerPeriod * o.leadTimePeriods + o.safetyStock;
}

export function safetyStock(o: { k: number; sigmaPerPeriod: number; leadTimePeriods: number }): number {
  return o.k * o.sigmaPerPeriod * Math.sqrt(o.leadTimePeriods);
}

export interface OrderNeed {
  /** Cautious (P90) need over the supplier's lead time. */
  leadTimeNeed: number;
  minimum: number;
  onHand: number;
  onOrder: number;
  packSize: number;
}

/**
 * What to order now: the cautious need over the lead time plus the minimum, less what is on hand
 * and already on order, rounded up to whole packs. Nothing when stock and orders cover it.
 */
export function suggestedOrder(n: OrderNeed): { quantity: number; packs: number } {
  const short = roundQty(n.leadTimeNeed + n.minimum - n.onHand - n.onOrder);
  if (short <= 0) return { quantity: 0, packs: 0 };
  const pack = n.packSize > 0 ? n.packSize : 1;
  const packs = Math.ceil(roundQty(short / pack) - 1e-9);
  return { quantity: roundQty(packs * pack), packs };
}

export interface LedgerMovement {
  delta: number;
}

/** On hand is the sum of the ledger: the stock table is a cache of it, never a second truth. */
export function ledgerBalance(movements: readonly LedgerMovement[]): number {
  return roundQty(movements.reduce((s, m) => s + m.delta, 0));
}

export interface OrderLineState {
  partId: string;
  quantity: number;
  received: number;
}

export type ReceiptVerdict = { ok: true; state: 'part-received' | 'received' } | { ok: false; error: string };

/** A receipt books what came in; more than was ordered, or a line not on the order, is refused. */
export function judgeReceipt(
  state: OrderState,
  lines: readonly OrderLineState[],
  receipt: readonly { partId: string; quantity: number }[],
  names: (partId: string) => string,
): ReceiptVerdict {
  if (state === 'draft') return { ok: false, error: 'This order has not been sent yet: send it before booking what arrived.' };
  if (state === 'received' || state === 'cancelled') return { ok: false, error: `This order is ${state === 'received' ? 'already received in full' : 'cancelled'}; nothing more can be booked against it.` };
  if (!receipt.length || receipt.every((r) => r.quantity === 0)) return { ok: false, error: 'Type what arrived for at least one line.' };
  const byPart = new Map(lines.map((l) => [l.partId, l]));
  const seen = new Set<string>();
  for (const r of receipt) {
    const line = byPart.get(r.partId);
    if (!line) return { ok: false, error: `${names(r.partId)} is not on this order.` };
    if (seen.has(r.partId)) return { ok: false, error: `${names(r.partId)} is listed twice: give one figure per line.` };
    seen.add(r.partId);
    if (!Number.isFinite(r.quantity) || r.quantity < 0) return { ok: false, error: `What arrived of ${names(r.partId)} must be zero or more.` };
    const open = roundQty(line.quantity - line.received);
    if (roundQty(r.quantity) > open)
      return { ok: false, error: `${names(r.partId)}: ${r.quantity} arrived but only ${open} is still due on this order. Book any extra on the stock page as received stock.` };
  }
  const complete = lines.every((l) => roundQty(l.received + (receipt.find((r) => r.partId === l.partId)?.quantity ?? 0)) >= roundQty(l.quantity));
  return { ok: true, state: complete ? 'received' : 'part-received' };
}

/** "PO-0007": how an order's number is written on screens, e-mails and files. */
export const orderLabel = (n: number) => `PO-${String(n).padStart(4, '0')}`;

export const ORDER_CSV_COLUMNS = ['line', 'part_number', 'description', 'quantity', 'unit', 'pack_size', 'packs', 'unit_cost_gbp', 'line_total_gbp'] as const;

/** The rows of an order's CSV for the supplier, one per line; money in pounds with two decimals. */
export function orderCsvRows(lines: readonly { partNumber: string; name: string; quantity: number; unit: PartUnit; packSize: number; unitCostPence: number }[]): string[][] {
  const pounds = (pence: number) => (Math.round(pence) / 100).toFixed(2);
  return lines.map((l, i) => [
    String(i + 1), l.partNumber, l.name, String(roundQty(l.quantity)), l.unit, String(l.packSize),
    l.packSize > 0 ? String(Math.ceil(roundQty(l.quantity / l.packSize) - 1e-9)) : '', pounds(l.unitCostPence), pounds(l.unitCostPence * l.quantity),
  ]);
}
