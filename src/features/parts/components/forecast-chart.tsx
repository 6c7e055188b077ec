import { CartesianGrid, ComposedChart, Line, ReferenceLine, XAxis, YAxis } from 'recharts';
import theme from '../../../../tailwind.config';
import { UNIT_WORDS, formatQty } from '../../../../shared/domain/parts';
import type { ForecastPart } from '../../../../shared/schemas/parts';
import { formatFigure, weekLabel } from '../parts-words';

// Colours come from the design tokens, so the chart matches the rest of the screen.
const c = theme.theme.extend.colors;

// A fixed size: the chart draws the same on a bench tablet, a desk screen and in a test without layout.
const WIDTH = 640;
const HEIGHT = 300;

/** Cumulative need from today, likely and cautious, against what is on the shelf and on order. */
export function ForecastChart({ part, today }: { part: ForecastPart; today: string }) {
  const data = [{ week: today, p50: 0, p90: 0 }, ...part.weeks.map((w) => ({ week: w.weekStart, p50: w.cumulativeP50, p90: w.cumulativeP90 }))];
  const covered = part.onHand + part.onOrder;
  return (
    <div
      role="img"
      aria-label={`Chart of the need for ${part.name} over ${part.weeks.length} weeks against ${formatQty(part.onHand, part.unit)} on hand; the table has the same numbers.`}
      className="overflow-x-auto"
    >
      <ComposedChart width={WIDTH} height={HEIGHT} data={data} margin={{ top: 16, right: 24, bottom: 4, left: 0 }}>
        <CartesianGrid stroke={c.ink.line} strokeDasharray="2 4" />
        <XAxis dataKey="week" tickFormatter={(d: string) => (d === today ? 'Now' : weekLabel(d))} stroke={c.ink.soft} fontSize={12} height={32} />
        <YAxis type="number" domain={[0, 'auto']} tickFormatter={(v: number) => formatFigure(v)} stroke={c.ink.soft} fontSize={12} width={48}
          label={{ value: UNIT_WORDS[part.unit].many, angle: -90, position: 'insideLeft', fill: c.ink.soft, fontSize: 11 }} />
        <ReferenceLine y={part.onHand} ifOverflow="extendDomain" stroke={c.state.ok} strokeWidth={2} label={{ value: 'on hand', position: 'insideTopLeft', fill: c.ink.soft, fontSize: 11 }} />
        {part.onOrder > 0 && <ReferenceLine y={covered} ifOverflow="extendDomain" stroke={c.state.ok} strokeDasharray="6 4" label={{ value: 'on hand + on order', position: 'insideTopLeft', fill: c.ink.soft, fontSize: 11 }} />}
        {part.runsOutWeek && <ReferenceLine x={part.runsOutWeek} stroke={c.state.stop} strokeWidth={2} label={{ value: 'runs out', position: 'insideTopRight', fill: c.state.stop, fontSize: 11 }} />}
        <Line dataKey="p50" name="Likely" stroke={c.ink.DEFAULT} strokeWidth={2} dot={{ r: 3, fill: c.ink.DEFAULT }} isAnimationActive={false} />
        <Line dataKey="p90" name="Cautious" stroke={c.accent.DEFAULT} strokeWidth={2} strokeDasharray="6 3" dot={{ r: 3, fill: c.accent.DEFAULT }} isAnimationActive={false} />
      </ComposedChart>
    </div>
  );
}
