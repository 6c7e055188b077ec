import type { ImportReport } from '../../../../shared/schemas/imports';

/** What was stored, and which lines were left out and why. */
export function ImportReportPanel({ report, kind }: { report: ImportReport; kind: 'bikes' | 'readings' }) {
  const what = kind === 'bikes' ? 'bikes' : 'odometer readings';
  return (
    <section role="status" aria-labelledby="report-title" className="rounded-card border-2 border-state-ok bg-state-ok-soft p-5">
      <h2 id="report-title" className="text-xl font-bold">
        <span aria-hidden>✓ </span>
        <span className="num">{report.imported.toLocaleString('en-GB')}</span> {what} imported
      </h2>
      <p className="mt-1">Due items of {report.bikes} {report.bikes === 1 ? 'bike were' : 'bikes were'} recomputed.</p>
      {report.skipped.length > 0 && (
        <details className="mt-3">
          <summary className="min-h-tap cursor-pointer font-semibold">{report.skipped.length} lines skipped</summary>
          <ul className="mt-2 flex flex-col gap-1 text-sm">
            {report.skipped.map((s) => (
              <li key={s.line}>
                <span className="num font-semibold">Line {s.line}</span>: {s.errors.map((e) => `${e.field}: ${e.message}`).join(' · ')}
              </li>
            ))}
          </ul>
        </details>
      )}
    </section>
  );
}
