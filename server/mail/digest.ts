import type { DueItem } from '../../shared/schemas/due';
import { escapeHtml } from './site-managers';

export interface DigestData {
  managerName: string;
  weekLabel: string;
  today: string;
  overdue: DueItem[];
  thisWeek: DueItem[];
  grounded: { fleetNumber: string; siteName: string; reason: string | null }[];
  valveWarnings: { fleetNumber: string; valve: string; message: string }[];
  /** The coming week's workshop plan, per site. */
  plan: DigestPlanSite[];
  appUrl: string;
}

export interface DigestPlanSite {
  siteId: string;
  siteName: string;
  days: { date: string; visits: string[]; plannedMinutes: number; availableMinutes: number }[];
  unplaced: string[];
}

const hours = (min: number) => `${(Math.round(min / 6) / 10).toLocaleString('en-GB')} h`;
const used = (day: DigestPlanSite['days'][number]) =>
  `${hours(day.plannedMinutes)} of ${hours(day.availableMinutes)}${day.availableMinutes ? ` (${Math.round((100 * day.plannedMinutes) / day.availableMinutes)} %)` : ''}`;
const dayLine = (day: DigestPlanSite['days'][number]) =>
  `${day.date}: ${day.visits.length} visit${day.visits.length === 1 ? '' : 's'}, ${used(day)} planned${day.visits.length ? ` · ${day.visits.join(', ')}` : ''}`;

const km = (v: number | null) => (v == null ? '—' : `${Math.round(v).toLocaleString('en-GB')} km`);
const line = (d: DueItem) =>
  `${d.fleetNumber} (${d.siteName}) · ${d.item} · due ${d.dueDate ?? '—'} · ${km(d.remainingKm)} left · by ${d.trigger ?? '—'} · ${d.assignee?.name ?? 'unassigned'}`;

/** The Monday due list: plain text and HTML parts with the same content, readable on a phone. */
export function renderDigest(d: DigestData) {
  const subject = `Lashline due list, ${d.weekLabel}: ${d.overdue.length} overdue, ${d.thisWeek.length} due this week, ${d.grounded.length} grounded`;
  const sections: [string, string[]][] = [
    ['Overdue', d.overdue.map(line)],
    ['Due this week', d.thisWeek.map(line)],
    ['Out of service', d.grounded.map((g) => `${g.fleetNumber} (${g.siteName}): ${g.reason ?? 'no reason recorded'}`)],
    ['Valve clearance warnings', d.valveWarnings.map((w) => `${w.fleetNumber} ${w.valve}: ${w.message}`)],
  ];
  const text = [
    `Good morning ${d.managerName},`,
    '',
    `Your fleet on ${d.today}.`,
    ...sections.flatMap(([title, rows]) => ['', `${title} (${rows.length})`, ...(rows.length ? rows.map((r) => `- ${r}`) : ['- none'])]),
    ...d.plan.flatMap((p) => [
      '',
      `Workshop plan at ${p.siteName}, next 7 days`,
      ...p.days.map((day) => `- ${dayLine(day)}`),
      `Not placed (${p.unplaced.length})`,
      ...(p.unplaced.length ? p.unplaced.map((u) => `- ${u}`) : ['- none']),
      `Plan board: ${d.appUrl}/plan?site=${p.siteId}`,
    ]),
    '',
    `Open the board: ${d.appUrl}/this-week`,
    '',
    'Lashline tracks and reminds; the maker’s service manual and a qualified technician decide, under local law.',
  ].join('\n');
  const table = (rows: DueItem[]) =>
    rows.length
      ? `<table cellpadding="6" style="border-collapse:collapse;width:100%;font-size:14px"><tr style="background:#ebe5d9;text-align:left"><th>Bike</th><th>Item</th><th>Due</th><th>Km left</th><th>By</th><th>Technician</th></tr>${rows
          .map(
            (r) =>
              `<tr style="border-top:1px solid #c9c2b6"><td><a href="${d.appUrl}/fleet/${r.bikeId}">${escapeHtml(r.fleetNumber)}</a> <small>${escapeHtml(r.siteName)}</small></td><td>${escapeHtml(r.item)}</td><td>${r.dueDate ?? '—'}</td><td>${km(r.remainingKm)}</td><td>${r.trigger ?? '—'}</td><td>${escapeHtml(r.assignee?.name ?? 'unassigned')}</td></tr>`,
          )
          .join('')}</table>`
      : '<p>None.</p>';
  const list = (rows: string[]) => (rows.length ? `<ul>${rows.map((r) => `<li>${escapeHtml(r)}</li>`).join('')}</ul>` : '<p>None.</p>');
  // A language and a title, so a reader that reads the message aloud knows how (WCAG 3.1.1, 2.4.2).
  const html = `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>${escapeHtml(subject)}</title></head><body style="font-family:system-ui,sans-serif;color:#1d2733;background:#f6f2ea;padding:16px">
<h1 style="font-size:20px">Lashline due list, ${escapeHtml(d.weekLabel)}</h1>
<p>Good morning ${escapeHtml(d.managerName)}, your fleet on ${d.today}.</p>
<h2 style="font-size:17px;color:#8c1c1c">Overdue (${d.overdue.length})</h2>${table(d.overdue)}
<h2 style="font-size:17px">Due this week (${d.thisWeek.length})</h2>${table(d.thisWeek)}
<h2 style="font-size:17px">Out of service (${d.grounded.length})</h2>${list(sections[2][1])}
<h2 style="font-size:17px">Valve clearance warnings (${d.valveWarnings.length})</h2>${list(sections[3][1])}
${d.plan
  .map(
    (p) => `<h2 style="font-size:17px">Workshop plan at ${escapeHtml(p.siteName)}, next 7 days</h2>
<table cellpadding="6" style="border-collapse:collapse;width:100%;font-size:14px"><tr style="background:#ebe5d9;text-align:left"><th>Day</th><th>Visits</th><th>Planned</th><th>Bikes</th></tr>${p.days
      .map((day) => `<tr style="border-top:1px solid #c9c2b6"><td>${day.date}</td><td>${day.visits.length}</td><td>${used(day)}</td><td>${escapeHtml(day.visits.join(', ') || '—')}</td></tr>`)
      .join('')}</table>
<h3 style="font-size:15px;color:#8c1c1c">Not placed (${p.unplaced.length})</h3>${list(p.unplaced)}
<p><a href="${d.appUrl}/plan?site=${p.siteId}">Open the plan board</a></p>`,
  )
  .join('\n')}
<p><a href="${d.appUrl}/this-week">Open the board</a></p>
<p style="font-size:12px;color:#5b6673">Lashline tracks and reminds; the maker’s service manual and a qualified technician decide, under local law.</p>
</body></html>`;
  return { subject, text, html };
}
