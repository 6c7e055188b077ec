import { useId, useMemo, useState } from 'react';
import { BikeStatusBadge } from '../../../components/ui/status-badge';
import type { BikeSummary } from '../../../../shared/schemas/bikes';

// "sm7", "SM 07" and "sm-07" all find SM-07: spaces, dashes and leading zeros are how people differ.
const squash = (s: string) => s.toLowerCase().replace(/[^a-z0-9]/g, '');
const loose = (s: string) => squash(s).replace(/(\D)0+(\d)/g, '$1$2');
const SHOWN = 24;

function matches(b: BikeSummary, q: string) {
  if (!q) return true;
  const fleet = squash(b.fleetNumber);
  const reg = squash(b.registration ?? '');
  return fleet.includes(squash(q)) || loose(b.fleetNumber).includes(loose(q)) || reg.includes(squash(q));
}

export function BikeFinder({ bikes, onPick }: { bikes: BikeSummary[]; onPick: (id: string) => void }) {
  const id = useId();
  const [q, setQ] = useState('');
  const manySites = new Set(bikes.map((b) => b.site.id)).size > 1;
  const found = useMemo(
    () => bikes.filter((b) => matches(b, q.trim())).sort((a, b) => a.fleetNumber.localeCompare(b.fleetNumber, 'en', { numeric: true })),
    [bikes, q],
  );
  return (
    <div className="flex flex-col gap-4">
      <div>
        <label htmlFor={id} className="mb-2 block text-reading font-semibold">
          Fleet number or registration
        </label>
        <input
          id={id}
          type="search"
          autoFocus
          autoComplete="off"
          autoCapitalize="characters"
          spellCheck={false}
          value={q}
          onChange={(e) => setQ(e.target.value)}
          onKeyDown={(e) => e.key === 'Enter' && found.length === 1 && onPick(found[0].id)}
          placeholder="e.g. SM-07"
          className="min-h-16 w-full rounded-card border-2 border-ink-line bg-paper-raised px-4 text-display font-semibold placeholder:text-ink-muted focus:border-accent"
        />
      </div>
      {found.length === 0 ? (
        <p role="status" className="rounded-card border-2 border-dashed border-ink-line p-6 text-center text-lg">
          No bike at your sites matches “{q}”. Check the number painted on the bike, or try the registration.
        </p>
      ) : (
        <ul className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3" aria-label="Matching bikes">
          {found.slice(0, SHOWN).map((b) => (
            <li key={b.id}>
              <button
                type="button"
                onClick={() => onPick(b.id)}
                className="flex min-h-20 w-full flex-col items-start gap-1 rounded-card border-2 border-ink-line bg-paper-raised px-4 py-3 text-left hover:border-accent focus-visible:border-accent"
              >
                <span className="flex w-full flex-wrap items-center justify-between gap-2">
                  <span className="text-display font-bold">{b.fleetNumber}</span>
                  {b.status !== 'in_service' && <BikeStatusBadge status={b.status} />}
                </span>
                <span className="text-ink-soft">
                  {b.registration ?? 'no registration'} · {b.model.name}
                  {manySites && ` · ${b.site.name}`}
                </span>
              </button>
            </li>
          ))}
        </ul>
      )}
      {found.length > SHOWN && <p className="text-ink-soft">{found.length - SHOWN} more: type more of the number to narrow the list.</p>}
    </div>
  );
}
