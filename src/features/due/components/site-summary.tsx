import type { BikeSummary } from '../../../../shared/schemas/bikes';
import type { DueItem } from '../../../../shared/schemas/due';

interface Props {
  sites: { id: string; name: string }[];
  due: DueItem[];
  bikes: BikeSummary[];
}

const KINDS = [
  { key: 'overdue', label: 'overdue', icon: '!', cls: 'bg-state-stop text-white' },
  { key: 'soon', label: 'due within 7 days', icon: '◔', cls: 'bg-state-soon text-ink' },
  { key: 'grounded', label: 'grounded', icon: '■', cls: 'bg-ink text-white' },
] as const;

/** One line per site: how much needs doing this week, in numbers a manager takes in at a glance. */
export function SiteSummary({ sites, due, bikes }: Props) {
  const rows = sites.map((s) => ({
    site: s,
    overdue: due.filter((d) => d.siteId === s.id && d.status === 'overdue').length,
    soon: due.filter((d) => d.siteId === s.id && d.status !== 'overdue').length,
    grounded: bikes.filter((b) => b.site.id === s.id && b.status === 'out_of_service').length,
  }));
  return (
    <section aria-label="Summary per site" className="grid gap-3 md:grid-cols-2 xl:grid-cols-3">
      {rows.map((r) => (
        <div key={r.site.id} className="rounded-card border-2 border-ink-line bg-paper-raised p-4">
          <h2 className="text-lg font-bold">{r.site.name}</h2>
          <ul className="mt-2 flex flex-wrap gap-x-5 gap-y-2">
            {KINDS.map((k) => (
              <li key={k.key} className="flex items-center gap-2">
                <span aria-hidden className={`inline-flex h-7 w-7 items-center justify-center rounded-full text-sm font-black ${r[k.key] ? k.cls : 'bg-paper-sunk text-ink-muted'}`}>
                  {k.icon}
                </span>
                <span>
                  <span className="num text-reading font-bold">{r[k.key]}</span> {k.label}
                </span>
              </li>
            ))}
          </ul>
        </div>
      ))}
    </section>
  );
}
