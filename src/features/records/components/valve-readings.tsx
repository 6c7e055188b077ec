import type { ValveReadingView } from '../../../../shared/schemas/service-record';

const mm = (v: number | null) => (v == null ? '—' : `${v.toFixed(2)} mm`);

/** Each valve's clearance as found and as left, beside its spec. */
export function ValveReadings({ valves }: { valves: ValveReadingView[] }) {
  const cell = 'whitespace-nowrap py-0.5 pr-3 text-left';
  return (
    <table className="mt-1 w-full border-collapse">
      <thead>
        <tr>
          {['Valve', 'As found', 'As left', 'Shim', 'Spec (cold)', 'Result'].map((h) => (
            <th key={h} className={`${cell} font-semibold`}>{h}</th>
          ))}
        </tr>
      </thead>
      <tbody>
        {valves.map((v) => (
          <tr key={v.valveId}>
            <td className={cell}>{v.label}</td>
            <td className={cell}>{mm(v.asFoundMm)}</td>
            <td className={cell}>{mm(v.asLeftMm)}</td>
            <td className={cell}>{v.shimAfterMm != null && v.shimAfterMm !== v.shimBeforeMm ? `${mm(v.shimBeforeMm)} → ${mm(v.shimAfterMm)}` : mm(v.shimBeforeMm)}</td>
            <td className={cell}>{`${v.specMinMm.toFixed(2)}–${v.specMaxMm.toFixed(2)} mm`}</td>
            <td className={cell}>{v.inSpec ? <span><span aria-hidden>✓ </span>in spec</span> : <span className="font-semibold"><span aria-hidden>✗ </span>outside spec</span>}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
