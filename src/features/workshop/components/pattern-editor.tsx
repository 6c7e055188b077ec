import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { CheckField } from '../../../components/ui/check-field';
import { TextField } from '../../../components/ui/field';
import { Segmented } from '../../../components/ui/segmented';
import { patternInWords, readWeeklyRule, weeklyRule, WEEKDAYS } from '../../../../shared/domain/shifts';
import type { WorkPattern } from '../../../../shared/schemas/capacity';
import { useAddPattern, usePatchPattern } from '../api';
import { Problem } from './problem';

interface Props {
  siteId: string;
  userId: string;
  today: string;
  /** The pattern being changed; none for a new one. */
  pattern?: WorkPattern;
  onDone: () => void;
}

/** Weekdays, every week or every other week, times and dates: written as an RRULE counted from the first day. */
export function PatternEditor({ siteId, userId, today, pattern, onDone }: Props) {
  const read = pattern ? readWeeklyRule(pattern.rrule) : null;
  const [days, setDays] = useState<number[]>(read?.weekdays ?? [1, 2, 3, 4, 5]);
  const [every, setEvery] = useState<'1' | '2'>(read?.everyOtherWeek ? '2' : '1');
  const [startTime, setStart] = useState(pattern?.startTime ?? '08:00');
  const [endTime, setEnd] = useState(pattern?.endTime ?? '16:30');
  const [startsOn, setStartsOn] = useState(pattern?.startsOn ?? today);
  const [endsOn, setEndsOn] = useState(pattern?.endsOn ?? '');
  const [label, setLabel] = useState(pattern?.label ?? '');
  const add = useAddPattern();
  const patch = usePatchPattern();
  const busy = add.isPending || patch.isPending;
  const rrule = days.length ? weeklyRule(days, every === '2') : '';
  const toggle = (d: number, on: boolean) => setDays(on ? [...days, d] : days.filter((x) => x !== d));
  const submit = () => {
    const body = { rrule, startsOn, endsOn: endsOn || null, startTime, endTime, label: label.trim() || null };
    const done = { onSuccess: onDone };
    if (pattern) patch.mutate({ id: pattern.id, ...body }, done);
    else add.mutate({ siteId, userId, ...body }, done);
  };
  return (
    <form
      className="mt-3 space-y-3 rounded-card border-2 border-accent p-3"
      onSubmit={(e) => {
        e.preventDefault();
        submit();
      }}
    >
      <fieldset>
        <legend className="mb-1 font-semibold">Works on</legend>
        <div className="flex flex-wrap gap-2">
          {WEEKDAYS.map((d, i) => (
            <CheckField key={d} label={d} checked={days.includes(i + 1)} onChange={(e) => toggle(i + 1, e.target.checked)} />
          ))}
        </div>
      </fieldset>
      <Segmented legend="Repeats" value={every} onChange={setEvery} options={[{ value: '1', label: 'Every week' }, { value: '2', label: 'Every other week' }]} />
      <div className="flex flex-wrap gap-3">
        <TextField label="Starts" type="time" value={startTime} onChange={(e) => setStart(e.target.value)} className="w-36" />
        <TextField label="Ends" type="time" value={endTime} onChange={(e) => setEnd(e.target.value)} className="w-36" />
        <TextField label="From" type="date" value={startsOn} onChange={(e) => setStartsOn(e.target.value)} className="w-48" hint={every === '2' ? 'Other weeks count from the week of this day.' : undefined} />
        <TextField label="Until (optional)" type="date" value={endsOn} onChange={(e) => setEndsOn(e.target.value)} className="w-48" />
        <TextField label="Label (optional)" value={label} maxLength={80} onChange={(e) => setLabel(e.target.value)} className="w-56" />
      </div>
      <p className="text-ink-soft">{rrule ? `In words: ${patternInWords(rrule, startTime, endTime)}` : 'Tick at least one day.'}</p>
      <div className="flex gap-2">
        <Button type="submit" disabled={!rrule || busy}>
          {pattern ? 'Save pattern' : 'Add pattern'}
        </Button>
        <Button kind="secondary" onClick={onDone}>
          Cancel
        </Button>
      </div>
      <Problem error={add.error ?? patch.error} />
    </form>
  );
}
