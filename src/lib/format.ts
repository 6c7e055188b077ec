const nf = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 0 });
const nf1 = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 1 });

/** An odometer value with its unit, always. */
export const formatOdometer = (v: number | null | undefined, unit: string) => (v == null ? '—' : `${nf.format(v)} ${unit}`);
export const formatKm = (v: number | null | undefined) => (v == null ? '—' : `${nf.format(v)} km`);
export const formatRate = (v: number | null | undefined, unit = 'km') => (v == null ? '—' : `${nf1.format(v)} ${unit}/day`);

// One formatter each: toLocaleString builds a new one on every call, which a list of hundreds of rows feels.
const dateFormat = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });
const dateTimeFormat = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit' });

/** A calendar date as people read it; the value stays an ISO date. */
export function formatDate(iso: string | null | undefined) {
  if (!iso) return '—';
  const [y, m, d] = iso.split('-').map(Number);
  return dateFormat.format(new Date(Date.UTC(y, m - 1, d)));
}

/** Distance left before an item is due, in the bike's unit; once past, how far over. */
export function formatDistanceLeft(v: number | null | undefined, unit: string) {
  if (v == null) return '—';
  const r = Math.round(v);
  return r < 0 ? `${nf.format(-r)} ${unit} over` : `${nf.format(r)} ${unit}`;
}

/** Days left before a due date, in words: "today", "3 days", "4 days late". */
export function formatDaysLeft(d: number | null | undefined) {
  if (d == null) return '—';
  if (d === 0) return 'today';
  const n = Math.abs(d);
  const days = `${n} ${n === 1 ? 'day' : 'days'}`;
  return d < 0 ? `${days} late` : days;
}

/** What makes an item due: the distance run or the calendar. */
export function formatTrigger(trigger: 'km' | 'calendar' | null | undefined, unit = 'km') {
  if (trigger === 'km') return unit === 'mi' ? 'by miles' : 'by km';
  if (trigger === 'calendar') return 'by date';
  return '—';
}

export function formatMinutes(m: number | null | undefined) {
  if (m == null) return '—';
  const h = Math.floor(m / 60);
  const rest = Math.round(m % 60);
  if (!h) return `${rest} min`;
  return rest ? `${h} h ${rest} min` : `${h} h`;
}

/** Today's calendar date on this device, as YYYY-MM-DD. */
export function todayIso(now = new Date()) {
  const p = (n: number) => String(n).padStart(2, '0');
  return `${now.getFullYear()}-${p(now.getMonth() + 1)}-${p(now.getDate())}`;
}

export function addDaysIso(iso: string, days: number) {
  const [y, m, d] = iso.split('-').map(Number);
  return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10);
}

/** An instant (ISO timestamp) as people read it, in this device's time zone. */
export function formatDateTime(iso: string | null | undefined) {
  if (!iso) return '—';
  return dateTimeFormat.format(new Date(iso));
}
