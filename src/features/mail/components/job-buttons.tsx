import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { JOBS, useRunJob, type JobName } from '../api';

/** The scheduled jobs, run now by hand; each shows what the server reports it did. */
export function JobButtons() {
  const run = useRunJob();
  const [last, setLast] = useState<Partial<Record<JobName, { ok: boolean; text: string }>>>({});
  const start = (name: JobName) =>
    run.mutate(name, {
      onSuccess: (r) => setLast((l) => ({ ...l, [name]: { ok: true, text: r.result.summary } })),
      onError: (e) => setLast((l) => ({ ...l, [name]: { ok: false, text: e.message } })),
    });
  return (
    <ul className="grid gap-3 lg:grid-cols-3">
      {JOBS.map((j) => {
        const result = last[j.name];
        const busy = run.isPending && run.variables === j.name;
        return (
          <li key={j.name} className="flex flex-col gap-2 rounded-card border-2 border-ink-line bg-paper-raised p-4">
            <h3 className="font-bold">{j.label}</h3>
            <p className="text-sm text-ink-soft">{j.what} It also runs on its own schedule.</p>
            <Button kind="secondary" className="self-start" disabled={run.isPending} onClick={() => start(j.name)}>
              {busy ? 'Running…' : 'Run now'}
            </Button>
            {result && (
              <p role="status" className={`rounded-card p-2 text-sm ${result.ok ? 'bg-state-ok-soft' : 'bg-state-stop-soft text-state-stop'}`}>
                {result.ok ? '✓ ' : '⚠ '}
                {result.text}
              </p>
            )}
          </li>
        );
      })}
    </ul>
  );
}
