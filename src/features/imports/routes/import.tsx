import { useState, type ChangeEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { ErrorPanel, PageHeader } from '../../../components/ui/states';
import { BIKE_REQUIRED, READING_COLUMNS, missingColumns } from '../../../../shared/domain/csv-rows';
import { IMPORT_MAX_BYTES, type ImportKind } from '../../../../shared/schemas/imports';
import { usePreviewImport, useRunImport } from '../api';
import { readCsvFile, type FileSummary } from '../read-file';
import { ColumnHelp } from '../components/column-help';
import { ImportReportPanel } from '../components/import-report';
import { PreviewTable } from '../components/preview-table';
import { ProgressBar } from '../components/progress-bar';

const KINDS: { kind: ImportKind; label: string }[] = [
  { kind: 'bikes', label: 'Bikes (the fleet)' },
  { kind: 'readings', label: 'Odometer readings' },
];

export function ImportRoute() {
  const [kind, setKind] = useState<ImportKind>('readings');
  const [file, setFile] = useState<File | null>(null);
  const [summary, setSummary] = useState<FileSummary | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [reading, setReading] = useState<number | null>(null);
  const [sending, setSending] = useState(0);
  const preview = usePreviewImport();
  const run = useRunImport();

  const reset = () => {
    setFile(null);
    setSummary(null);
    setProblem(null);
    setReading(null);
    preview.reset();
    run.reset();
  };

  async function choose(e: ChangeEvent<HTMLInputElement>) {
    const f = e.target.files?.[0];
    e.target.value = '';
    reset();
    if (!f) return;
    setFile(f);
    if (f.size > IMPORT_MAX_BYTES) return setProblem(`The file is ${(f.size / 1024 / 1024).toFixed(1)} MB; the most is ${IMPORT_MAX_BYTES / 1024 / 1024} MB. Split it into smaller files.`);
    setReading(0);
    try {
      const s = await readCsvFile(f, setReading);
      setSummary(s);
      const missing = missingColumns(s.fields, kind === 'bikes' ? BIKE_REQUIRED : READING_COLUMNS);
      if (missing.length) return setProblem(`The first line must name the columns. Missing: ${missing.join(', ')}.`);
      if (!s.rows) return setProblem('The file has no rows under its header.');
      // The server checks every row against the whole fleet; nothing is stored yet.
      preview.mutate({ kind, file: f, onProgress: setSending });
    } catch (err) {
      setProblem((err as Error).message);
    }
  }

  const result = preview.data;
  return (
    <div className="flex flex-col gap-5">
      <PageHeader title="Import from a file" />
      <fieldset className="flex flex-wrap gap-2" disabled={preview.isPending || run.isPending}>
        <legend className="mb-2 font-semibold">What the file holds</legend>
        {KINDS.map((k) => (
          <label key={k.kind} className={`inline-flex min-h-tap cursor-pointer items-center gap-2 rounded-card border-2 px-4 ${kind === k.kind ? 'border-accent bg-accent-soft' : 'border-ink-line bg-paper-raised'}`}>
            <input type="radio" name="kind" value={k.kind} checked={kind === k.kind} onChange={() => { setKind(k.kind); reset(); }} />
            {k.label}
          </label>
        ))}
      </fieldset>
      <ColumnHelp kind={kind} />
      <label className="flex flex-col gap-1">
        <span className="font-semibold">CSV file</span>
        <input type="file" accept=".csv,text/csv" onChange={choose} disabled={preview.isPending || run.isPending} className="min-h-tap rounded-card border-2 border-ink-line bg-paper-raised p-2" />
      </label>

      {reading !== null && reading < 1 && <ProgressBar label={`Reading ${file?.name ?? 'the file'}`} value={reading} />}
      {summary && !problem && <p className="text-ink-soft"><span className="num">{summary.rows.toLocaleString('en-GB')}</span> rows read from {file?.name}{summary.malformed ? `, ${summary.malformed} of them malformed` : ''}.</p>}
      {problem && <p role="alert" className="rounded-card border-2 border-state-stop bg-state-stop-soft p-4 font-semibold">⚠ {problem}</p>}
      {preview.isPending && <ProgressBar label={sending < 1 ? 'Sending the file for checking' : 'Checking every row against the fleet'} value={sending} />}
      {preview.error && <ErrorPanel error={preview.error} />}

      {result && !run.data && (
        <>
          <PreviewTable kind={kind} preview={result} />
          <div className="flex flex-wrap items-center gap-3">
            <Button disabled={!result.valid || run.isPending} onClick={() => file && run.mutate({ kind, file, onProgress: setSending })}>
              Import {result.valid.toLocaleString('en-GB')} valid {result.valid === 1 ? 'row' : 'rows'}
            </Button>
            <Button kind="secondary" onClick={reset} disabled={run.isPending}>Choose another file</Button>
            {result.invalid > 0 && <span className="text-ink-soft">Rows with problems are skipped; fix them and import that file again.</span>}
          </div>
          {run.isPending && <ProgressBar label={sending < 1 ? 'Sending the file' : 'Importing, in one go: all rows or none'} value={sending} />}
          {run.error && <ErrorPanel error={run.error} />}
        </>
      )}
      {run.data && (
        <>
          <ImportReportPanel report={run.data} kind={kind} />
          <div><Button kind="secondary" onClick={reset}>Import another file</Button></div>
        </>
      )}
    </div>
  );
}
