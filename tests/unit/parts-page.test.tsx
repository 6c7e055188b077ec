// @vitest-environment jsdom
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import { PartsRoute } from '../../src/features/parts/routes/parts-page';
import type { Forecast, ForecastPart, Part, PurchaseOrder, StockView } from '../../shared/schemas/parts';
import { failOnConsoleError, ids, mockFetch, quaySite, renderAt, user } from './plan-board-support';

afterEach(cleanup);
failOnConsoleError();

const part = {
  oil: '00000000-0000-4000-8000-000000000101',
  filter: '00000000-0000-4000-8000-000000000102',
  pads: '00000000-0000-4000-8000-000000000103',
};
const supplier = { id: '00000000-0000-4000-8000-000000000111', name: 'Harbour Components', email: 'orders@harbour.example' };
const orderId = '00000000-0000-4000-8000-000000000121';
const draftId = '00000000-0000-4000-8000-000000000122';

const stock = (): StockView => ({
  siteId: ids.quay,
  items: [
    { partId: part.oil, partNumber: 'SL-OIL-1040', name: 'Engine oil 10W-40', family: 'oil', unit: 'litre', onHand: 36, minimum: 8, onOrder: 0 },
    { partId: part.filter, partNumber: 'SL-FLT-125', name: 'Oil filter, 125 cc', family: 'filter', unit: 'each', onHand: 14, minimum: 4, onOrder: 0 },
    { partId: part.pads, partNumber: 'SL-PAD-RB', name: 'Rear brake pads, Breeze 125', family: 'brakes', unit: 'set', onHand: 1, minimum: 2, onOrder: 0 },
  ],
  recent: [
    { id: '00000000-0000-4000-8000-000000000131', partId: part.oil, kind: 'used', delta: -1.6, reason: 'Used: SM-07 oil change', by: 'Tomasz Reed', at: '2026-12-07T10:00:00.000Z' },
    { id: '00000000-0000-4000-8000-000000000132', partId: part.pads, kind: 'received', delta: 2, reason: 'Received', by: 'Priya Vale', at: '2026-12-04T09:00:00.000Z' },
  ],
});

const weeks = (perWeek: number) =>
  ['2026-12-07', '2026-12-14', '2026-12-21', '2026-12-28', '2027-01-04', '2027-01-11', '2027-01-18', '2027-01-25'].map((weekStart, i) => ({
    weekStart, p50: perWeek, p90: perWeek * 2, cumulativeP50: perWeek * (i + 1), cumulativeP90: perWeek * 2 * (i + 1),
  }));
const forecastPart = (over: Partial<ForecastPart> & Pick<ForecastPart, 'partId' | 'partNumber' | 'name' | 'unit' | 'onHand' | 'minimum'>): ForecastPart => ({
  siteId: ids.quay, onOrder: 0, leadTimeDays: 7, weeks: weeks(1), runsOutWeek: null, shortBeforeDelivery: false, suggested: { quantity: 0, packs: 0, leadTimeNeed: 1 }, ...over,
});
// Given with the part that runs out last, so the screen has to put it first.
const forecast = (): Forecast => ({
  siteId: ids.quay, today: '2026-12-03', runs: 500,
  parts: [
    forecastPart({ partId: part.oil, partNumber: 'SL-OIL-1040', name: 'Engine oil 10W-40', unit: 'litre', onHand: 36, minimum: 8, leadTimeDays: 3, weeks: weeks(1.6) }),
    forecastPart({ partId: part.filter, partNumber: 'SL-FLT-125', name: 'Oil filter, 125 cc', unit: 'each', onHand: 14, minimum: 4 }),
    forecastPart({
      partId: part.pads, partNumber: 'SL-PAD-RB', name: 'Rear brake pads, Breeze 125', unit: 'set', onHand: 1, minimum: 2, leadTimeDays: 12, weeks: weeks(0.5),
      runsOutWeek: '2026-12-07', shortBeforeDelivery: true, suggested: { quantity: 4, packs: 2, leadTimeNeed: 2 },
    }),
  ],
});

const catalogue = (): Part[] =>
  stock().items.map((s) => ({
    id: s.partId, partNumber: s.partNumber, name: s.name, family: s.family, unit: s.unit, packSize: 2, leadTimeDays: 7, unitCostPence: 1600, supplier: { id: supplier.id, name: supplier.name }, usedBy: [],
  }));

const line = (p: 'oil' | 'pads', quantity: number, received: number) =>
  p === 'oil'
    ? { partId: part.oil, partNumber: 'SL-OIL-1040', name: 'Engine oil 10W-40', unit: 'litre' as const, packSize: 4, quantity, received, unitCostPence: 890 }
    : { partId: part.pads, partNumber: 'SL-PAD-RB', name: 'Rear brake pads, Breeze 125', unit: 'set' as const, packSize: 2, quantity, received, unitCostPence: 1600 };
const order = (over: Partial<PurchaseOrder> = {}): PurchaseOrder => ({
  id: orderId, number: 7, siteId: ids.quay, supplier, status: 'part-received', note: null,
  createdAt: '2026-12-01T09:00:00.000Z', sentAt: '2026-12-01T09:05:00.000Z', receivedAt: null,
  lines: [line('pads', 4, 0), line('oil', 8, 4)], ...over,
});
const draft = () => order({ id: draftId, number: 8, status: 'draft', sentAt: null, lines: [line('pads', 4, 0)] });

type Routes = Parameters<typeof mockFetch>[0];
function open(role: 'technician' | 'manager', extra: Routes = {}) {
  const calls = mockFetch({
    'GET /api/sites': { body: { items: [quaySite] } },
    'GET /api/stock': { body: stock() },
    'GET /api/forecast': { body: forecast() },
    'GET /api/parts': { body: { items: catalogue() } },
    'GET /api/purchase-orders': { body: { items: [order(), draft()] } },
    ...extra,
  });
  renderAt('/parts', '/parts', <PartsRoute />, user(role));
  return calls;
}

const rowOf = (table: HTMLElement, text: string) => within(table).getAllByRole('row').find((r) => r.textContent?.includes(text))!;

describe('parts and stock screen', () => {
  it('lists the site’s parts with their units and says in words which one is below its minimum', async () => {
    const calls = open('technician');
    const table = await screen.findByRole('table', { name: 'Parts on the shelf at this site' });
    expect(calls.find((c) => c.url.startsWith('/api/stock'))?.url).toBe(`/api/stock?site=${ids.quay}`);
    expect(within(table).getAllByRole('row')).toHaveLength(4);
    const pads = rowOf(table, 'SL-PAD-RB');
    expect(pads.textContent).toContain('Rear brake pads, Breeze 125');
    expect(pads.textContent).toContain('Below minimum: 1 set short');
    expect(rowOf(table, 'SL-OIL-1040').textContent).toContain('36 L');
    for (const n of ['SL-OIL-1040', 'SL-FLT-125']) expect(rowOf(table, n).textContent).not.toContain('Below minimum');
    // The filter narrows by family.
    fireEvent.change(screen.getByLabelText('Family'), { target: { value: 'brakes' } });
    expect(within(table).getAllByRole('row').map((r) => r.textContent)).toEqual([expect.stringContaining('Part number'), expect.stringContaining('SL-PAD-RB')]);
    // Recent movements name the part and the change with its sign and unit.
    const recent = screen.getByRole('table', { name: 'Recent stock movements at this site' });
    expect(rowOf(recent, 'Engine oil').textContent).toContain('−1.6 L');
    expect(rowOf(recent, 'Rear brake pads').textContent).toContain('+2 sets');
  });

  it('keeps what was typed and shows the server’s words when a movement is refused', async () => {
    const message = 'Only 14 of Oil filter, 125 cc is on hand here, so 20 cannot go out. Count the shelf (stock-take) or book what arrived first.';
    const calls = open('technician', { 'POST /api/stock/movements': { status: 400, body: { error: { code: 'validation_failed', message, details: [{ path: 'quantity', message }] } } } });
    await screen.findByRole('table', { name: 'Parts on the shelf at this site' });
    const form = screen.getByRole('form', { name: 'Book a movement or a stock-take' });
    fireEvent.change(within(form).getByLabelText('Part'), { target: { value: part.filter } });
    fireEvent.click(within(form).getByRole('radio', { name: 'Used' }));
    fireEvent.change(within(form).getByLabelText('Quantity'), { target: { value: '20' } });
    fireEvent.change(within(form).getByLabelText('Note'), { target: { value: 'SM-03 service' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Book it' }));
    expect((await within(form).findByRole('alert')).textContent).toContain(message);
    expect(calls.find((c) => c.method === 'POST')?.body).toEqual({ siteId: ids.quay, partId: part.filter, kind: 'used', quantity: 20, unit: 'each', note: 'SM-03 service' });
    expect(within(form).getByLabelText('Quantity')).toHaveProperty('value', '20');
    expect(within(form).getByLabelText('Note')).toHaveProperty('value', 'SM-03 service');
  });

  it('puts the part that runs out first, says it runs out before delivery, and draws its chart on request', async () => {
    const calls = open('technician');
    const table = await screen.findByRole('table', { name: 'Forecast need per week, likely / cautious' });
    expect(calls.find((c) => c.url.startsWith('/api/forecast'))?.url).toBe(`/api/forecast?site=${ids.quay}&weeks=8`);
    const first = within(table).getAllByRole('row')[1];
    expect(first.textContent).toContain('Rear brake pads, Breeze 125');
    expect(first.textContent).toContain('Week of 7 Dec');
    expect(first.textContent).toContain('Runs out before an order placed today can arrive (lead time 12 days)');
    expect(first.textContent).toContain('0.5 / 1');
    expect(rowOf(table, 'Engine oil').textContent).toContain('Lasts the 8 weeks');
    expect(rowOf(table, 'Engine oil').textContent).not.toContain('Runs out before');
    expect(document.querySelector('svg.recharts-surface')).toBeNull();
    fireEvent.click(within(first).getByRole('button', { name: /Rear brake pads, Breeze 125/ }));
    const chart = await screen.findByRole('img', { name: /Chart of the need for Rear brake pads, Breeze 125 over 8 weeks/ });
    await waitFor(() => expect(chart.querySelector('svg')).not.toBeNull());
  });

  it('books in the figures typed for what arrived against an order', async () => {
    const calls = open('technician', { [`POST /api/purchase-orders/${orderId}/receive`]: { body: { order: order({ status: 'received', lines: [line('pads', 4, 2), line('oil', 8, 8)] }) } } });
    const card = await screen.findByRole('article', { name: 'PO-0007 · Harbour Components' });
    expect(within(card).getByText('Partly received')).toBeTruthy();
    // (common practice: line cost = quantity × unit cost) 4 × £16.00 + 8 × £8.90 = £135.20.
    expect(rowOf(card, 'Total').textContent).toContain('£135.20');
    fireEvent.click(within(card).getByRole('button', { name: 'Receive' }));
    const pads = within(card).getByLabelText('Rear brake pads, Breeze 125 arrived');
    expect(pads).toHaveProperty('value', '4');
    expect(within(card).getByLabelText('Engine oil 10W-40 arrived')).toHaveProperty('value', '4');
    fireEvent.change(pads, { target: { value: '2' } });
    fireEvent.click(within(card).getByRole('button', { name: 'Book in what arrived' }));
    await waitFor(() => expect(calls.some((c) => c.method === 'POST' && c.url === `/api/purchase-orders/${orderId}/receive`)).toBe(true));
    expect(calls.find((c) => c.method === 'POST')?.body).toEqual({ lines: [{ partId: part.pads, quantity: 2 }, { partId: part.oil, quantity: 4 }] });
  });

  it('keeps the typed figures and shows the refusal when a receipt is more than was ordered', async () => {
    const message = 'Rear brake pads, Breeze 125: 9 arrived but only 4 is still due on this order. Book any extra on the stock page as received stock.';
    open('technician', { [`POST /api/purchase-orders/${orderId}/receive`]: { status: 409, body: { error: { code: 'conflict', message } } } });
    const card = await screen.findByRole('article', { name: 'PO-0007 · Harbour Components' });
    fireEvent.click(within(card).getByRole('button', { name: 'Receive' }));
    fireEvent.change(within(card).getByLabelText('Rear brake pads, Breeze 125 arrived'), { target: { value: '9' } });
    fireEvent.click(within(card).getByRole('button', { name: 'Book in what arrived' }));
    expect((await within(card).findByRole('alert')).textContent).toContain(message);
    expect(within(card).getByLabelText('Rear brake pads, Breeze 125 arrived')).toHaveProperty('value', '9');
  });

  it('gives a manager send, cancel and drafting; a technician only receives', async () => {
    open('technician');
    const draftCard = await screen.findByRole('article', { name: 'PO-0008 · Harbour Components' });
    expect(within(draftCard).queryAllByRole('button')).toEqual([]);
    expect(screen.queryByRole('button', { name: 'Draft orders from the forecast' })).toBeNull();
    expect(screen.queryByRole('form', { name: 'Set a minimum' })).toBeNull();
    cleanup();

    const calls = open('manager', { [`POST /api/purchase-orders/${draftId}/send`]: { body: { order: { ...draft(), status: 'sent', sentAt: '2026-12-03T10:00:00.000Z' } } } });
    const card = await screen.findByRole('article', { name: 'PO-0008 · Harbour Components' });
    expect(within(card).getByText('Draft, not sent')).toBeTruthy();
    expect(within(card).getByRole('button', { name: 'Cancel order' })).toBeTruthy();
    expect(within(card).queryByRole('button', { name: 'Receive' })).toBeNull();
    expect(screen.getByRole('button', { name: 'Draft orders from the forecast' })).toBeTruthy();
    expect(screen.getByRole('region', { name: 'Suggested order: Harbour Components' }).textContent).toContain('SL-PAD-RB');
    fireEvent.click(within(card).getByRole('button', { name: 'Send to Harbour Components' }));
    await waitFor(() => expect(calls.some((c) => c.method === 'POST' && c.url === `/api/purchase-orders/${draftId}/send`)).toBe(true));
  });
});
