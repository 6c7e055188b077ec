import { useMemo } from 'react';
import { useSearchParams } from 'react-router-dom';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { DataTable } from '../../../components/ui/data-table';
import { ErrorPanel, Loading } from '../../../components/ui/states';
import { DUE_STATUSES } from '../../../../shared/schemas/due';
import { csvHref, dueQueries, type DueFilter } from '../api';
import { listColumns } from './due-columns';
import { DueFilters, WINDOWS } from './due-filters';

function readFilter(p: URLSearchParams): DueFilter {
  const within = Number(p.get('within'));
  const status = p.get('status');
  return {
    within: (WINDOWS as readonly number[]).includes(within) ? within : 7,
    siteId: p.get('siteId') || undefined,
    modelId: p.get('modelId') || undefined,
    item: p.get('item') || undefined,
    status: DUE_STATUSES.find((s) => s === status),
  };
}

/**
 * The due list with its filters in the address, so a filtered list can be bookmarked or sent. Its
 * technician boxes share the AssignProvider of the board it sits on.
 */
export function DueListPanel({ knownItems }: { knownItems: string[] }) {
  const [params, setParams] = useSearchParams();
  const filter = readFilter(params);
  const q = useQuery({ ...dueQueries.list(filter), placeholderData: keepPreviousData });
  const items = useMemo(
    () => [...new Set([...knownItems, ...(q.data?.items.map((d) => d.item) ?? []), ...(filter.item ? [filter.item] : [])])].sort(),
    [knownItems, q.data, filter.item],
  );
  const change = (k: keyof DueFilter, v: string) => {
    const p = new URLSearchParams(params);
    if (v && !(k === 'within' && v === '7')) p.set(k, v);
    else p.delete(k);
    setParams(p, { replace: true, preventScrollReset: true });
  };
  return (
    <section aria-labelledby="due-list" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <h2 id="due-list" className="text-xl font-bold">Due list</h2>
        <a
          href={csvHref(filter)}
          download
          className="inline-flex min-h-tap items-center gap-2 rounded-card border-2 border-ink-line bg-paper-raised px-4 font-semibold hover:border-ink-soft"
        >
          <span aria-hidden>⤓</span> Export CSV
        </a>
      </div>
      <DueFilters filter={filter} items={items} onChange={change} />
      {q.isPending ? (
        <Loading what="the due list" />
      ) : q.error ? (
        <ErrorPanel error={q.error} retry={() => q.refetch()} />
      ) : (
        <div className={q.isPlaceholderData ? 'opacity-60' : ''}>
          <DataTable caption={`Due within ${filter.within} days`} columns={listColumns} data={q.data.items} pageSize={25} empty="Nothing matches these filters in this window." />
        </div>
      )}
    </section>
  );
}
