import {
  createPaginatedRowModel,
  createSortedRowModel,
  rowPaginationFeature,
  rowSortingFeature,
  sortFns,
  tableFeatures,
  useTable,
  type ColumnDef,
  type RowData,
} from '@tanstack/react-table';
import type { ReactNode } from 'react';
import { Button } from './button';

export const tableKit = tableFeatures({
  rowSortingFeature,
  rowPaginationFeature,
  sortedRowModel: createSortedRowModel(),
  paginatedRowModel: createPaginatedRowModel(),
  sortFns,
});
export type Columns<Row extends RowData> = ColumnDef<typeof tableKit, Row>[];

interface Props<Row extends RowData> {
  columns: Columns<Row>;
  data: Row[];
  caption: string;
  pageSize?: number;
  initialSort?: { id: string; desc: boolean }[];
  empty?: ReactNode;
  onRowClick?: (row: Row) => void;
}

/** Lists are tables: sortable headers, paging, numbers in tabular figures. */
export function DataTable<Row extends RowData>({ columns, data, caption, pageSize = 50, initialSort = [], empty, onRowClick }: Props<Row>) {
  const table = useTable({
    features: tableKit,
    columns,
    data,
    initialState: { sorting: initialSort, pagination: { pageIndex: 0, pageSize } },
  });
  const rows = table.getRowModel().rows;
  const pages = table.getPageCount();
  const page = table.state.pagination.pageIndex;
  return (
    <div className="overflow-x-auto rounded-card border-2 border-ink-line bg-paper-raised">
      <table className="w-full border-collapse text-left">
        <caption className="sr-only">{caption}</caption>
        <thead className="bg-paper-sunk">
          {table.getHeaderGroups().map((g) => (
            <tr key={g.id}>
              {g.headers.map((h) => {
                const sorted = h.column.getIsSorted();
                return (
                  <th key={h.id} scope="col" aria-sort={sorted ? (sorted === 'asc' ? 'ascending' : 'descending') : undefined} className="px-3 py-2 font-semibold">
                    {h.column.getCanSort() ? (
                      <button type="button" onClick={h.column.getToggleSortingHandler()} className="inline-flex min-h-tap items-center gap-1 text-left">
                        <table.FlexRender header={h} />
                        <span aria-hidden className="text-ink-muted">{sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}</span>
                      </button>
                    ) : (
                      <table.FlexRender header={h} />
                    )}
                  </th>
                );
              })}
            </tr>
          ))}
        </thead>
        <tbody>
          {rows.map((row) => (
            <tr
              key={row.id}
              onClick={onRowClick ? () => onRowClick(row.original) : undefined}
              className={`border-t border-ink-line ${onRowClick ? 'cursor-pointer hover:bg-accent-soft' : ''}`}
            >
              {row.getAllCells().map((c) => (
                <td key={c.id} className="px-3 py-2 align-middle">
                  <table.FlexRender cell={c} />
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
      {rows.length === 0 && <div className="p-6 text-center text-ink-soft">{empty ?? 'Nothing to show.'}</div>}
      {pages > 1 && (
        <div className="flex items-center justify-between gap-2 border-t border-ink-line px-3 py-2">
          <span className="num text-sm text-ink-soft">
            Page {page + 1} of {pages} · {data.length} rows
          </span>
          <div className="flex gap-2">
            <Button kind="secondary" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()}>
              Previous
            </Button>
            <Button kind="secondary" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()}>
              Next
            </Button>
          </div>
        </div>
      )}
    </div>
  );
}
