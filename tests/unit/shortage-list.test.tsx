// @vitest-environment jsdom
import { cleanup, render, screen, within } from '@testing-library/react';
import { MemoryRouter } from 'react-router-dom';
import { afterEach, describe, expect, it } from 'vitest';
import { ShortageList } from '../../src/features/parts/components/shortage-list';
import type { Shortage } from '../../shared/schemas/parts';

afterEach(cleanup);

const quay = '00000000-0000-4000-8000-000000000401';
const base: Shortage = {
  siteId: quay, siteName: 'Quay Street', partId: '00000000-0000-4000-8000-000000000402', partNumber: 'SL-FLT-250', name: 'Oil filter, 250–400 cc', unit: 'each',
  onHand: 0, onOrder: 0, leadTimeDays: 7, runsOutWeek: '2026-11-30', suggested: 10, orders: [],
};

describe('parts short before delivery on the week board', () => {
  it('names the part, its site, when it runs out and the order that holds it, and links to the site’s shelf', () => {
    render(
      <MemoryRouter>
        <ShortageList items={[{ ...base, orders: [{ id: '00000000-0000-4000-8000-000000000403', number: 1, status: 'draft' }] }, { ...base, partId: '00000000-0000-4000-8000-000000000404', name: 'Brake fluid DOT 4', partNumber: 'SL-BFL-4', unit: 'litre', onHand: 0.5, suggested: 1 }]} />
      </MemoryRouter>,
    );
    const [filters, fluid] = screen.getAllByRole('listitem');
    expect(filters.textContent).toContain('Quay Street');
    expect(filters.textContent).toContain('runs out the week of 30 Nov, and the supplier needs 7 days');
    expect(filters.textContent).toContain('PO-0001: draft, not sent');
    expect(within(filters).getByRole('link', { name: 'Oil filter, 250–400 cc' }).getAttribute('href')).toBe(`/parts?site=${quay}`);
    expect(fluid.textContent).toContain('0.5 L on the shelf');
    expect(fluid.textContent).toContain('No order yet: about 1 L suggested.');
  });

  it('says so when nothing runs short', () => {
    render(<MemoryRouter><ShortageList items={[]} /></MemoryRouter>);
    expect(screen.getByText(/Every part lasts/)).toBeTruthy();
  });
});
