export function WhoseToggle({ mine, onChange }: { mine: boolean; onChange: (mine: boolean) => void }) {
  const cls = (on: boolean) => `min-h-tap rounded-card px-4 font-semibold ${on ? 'bg-ink text-paper' : 'text-ink hover:bg-paper-sunk'}`;
  return (
    <div role="group" aria-label="Whose tasks" className="flex gap-1 rounded-card border-2 border-ink-line bg-paper-raised p-1">
      <button type="button" aria-pressed={mine} className={cls(mine)} onClick={() => onChange(true)}>Mine</button>
      <button type="button" aria-pressed={!mine} className={cls(!mine)} onClick={() => onChange(false)}>Everyone at my sites</button>
    </div>
  );
}
