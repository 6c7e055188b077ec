const nf = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 0 });
const nf1 = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 1 });

/** An odometer value with its unit, always. */
export const formatOdometer = (v: number | null | undefined, unit: string) => (v == null ? '—' : `${nf.format(v)} ${unit}`);
export const formatKm = (v: number | null | undefined) => (v == null ? '—' : `${nf.format(v)} km`);
export const formatRate = (v: number | null | undefined, unit = 'km') => (v == null ? '—' : `${nf1.format(v)} ${unit}/day`);

/** A calendar date as people read it; the value stays an ISO date. */
export function formatDate(iso: string | null | undefined) {
  if (!iso) return '—';
  const [y, m, d] = iso.split('-').map(Number);
  return new Date(Date.UTC(y, m - 1, d)).toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });
}
