import type { Tx } from '../db/client';
import { partStock, parts, purchaseOrderLines, purchaseOrders, serviceItemParts, stockMovements, suppliers } from '../db/schema';
import type { PartFamily, PartUnit } from '../../shared/domain/parts';
import { createRng } from '../../shared/domain/prng';
import type { Scenario } from './scenario';

// The Saltmarsh parts shelf: two invented suppliers, the consumables of each model's services, and
// stock at both sites booked in as one opening delivery each, so the ledger adds up to the shelf.
// Quay Street has used its last 250–400 cc oil filter, SM-10's oil is overdue and the supplier needs
// a week: the forecast shows it short before delivery, and a draft order for a box of ten waits to be sent. An order of oil
// for the Airfield went out two days ago and is still to come.

export interface DemoParts {
  suppliers: (typeof suppliers.$inferInsert)[];
  parts: (typeof parts.$inferInsert)[];
  serviceItemParts: (typeof serviceItemParts.$inferInsert)[];
  partStock: (typeof partStock.$inferInsert)[];
  stockMovements: (typeof stockMovements.$inferInsert)[];
  purchaseOrders: (typeof purchaseOrders.$inferInsert)[];
  purchaseOrderLines: (typeof purchaseOrderLines.$inferInsert)[];
}

interface PartDef {
  key: string;
  partNumber: string;
  name: string;
  family: PartFamily;
  unit: PartUnit;
  packSize: number;
  supplier: 'lubricants' | 'components';
  leadTimeDays: number;
  unitCostPence: number;
  /** On hand at Quay Street and at the Airfield; minimum at both. */
  stock: [number, number];
  minimum: number;
}

const PARTS: PartDef[] = [
  { key: 'oil', partNumber: 'SL-OIL-1040', name: 'Engine oil 10W-40', family: 'oil', unit: 'litre', packSize: 4, supplier: 'lubricants', leadTimeDays: 3, unitCostPence: 890, stock: [36, 20], minimum: 8 },
  { key: 'filter-small', partNumber: 'SL-FLT-125', name: 'Oil filter, 125 cc', family: 'filter', unit: 'each', packSize: 10, supplier: 'components', leadTimeDays: 7, unitCostPence: 650, stock: [14, 9], minimum: 4 },
  { key: 'filter-large', partNumber: 'SL-FLT-250', name: 'Oil filter, 250–400 cc', family: 'filter', unit: 'each', packSize: 10, supplier: 'components', leadTimeDays: 7, unitCostPence: 780, stock: [0, 6], minimum: 3 },
  { key: 'washer', partNumber: 'SL-WSH-12', name: 'Sump plug crush washer', family: 'gasket', unit: 'each', packSize: 50, supplier: 'components', leadTimeDays: 7, unitCostPence: 20, stock: [60, 40], minimum: 10 },
  { key: 'cover-gasket', partNumber: 'SL-GSK-VC', name: 'Valve cover gasket', family: 'gasket', unit: 'each', packSize: 2, supplier: 'components', leadTimeDays: 10, unitCostPence: 1450, stock: [4, 3], minimum: 1 },
  { key: 'chain-lube', partNumber: 'SL-LUB-CH', name: 'Chain lube', family: 'chain', unit: 'litre', packSize: 0.5, supplier: 'lubricants', leadTimeDays: 3, unitCostPence: 2200, stock: [3, 2], minimum: 0.5 },
  { key: 'chain-kit', partNumber: 'SL-CHK-428', name: 'Chain and sprocket kit', family: 'chain', unit: 'set', packSize: 1, supplier: 'components', leadTimeDays: 10, unitCostPence: 6900, stock: [3, 2], minimum: 1 },
  { key: 'pads-front', partNumber: 'SL-PAD-F', name: 'Front brake pads', family: 'brakes', unit: 'set', packSize: 2, supplier: 'components', leadTimeDays: 7, unitCostPence: 1800, stock: [8, 5], minimum: 2 },
  { key: 'pads-rear-breeze', partNumber: 'SL-PAD-RB', name: 'Rear brake pads, Breeze 125', family: 'brakes', unit: 'set', packSize: 2, supplier: 'components', leadTimeDays: 12, unitCostPence: 1600, stock: [1, 4], minimum: 2 },
  { key: 'pads-rear', partNumber: 'SL-PAD-R', name: 'Rear brake pads', family: 'brakes', unit: 'set', packSize: 2, supplier: 'components', leadTimeDays: 7, unitCostPence: 1600, stock: [6, 4], minimum: 2 },
  { key: 'tyre-f-17', partNumber: 'SL-TYR-F17', name: 'Front tyre 100/80-17', family: 'tyres', unit: 'each', packSize: 1, supplier: 'components', leadTimeDays: 5, unitCostPence: 5400, stock: [4, 3], minimum: 1 },
  { key: 'tyre-r-17', partNumber: 'SL-TYR-R17', name: 'Rear tyre 130/70-17', family: 'tyres', unit: 'each', packSize: 1, supplier: 'components', leadTimeDays: 5, unitCostPence: 6200, stock: [4, 3], minimum: 1 },
  { key: 'tyre-f-12', partNumber: 'SL-TYR-F12', name: 'Front tyre 110/70-12', family: 'tyres', unit: 'each', packSize: 1, supplier: 'components', leadTimeDays: 5, unitCostPence: 4100, stock: [3, 2], minimum: 1 },
  { key: 'tyre-r-12', partNumber: 'SL-TYR-R12', name: 'Rear tyre 120/70-12', family: 'tyres', unit: 'each', packSize: 1, supplier: 'components', leadTimeDays: 5, unitCostPence: 4500, stock: [3, 2], minimum: 1 },
  { key: 'fluid', partNumber: 'SL-BFL-4', name: 'Brake fluid DOT 4', family: 'fluid', unit: 'litre', packSize: 0.5, supplier: 'lubricants', leadTimeDays: 3, unitCostPence: 1100, stock: [2, 1.5], minimum: 0.5 },
];

/** What one service of an item uses, by the item's category; `small` models (125 cc) differ in filter and tyres. */
function usesFor(category: string, modelName: string): { key: string; quantity: number; share: number }[] {
  const small = modelName.includes('125');
  const scooter = modelName.startsWith('Breeze');
  switch (category) {
    case 'oil':
      return [
        { key: 'oil', quantity: small ? 1.0 : modelName.includes('400') ? 2.2 : 1.6, share: 1 },
        { key: small ? 'filter-small' : 'filter-large', quantity: 1, share: 1 },
        { key: 'washer', quantity: 1, share: 1 },
      ];
    case 'valves':
      return [{ key: 'cover-gasket', quantity: 1, share: 0.5 }];
    case 'chain':
      return [{ key: 'chain-lube', quantity: 0.05, share: 1 }, { key: 'chain-kit', quantity: 1, share: 0.04 }];
    case 'brakes':
      return [
        { key: 'pads-front', quantity: 1, share: 0.2 },
        { key: scooter ? 'pads-rear-breeze' : 'pads-rear', quantity: 1, share: 0.25 },
        { key: scooter ? 'tyre-f-12' : 'tyre-f-17', quantity: 1, share: 0.1 },
        { key: scooter ? 'tyre-r-12' : 'tyre-r-17', quantity: 1, share: 0.15 },
      ];
    case 'brake-fluid':
      return [{ key: 'fluid', quantity: 0.5, share: 1 }];
    default:
      return [];
  }
}

export function buildParts(s: Scenario): DemoParts {
  const rng = createRng('saltmarsh/parts');
  const supplierIds = { lubricants: rng.uuid(), components: rng.uuid() };
  const partIds = new Map(PARTS.map((p) => [p.key, rng.uuid()]));
  const quay = s.sites.find((x) => x.name === 'Quay Street')!.id!;
  const airfield = s.sites.find((x) => x.name === 'Airfield')!.id!;
  const keeper = (siteId: string) => s.users.find((u) => u.role === 'technician' && s.userSites.some((us) => us.userId === u.id && us.siteId === siteId))?.id ?? null;
  const opened = new Date(`${s.today}T08:00:00Z`);
  opened.setUTCDate(opened.getUTCDate() - 14);
  const out: DemoParts = {
    suppliers: [
      { id: supplierIds.lubricants, name: 'Estuary Lubricants', email: 'orders@estuary-lubricants.test' },
      { id: supplierIds.components, name: 'Marsh Lane Motor Components', email: 'trade@marshlane-components.test' },
    ],
    parts: PARTS.map((p) => ({ id: partIds.get(p.key)!, partNumber: p.partNumber, name: p.name, family: p.family, unit: p.unit, packSize: p.packSize, supplierId: supplierIds[p.supplier], leadTimeDays: p.leadTimeDays, unitCostPence: p.unitCostPence })),
    serviceItemParts: [],
    partStock: [],
    stockMovements: [],
    purchaseOrders: [],
    purchaseOrderLines: [],
  };
  for (const item of s.serviceItems) {
    const model = s.models.find((m) => m.id === item.modelId)!;
    for (const u of usesFor(item.category, model.name))
      out.serviceItemParts.push({ serviceItemId: item.id!, partId: partIds.get(u.key)!, quantity: u.quantity, share: u.share });
  }
  for (const p of PARTS)
    for (const [i, siteId] of [quay, airfield].entries()) {
      const onHand = p.stock[i];
      out.partStock.push({ siteId, partId: partIds.get(p.key)!, onHand, minimum: p.minimum });
      if (onHand > 0)
        out.stockMovements.push({ id: rng.uuid(), siteId, partId: partIds.get(p.key)!, kind: 'stock-take', delta: onHand, reason: 'Stock-take: opening count', by: keeper(siteId), at: opened });
    }
  const manager = s.users.find((u) => u.role === 'manager')?.id ?? null;
  const draftId = rng.uuid();
  const sentId = rng.uuid();
  const sentAt = new Date(`${s.today}T08:30:00Z`);
  sentAt.setUTCDate(sentAt.getUTCDate() - 2);
  out.purchaseOrders.push(
    { id: draftId, number: 1, siteId: quay, supplierId: supplierIds.components, status: 'draft', note: 'The 250–400 cc filters are gone: SM-10 waits for one', createdBy: manager, createdAt: new Date(`${s.today}T07:45:00Z`) },
    { id: sentId, number: 2, siteId: airfield, supplierId: supplierIds.lubricants, status: 'sent', note: null, createdBy: manager, createdAt: sentAt, sentAt },
  );
  out.purchaseOrderLines.push(
    { orderId: draftId, partId: partIds.get('filter-large')!, quantity: 10 },
    { orderId: draftId, partId: partIds.get('washer')!, quantity: 50 },
    { orderId: sentId, partId: partIds.get('oil')!, quantity: 20 },
    { orderId: sentId, partId: partIds.get('chain-lube')!, quantity: 1 },
  );
  return out;
}

export async function seedParts(tx: Tx, s: Scenario) {
  const p = buildParts(s);
  await tx.insert(suppliers).values(p.suppliers);
  await tx.insert(parts).values(p.parts);
  if (p.serviceItemParts.length) await tx.insert(serviceItemParts).values(p.serviceItemParts);
  await tx.insert(partStock).values(p.partStock);
  await tx.insert(stockMovements).values(p.stockMovements);
  await tx.insert(purchaseOrders).values(p.purchaseOrders);
  await tx.insert(purchaseOrderLines).values(p.purchaseOrderLines);
}
