import { useId } from 'react';
import { addDaysIso, formatDate, todayIso } from '../../../lib/format';
import { describeRule, ruleOccurrences, validateRule } from '../../../../shared/domain/due';

const PRESETS = [
  { label: 'Every year on 1 March', rule: 'FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1' },
  { label: 'Every year, first Monday of March', rule: 'FREQ=YEARLY;BYMONTH=3;BYDAY=1MO' },
  { label: 'Every 6 months on the 1st', rule: 'FREQ=MONTHLY;INTERVAL=6;BYMONTHDAY=1' },
  { label: 'Last day of every month', rule: 'FREQ=MONTHLY;BYMONTHDAY=-1' },
  { label: 'Every Monday', rule: 'FREQ=WEEKLY;BYDAY=MO' },
] as const;

/** What the rule means, worked out as it is typed: plain words and the next dates (due dates fall strictly after the day the work was done), or what to fix. */
function readRule(rule: string): { ok: true; words: string; next: string[] } | { ok: false; problem: string } | null {
  if (!rule.trim()) return null;
  const problem = validateRule(rule);
  if (problem) return { ok: false, problem };
  return { ok: true, words: describeRule(rule), next: ruleOccurrences(rule, addDaysIso(todayIso(), 1), 3) };
}

interface Props {
  value: string;
  onChange: (rule: string) => void;
  error?: string;
}

/** An RFC 5545 repeat rule, for work tied to the calendar rather than the odometer (a pre-season check). */
export function RuleField({ value, onChange, error }: Props) {
  const id = useId();
  const read = readRule(value);
  return (
    <div className="flex flex-col gap-2">
      <label htmlFor={id} className="font-semibold">Calendar rule (optional)</label>
      <input
        id={id}
        value={value}
        onChange={(e) => onChange(e.target.value)}
        aria-invalid={!!error || read?.ok === false}
        aria-describedby={`${id}-words`}
        spellCheck={false}
        placeholder="e.g. FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1"
        className="min-h-tap w-full rounded-card border-2 border-ink-line bg-paper-raised px-3 font-mono text-ink placeholder:text-ink-muted focus:border-accent aria-[invalid=true]:border-state-stop"
      />
      <div id={`${id}-words`} aria-live="polite">
        {error ? (
          <p className="text-sm font-medium text-state-stop">⚠ {error}</p>
        ) : read === null ? (
          <p className="text-sm text-ink-muted">An RFC 5545 repeat rule. Leave it empty when km and months are enough.</p>
        ) : read.ok ? (
          <p>
            <span aria-hidden className="font-black text-state-ok">✓ </span>
            In plain words: <strong>{read.words}</strong>
            {read.next.length > 0 && <span className="num block text-sm text-ink-soft">If done today, next due: {read.next.map(formatDate).join(', ')}</span>}
          </p>
        ) : (
          <p className="text-sm font-medium text-state-stop">⚠ {read.problem}</p>
        )}
      </div>
      <div role="group" aria-label="Common rules" className="flex flex-wrap gap-2">
        {PRESETS.map((p) => (
          <button key={p.rule} type="button" onClick={() => onChange(p.rule)} aria-pressed={value.trim().toUpperCase() === p.rule} className="min-h-tap rounded-card border-2 border-ink-line bg-paper px-3 text-sm font-semibold hover:border-accent aria-pressed:border-accent aria-pressed:bg-accent-soft">
            {p.label}
          </button>
        ))}
        {value && (
          <button type="button" onClick={() => onChange('')} className="min-h-tap px-3 text-sm font-semibold text-accent underline-offset-4 hover:underline">
            No calendar rule
          </button>
        )}
      </div>
    </div>
  );
}
