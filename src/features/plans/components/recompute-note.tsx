const bikesWord = (n: number) => `${n} ${n === 1 ? 'bike' : 'bikes'}`;

/** Said before saving: a plan change is not local to this screen. */
export function RecomputeNote({ bikes, verb = 'Saving this' }: { bikes: number; verb?: string }) {
  return (
    <p className="flex items-center gap-2 text-ink-soft">
      <span aria-hidden className="font-black text-accent">↻</span>
      {bikes > 0 ? (
        <span>
          {verb} recomputes the dues of <strong className="num text-ink">{bikesWord(bikes)}</strong> of this model.
        </span>
      ) : (
        <span>No bike uses this model yet: no dues move.</span>
      )}
    </p>
  );
}

/** Said after saving, in the same place, until the next change. */
export function SavedNote({ bikes, what = 'Saved.' }: { bikes: number | undefined; what?: string }) {
  return (
    <p role="status" className="flex items-center gap-2 rounded-card border-2 border-state-ok bg-state-ok-soft px-3 py-2 font-semibold">
      <span aria-hidden className="font-black">✓</span>
      <span className="num">
        {what} {bikes ? `Dues moved for ${bikesWord(bikes)}.` : 'No dues to move.'}
      </span>
    </p>
  );
}
