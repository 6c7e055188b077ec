import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { CheckField } from '../../../components/ui/check-field';
import { TextField } from '../../../components/ui/field';
import { WEEKDAYS } from '../../../../shared/domain/shifts';
import type { CapacitySite, DayHours } from '../../../../shared/schemas/capacity';
import { useSaveHours } from '../api';
import { Problem } from './problem';

type Row = { open: boolean; opensAt: string; closesAt: string };

/** Opening hours per weekday, saved as a whole week. */
export function HoursPanel({ site }: { site: CapacitySite }) {
  const save = useSaveHours();
  const initial = () => WEEKDAYS.map((_, i): Row => {
    const h = site.hours.find((x) => x.weekday === i + 1);
    return h ? { open: true, opensAt: h.opensAt, closesAt: h.closesAt } : { open: false, opensAt: '08:00', closesAt: '17:30' };
  });
  const [rows, setRows] = useState<Row[]>(initial);
  const set = (i: number, r: Partial<Row>) => setRows(rows.map((x, j) => (j === i ? { ...x, ...r } : x)));
  const hours: DayHours[] = rows.flatMap((r, i) => (r.open ? [{ weekday: i + 1, opensAt: r.opensAt, closesAt: r.closesAt }] : []));
  return (
    <section aria-labelledby={`hours-${site.id}`} className="rounded-card border-2 border-ink-line bg-paper-raised p-4">
      <h2 id={`hours-${site.id}`} className="text-xl font-bold">
        Opening hours
      </h2>
      <p className="text-sm text-ink-muted">Local time at {site.name} ({site.timeZone}). A day not ticked is closed.</p>
      <div className="mt-3 space-y-2">
        {WEEKDAYS.map((day, i) => (
          <div key={day} className="flex flex-wrap items-end gap-2">
            <CheckField label={day} checked={rows[i].open} onChange={(e) => set(i, { open: e.target.checked })} className="w-44" />
            {rows[i].open && (
              <>
                <TextField label={`${day} opens`} type="time" value={rows[i].opensAt} onChange={(e) => set(i, { opensAt: e.target.value })} className="w-36" />
                <TextField label={`${day} closes`} type="time" value={rows[i].closesAt} onChange={(e) => set(i, { closesAt: e.target.value })} className="w-36" />
              </>
            )}
          </div>
        ))}
      </div>
      <Button className="mt-3" disabled={save.isPending} onClick={() => save.mutate({ siteId: site.id, hours })}>
        Save opening hours
      </Button>
      {save.isSuccess && !save.isPending && <p className="mt-2 text-ink-soft">✓ Saved.</p>}
      <Problem error={save.error} />
    </section>
  );
}
