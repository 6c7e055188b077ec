import { useId } from 'react';
import { Segmented } from '../../../components/ui/segmented';
import type { ReadingTemplate } from '../../../../shared/schemas/tasks';
import { judge, limitWords, readNumber } from './reading-judge';

interface Props {
  template: ReadingTemplate;
  raw: string;
  onChange: (raw: string) => void;
  error?: string;
  fleetNumber: string;
  today: string;
}

const CHECK_OPTIONS = [
  { value: 'done', label: 'Done' },
  { value: 'not-done', label: 'Not done' },
] as const;

/** One reading on the card: the value, its unit and limit printed large, and what the value means, said as it is typed. */
export function ReadingInput({ template: t, raw, onChange, error, fleetNumber, today }: Props) {
  const id = useId();
  const j = judge(t, raw);
  const limit = t.kind === 'measure' ? limitWords(t) : null;
  const shown = t.kind === 'measure' && j.state !== 'empty' && j.state !== 'bad' ? `${readNumber(raw)} ${t.unit ?? ''}`.trim() : null;
  return (
    <div className={`flex flex-col gap-2 rounded-card border-2 p-3 ${j.state === 'grounds' ? 'border-state-stop bg-state-stop-soft' : 'border-ink-line bg-paper-raised'}`}>
      {t.kind === 'check' ? (
        <Segmented legend={t.label} value={raw as 'done' | 'not-done'} options={CHECK_OPTIONS} onChange={onChange} />
      ) : (
        <>
          <label htmlFor={id} className="text-lg font-semibold">{t.label}</label>
          <div className="flex flex-wrap items-center gap-3">
            <input
              id={id}
              type={t.kind === 'date' ? 'date' : 'text'}
              inputMode={t.kind === 'measure' ? 'decimal' : undefined}
              max={t.kind === 'date' ? today : undefined}
              value={raw}
              onChange={(e) => onChange(e.target.value)}
              aria-invalid={!!error || j.state === 'bad'}
              aria-describedby={`${id}-say`}
              className="num min-h-14 w-40 rounded-card border-2 border-ink-line bg-paper-raised px-3 text-reading font-semibold focus:border-accent aria-[invalid=true]:border-state-stop"
            />
            {t.unit && <span className="text-reading font-semibold">{t.unit}</span>}
            {limit && limit !== 'no limit' && <span className="num text-xl text-ink-soft">limit {limit}</span>}
          </div>
        </>
      )}
      <div id={`${id}-say`} aria-live="polite" className="text-lg">
        {error ? (
          <p className="font-semibold text-state-stop">⚠ {error}</p>
        ) : j.state === 'bad' ? (
          <p className="font-semibold text-state-stop">⚠ Type a number, e.g. 1.5{t.unit ? ` (${t.unit})` : ''}.</p>
        ) : j.state === 'grounds' ? (
          <p className="font-bold text-state-stop">
            <span aria-hidden>■ </span>
            {t.kind === 'check' ? 'Not done, and safety-critical.' : <>{shown} is outside the limit ({limit}).</>} Signing off with this takes {fleetNumber} out of service at once.
          </p>
        ) : j.state === 'outside' ? (
          <p className="font-semibold">
            <span aria-hidden className="text-state-soon">◔ </span>
            {t.kind === 'check' ? 'Not done: recorded as such.' : <>{shown} is outside {limit}: recorded and flagged.</>} The bike stays in service.
          </p>
        ) : j.state === 'ok' && limit && limit !== 'no limit' ? (
          <p className="text-ink-soft"><span aria-hidden className="text-state-ok">✓ </span>Within the limit.</p>
        ) : t.safetyCritical ? (
          <p className="text-ink-soft">Safety-critical: {t.kind === 'check' ? 'not done' : 'a value outside the limit'} takes the bike out of service.</p>
        ) : null}
      </div>
    </div>
  );
}
