import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { SettingsFormSchema, type SettingsResult } from '../../../lib/settings-queries';
import { useSaveSettings } from '../api';

/** The tyre tread minimum proposed for new tread readings, with where its default comes from. */
export function TreadForm({ current, canEdit }: { current: SettingsResult; canEdit: boolean }) {
  const save = useSaveSettings();
  const [value, setValue] = useState(String(current.settings.tyreTreadMinMm));
  const [error, setError] = useState<string>();
  const [saved, setSaved] = useState(false);
  const serverErr = save.error instanceof ApiError ? save.error : null;
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const typed = value.trim().replace(',', '.');
    const parsed = SettingsFormSchema.safeParse({ tyreTreadMinMm: typed === '' ? undefined : Number(typed) });
    if (!parsed.success) return setError(parsed.error.issues[0]?.message);
    setError(undefined);
    save.mutate(parsed.data, { onSuccess: () => setSaved(true) });
  };
  return (
    <form onSubmit={submit} noValidate aria-labelledby="tread-heading" className="flex max-w-3xl flex-col gap-4 rounded-card border-2 border-ink-line bg-paper-raised p-5">
      <h2 id="tread-heading" className="text-xl font-bold">Tyre tread minimum</h2>
      <p className="rounded-card border-l-4 border-accent bg-accent-soft px-4 py-2 font-semibold">
        <span aria-hidden>§ </span>Local law decides. Set the minimum that applies where your bikes are ridden.
      </p>
      <TextField
        label="Least tread depth"
        inputMode="decimal"
        suffix="mm"
        value={value}
        disabled={!canEdit}
        onChange={(e) => {
          setValue(e.target.value);
          setSaved(false);
        }}
        error={error ?? serverErr?.field('tyreTreadMinMm')}
        hint="Proposed as the lower limit when a manager adds a tyre tread reading to a service plan. Readings already in plans keep their own limits."
        className="max-w-sm"
      />
      <div>
        <p className="text-sm font-semibold text-ink-muted">Where the default comes from</p>
        <p className="mt-1 border-l-4 border-ink-line pl-3 text-ink-soft">{current.sources.tyreTreadMinMm}</p>
      </div>
      {serverErr && !serverErr.details.length && <p role="alert" className="text-state-stop">⚠ {serverErr.message}</p>}
      {saved && <p role="status" className="font-semibold"><span aria-hidden>✓ </span>Saved: new tread readings start at <span className="num">{current.settings.tyreTreadMinMm} mm</span>.</p>}
      {canEdit ? (
        <div><Button type="submit" disabled={save.isPending}>{save.isPending ? 'Saving…' : 'Save the minimum'}</Button></div>
      ) : (
        <p className="text-ink-soft">An administrator changes this setting.</p>
      )}
    </form>
  );
}
