import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { ApiError } from '../../../lib/api-client';
import { DataTable, type Columns } from '../../../components/ui/data-table';
import { BOOKING_COLUMNS } from '../../../../shared/schemas/bookings';
import type { ImportPreview, PreviewRow } from '../../../../shared/schemas/imports';
import { useImportBookings, usePreviewBookings } from '../api';

const columns: Columns<PreviewRow> = [
  { id: 'line', accessorKey: 'line', header: 'Line', cell: (c) => <span className="num">{c.row.original.line}</span> },
  {
    id: 'ok', accessorFn: (r) => (r.ok ? 1 : 0), header: 'Check',
    cell: (c) => (c.row.original.ok ? <span className="font-semibold"><span aria-hidden className="text-state-ok">✓ </span>Ready</span> : <span className="font-semibold text-state-stop"><span aria-hidden>⚠ </span>Fix this row</span>),
  },
  ...BOOKING_COLUMNS.map((f) => ({
    id: f, header: f, accessorFn: (r: PreviewRow) => r.data[f] ?? '',
    cell: (c: { row: { original: PreviewRow } }) => <span className={`num ${c.row.original.errors.some((e) => e.field === f) ? 'font-semibold text-state-stop underline decoration-wavy' : ''}`}>{c.row.original.data[f] || '—'}</span>,
  })),
  {
    id: 'errors', header: 'What to fix', enableSorting: false,
    cell: (c) => <ul className="min-w-64 text-sm">{c.row.original.errors.map((e, i) => <li key={i}><span className="font-mono">{e.field}</span>: {e.message}</li>)}</ul>,
  },
];

/** A CSV file of bookings: checked first, then stored whole, or not at all while a row is wrong. */
export function BookingImport() {
  const [csv, setCsv] = useState<string | null>(null);
  const [name, setName] = useState('');
  const [preview, setPreview] = useState<ImportPreview | null>(null);
  const [message, setMessage] = useState('');
  const check = usePreviewBookings();
  const store = useImportBookings();

  async function choose(file: File | undefined) {
    setPreview(null);
    setMessage('');
    if (!file) return;
    const text = await file.text();
    setCsv(text);
    setName(file.name);
    try {
      setPreview(await check.mutateAsync(text));
    } catch (e) {
      if (e instanceof ApiError) setMessage(e.message);
      else throw e;
    }
  }

  async function commit() {
    if (!csv) return;
    try {
      const r = await store.mutateAsync(csv);
      setMessage(`Imported ${r.imported} booking${r.imported === 1 ? '' : 's'} from ${name}.`);
      setPreview(null);
      setCsv(null);
    } catch (e) {
      if (e instanceof ApiError) setMessage(e.message);
      else throw e;
    }
  }

  return (
    <section aria-labelledby="import-bookings" className="flex flex-col gap-3 rounded-card border-2 border-ink-line bg-paper-raised p-4">
      <h2 id="import-bookings" className="text-xl font-bold">Import bookings from a CSV file</h2>
      <p className="text-ink-soft">
        Columns: <span className="font-mono">{BOOKING_COLUMNS.join(', ')}</span>. Give fleet_number for one bike, or model and quantity. Times are the site’s local time, e.g. 2026-12-12 09:00; repeat is an RRULE such as FREQ=WEEKLY;UNTIL=20270131.
      </p>
      <label className="inline-flex min-h-tap items-center gap-3 font-semibold">
        CSV file
        <input type="file" accept=".csv,text/csv" onChange={(e) => void choose(e.target.files?.[0])} />
      </label>
      {check.isPending && <p role="status">Checking {name}…</p>}
      {message && <p role="status" className="font-semibold">{message}</p>}
      {preview && (
        <>
          <p className="font-semibold">
            <span className="num">{preview.valid}</span> ready, <span className="num">{preview.invalid}</span> with problems.
            {preview.invalid > 0 && ' Nothing is imported while a row has a problem: correct the file and choose it again.'}
          </p>
          <DataTable columns={columns} data={preview.rows} caption={`Rows of ${name} as checked`} pageSize={25} />
          <div>
            <Button onClick={() => void commit()} disabled={preview.invalid > 0 || store.isPending}>
              {store.isPending ? 'Importing…' : `Import ${preview.valid} booking${preview.valid === 1 ? '' : 's'}`}
            </Button>
          </div>
        </>
      )}
    </section>
  );
}
