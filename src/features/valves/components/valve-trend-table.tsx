import { formatDate, formatKm } from '../../../lib/format';
import type { ValveTrendView } from '../../../../shared/schemas/valves';
import { clearanceText } from '../clearance-format';
import { projection } from '../trend-line';

/** The chart's numbers as a table: for screen readers, print, and while the chart loads. */
export function ValveTrendTable({ valve }: { valve: ValveTrendView }) {
  const p = projection(valve);
  return (
    <table className="num w-full border-collapse text-left text-sm">
      <caption className="sr-only">{valve.label}: clearance at each check</caption>
      <thead className="bg-paper-sunk">
        <tr>
          <th scope="col" className="px-2 py-1">Date</th>
          <th scope="col" className="px-2 py-1">Odometer</th>
          <th scope="col" className="px-2 py-1">As found</th>
          <th scope="col" className="px-2 py-1">As left</th>
        </tr>
      </thead>
      <tbody>
        {valve.points.map((pt) => (
          <tr key={`${pt.odometerKm}-${pt.date}`} className="border-t border-ink-line">
            <td className="px-2 py-1">{formatDate(pt.date)}</td>
            <td className="px-2 py-1">{formatKm(pt.odometerKm)}</td>
            <td className="px-2 py-1">{clearanceText(pt.asFoundMm, 'mm')}</td>
            <td className="px-2 py-1">{pt.asLeftMm == null ? 'as found' : clearanceText(pt.asLeftMm, 'mm')}</td>
          </tr>
        ))}
        {p && (
          <tr className="border-t-2 border-ink-line text-ink-soft">
            <td className="px-2 py-1">Trend at next check</td>
            <td className="px-2 py-1">{formatKm(p.toKm)}</td>
            <td className="px-2 py-1" colSpan={2}>about {clearanceText(p.toMm, 'mm')}</td>
          </tr>
        )}
      </tbody>
    </table>
  );
}
