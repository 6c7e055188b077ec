import { formatDate, formatKm, formatOdometer } from '../../../lib/format';
import type { ServiceDone } from '../../../../shared/schemas/service-record';
import { ValveReadings } from './valve-readings';

export interface Visit {
  date: string;
  odometer: number;
  odometerKm: number;
  items: ServiceDone[];
}

/** Services done on the same day at the same distance make one visit, as a service book lists them. */
export function groupVisits(services: ServiceDone[]): Visit[] {
  const out: Visit[] = [];
  for (const s of services) {
    const last = out.at(-1);
    if (last && last.date === s.date && Math.abs(last.odometerKm - s.odometerKm) < 0.5) last.items.push(s);
    else out.push({ date: s.date, odometer: s.odometer, odometerKm: s.odometerKm, items: [s] });
  }
  return out;
}

const th = 'border border-ink-line px-2 py-1 text-left font-semibold';
const td = 'border border-ink-line px-2 py-1 align-top';

function Measured({ s }: { s: ServiceDone }) {
  if (!s.readings.length) return null;
  return (
    <ul className="mt-1">
      {s.readings.map((r) => (
        <li key={r.label}>
          {r.label}: {r.kind === 'check' ? (r.done ? 'done' : 'not done') : r.kind === 'date' ? formatDate(r.dateValue) : `${r.value ?? '—'}${r.unit ? ` ${r.unit}` : ''}`}
          {(r.min != null || r.max != null) && <span className="text-ink-muted print:text-black">{` (limits ${r.min ?? ''}–${r.max ?? ''}${r.unit ? ` ${r.unit}` : ''})`}</span>}
          {r.outOfLimits && <span className="ml-1 font-semibold"><span aria-hidden>✗ </span>outside limits</span>}
        </li>
      ))}
    </ul>
  );
}

/** One visit on paper: what was done, the readings taken, who signed each item off, and room for a signature. */
export function VisitTable({ visit, unit }: { visit: Visit; unit: 'km' | 'mi' }) {
  const where = `${formatDate(visit.date)} · ${formatOdometer(visit.odometer, unit)}${unit !== 'km' ? ` (${formatKm(visit.odometerKm)})` : ''}`;
  return (
    <table className="num w-full table-fixed break-inside-avoid border-collapse text-sm">
      <caption className="bg-paper-sunk px-2 py-1 text-left font-bold print:bg-white print:px-0">{where}</caption>
      <thead>
        <tr>
          <th className={th}>Work done</th>
          <th className={`${th} w-36`}>Signed off by</th>
          <th className={`${th} w-36`}>Signature</th>
        </tr>
      </thead>
      <tbody>
        {visit.items.map((s) => (
          <tr key={s.id}>
            <td className={td}>
              <span className="font-semibold">{s.item}</span>
              {s.safetyCritical && <span className="ml-2 text-xs uppercase">safety-critical</span>}
              {s.notes && <p className="whitespace-pre-line">{s.notes}</p>}
              <Measured s={s} />
              {s.valveReadings.length > 0 && <ValveReadings valves={s.valveReadings} />}
            </td>
            <td className={td}>{s.signedOffBy ?? '—'}</td>
            {/* Left blank for a pen on the printed copy. */}
            <td className={td} />
          </tr>
        ))}
      </tbody>
    </table>
  );
}
