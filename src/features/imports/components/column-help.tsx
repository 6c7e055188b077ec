import type { ImportKind } from '../../../../shared/schemas/imports';

const HELP: Record<ImportKind, { columns: [string, string][]; example: string }> = {
  bikes: {
    columns: [
      ['fleet_number', 'as painted on the bike, unique in the fleet (required)'],
      ['registration', 'number plate, may be empty'],
      ['vin', '17 characters, no I, O or Q; may be empty'],
      ['model', 'a model name exactly as in Lashline (required)'],
      ['site', 'one of your sites (required)'],
      ['odometer_unit', 'km or mi; empty means km'],
      ['in_service_date', 'YYYY-MM-DD (required)'],
      ['in_service_odometer', 'the odometer then, a plain number; empty means 0'],
    ],
    example: 'fleet_number,registration,vin,model,site,odometer_unit,in_service_date,in_service_odometer\nSM-25,SM26 QST,,Strider 125,Quay Street,km,2026-03-01,12',
  },
  readings: {
    columns: [
      ['fleet_number', 'a bike at one of your sites'],
      ['date', 'YYYY-MM-DD, not after today'],
      ['odometer', 'in the bike’s own unit, a plain number'],
    ],
    example: 'fleet_number,date,odometer\nSM-07,2026-05-02,18450\nSM-07,2026-05-09,19010',
  },
};

/** What the file must hold: one line per column, and a short example to copy. */
export function ColumnHelp({ kind }: { kind: ImportKind }) {
  const h = HELP[kind];
  return (
    <details className="rounded-card border-2 border-ink-line bg-paper-raised p-4">
      <summary className="min-h-tap cursor-pointer font-semibold">What the file must hold</summary>
      <p className="mt-2 text-ink-soft">A CSV file (RFC 4180) with the column names on its first line, in any order and any case.</p>
      <dl className="mt-3 grid gap-x-4 gap-y-1 sm:grid-cols-[max-content_1fr]">
        {h.columns.map(([name, what]) => (
          <div key={name} className="contents">
            <dt className="font-mono text-sm">{name}</dt>
            <dd className="text-ink-soft">{what}</dd>
          </div>
        ))}
      </dl>
      <pre className="mt-3 overflow-x-auto rounded-card bg-paper-sunk p-3 text-sm">{h.example}</pre>
      {kind === 'readings' && <p className="mt-2 text-sm text-ink-soft">Rows may come in any order: each bike’s readings are taken by date, and each must not be lower than the one before.</p>}
    </details>
  );
}
