import { CartesianGrid, ComposedChart, Line, ReferenceArea, ReferenceLine, ResponsiveContainer, XAxis, YAxis } from 'recharts';
import theme from '../../../../tailwind.config';
import type { ValveTrendView } from '../../../../shared/schemas/valves';
import { fmtMm } from '../clearance-format';
import { projection } from '../trend-line';

// Colours come from the design tokens, so the chart matches the rest of the screen.
const c = theme.theme.extend.colors;

interface Row {
  km: number;
  asFound?: number;
  asLeft?: number;
  trend?: number;
}

function rows(v: ValveTrendView): Row[] {
  const out: Row[] = v.points.map((p) => ({ km: p.odometerKm, asFound: p.asFoundMm, asLeft: p.asLeftMm ?? undefined }));
  const p = projection(v);
  if (p) {
    out[out.length - 1] = { ...out[out.length - 1], trend: p.fromMm };
    out.push({ km: p.toKm, trend: p.toMm });
  }
  return out;
}

const kmTick = (km: number) => `${Math.round(km / 1000)}k`;

/** One valve: as found and as left against km, the spec band, and the trend to the next check. */
export function ValveTrendChart({ valve }: { valve: ValveTrendView }) {
  const data = rows(valve);
  const values = data.flatMap((r) => [r.asFound, r.asLeft, r.trend]).filter((n): n is number => n !== undefined);
  // Round ticks every 0.05 mm, a little beyond the spec band and every point.
  const step = 0.05;
  const lo = Math.max(0, Math.floor((Math.min(valve.specMinMm, ...values) - 0.01) / step) * step);
  const hi = Math.ceil((Math.max(valve.specMaxMm, ...values) + 0.01) / step) * step;
  const ticks = Array.from({ length: Math.round((hi - lo) / step) + 1 }, (_, i) => lo + i * step);
  return (
    <div role="img" aria-label={`Chart of ${valve.label} clearance against km; the table below has the same numbers.`} className="h-48 w-full">
      <ResponsiveContainer width="100%" height="100%" initialDimension={{ width: 320, height: 192 }}>
        <ComposedChart data={data} margin={{ top: 8, right: 12, bottom: 4, left: 0 }}>
          <CartesianGrid stroke={c.ink.line} strokeDasharray="2 4" />
          <ReferenceArea y1={valve.specMinMm} y2={valve.specMaxMm} fill={c.state['ok-soft']} fillOpacity={0.9} stroke={c.state.ok} strokeOpacity={0.5} />
          {valve.nextCheckKm != null && <ReferenceLine x={valve.nextCheckKm} stroke={c.ink.muted} strokeDasharray="4 3" label={{ value: 'next check', position: 'insideTopRight', fill: c.ink.soft, fontSize: 11 }} />}
          <XAxis dataKey='km' type="number" domain={['dataMin', 'dataMax']} tickFormatter={kmTick} stroke={c.ink.soft} fontSize={12} label={{ value: 'km', position: 'insideBottomRight', offset: -2, fill: c.ink.soft, fontSize: 11 }} height={36} />
          <YAxis type="number" domain={[lo, hi]} ticks={ticks} tickFormatter={(v: number) => fmtMm(v)} stroke={c.ink.soft} fontSize={12} width={44} />
          <Line dataKey="asFound" name="As found" stroke={c.ink.DEFAULT} strokeWidth={2} dot={{ r: 4, fill: c.ink.DEFAULT }} connectNulls isAnimationActive={false} />
          <Line dataKey="asLeft" name="As left" stroke="none" dot={{ r: 5, fill: c.paper.raised, stroke: c.accent.DEFAULT, strokeWidth: 2 }} isAnimationActive={false} />
          <Line dataKey="trend" name="Trend" stroke={c.state.stop} strokeWidth={2} strokeDasharray="6 4" dot={false} connectNulls isAnimationActive={false} />
        </ComposedChart>
      </ResponsiveContainer>
    </div>
  );
}
