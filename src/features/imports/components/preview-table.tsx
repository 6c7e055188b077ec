import { useMemo, useState } from 'react';
import { DataTable, type Columns } from '../../../components/ui/data-table';
import { BIKE_COLUMNS, READING_COLUMNS } from '../../../../shared/domain/csv-rows';
import type { ImportKind, ImportPreview, PreviewRow } from '../../../../shared/schemas/imports';

function columnsFor(kind: ImportKind): Columns<PreviewRow> {
  const fields = kind === 'bikes' ? BIKE_COLUMNS : READING_COLUMNS;
  return [
    { id: 'line', accessorKey: 'line', header: 'Line', cell: (c) => <span className="num">{c.row.original.line}</span> },
    {
      id: 'ok',
      accessorFn: (r) => (r.ok ? 1 : 0),
      header: 'Check',
      cell: (c) =>
        c.row.original.ok ? (
          // The mid green is for shapes (3:1 is enough, WCAG 1.4.11); the word is in ink for 4.5:1 (1.4.3).
          <span className="whitespace-nowrap font-semibold"><span aria-hidden className="text-state-ok">✓ </span>Ready</span>
        ) : (
          <span className="whitespace-nowrap font-semibold text-state-stop"><span aria-hidden>⚠ </span>Will be skipped</span>
        ),
    },
    ...fields.map((f) => ({
      id: f,
      accessorFn: (r: PreviewRow) => r.data[f] ?? '',
      header: f,
      cell: (c: { row: { original: PreviewRow } }) => {
        const bad = c.row.original.errors.some((e) => e.field === f);
        return <span className={`num ${bad ? 'font-semibold text-state-stop underline decoration-wavy' : ''}`}>{c.row.original.data[f] || '—'}</span>;
      },
    })),
    {
      id: 'errors',
      header: 'What to fix',
      enableSorting: false,
      cell: (c) => (
        <ul className="min-w-64 list-none text-sm">
          {c.row.original.errors.map((e, i) => (
            <li key={i}><span className="font-mono">{e.field}</span>: {e.message}</li>
          ))}
        </ul>
      ),
    },
  ];
}

/** Every row of the file as the server checked it; rows with problems first, or only them. */
export function PreviewTable({ kind, preview }: { kind: ImportKind; preview: ImportPreview }) {
  const [onlyProblems, setOnlyProblems] = useState(preview.invalid > 0);
  const columns = useMemo(() => columnsFor(kind), [kind]);
  const data = onlyProblems ? preview.rows.filter((r) => !r.ok) : preview.rows;
  return (
    <section aria-labelledby="preview-title" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 id="preview-title" className="text-xl font-bold">
          <span className="num">{preview.valid}</span> ready, <span className="num">{preview.invalid}</span> with problems
        </h2>
        <label className="inline-flex min-h-tap items-center gap-2">
          <input type="checkbox" className="h-5 w-5" checked={onlyProblems} onChange={(e) => setOnlyProblems(e.target.checked)} />
          Only rows with problems
        </label>
      </div>
      <DataTable caption="Rows of the file" columns={columns} data={data} pageSize={100} empty="No row has a problem." />
    </section>
  );
}
