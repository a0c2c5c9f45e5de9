import { CartesianGrid, Line, LineChart, ReferenceDot, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { formatNumber } from '@/lib/format';
import { ChartFrame, LegendItem } from '@/components/ui/chart-frame';
import type { ChartPoint } from '../lib/evaluate-cylinder-check';

const REAL = 'var(--color-series-real)';
const IDEAL = 'var(--color-series-ideal)';

/** Free gas against gauge pressure at the cylinder's temperature: real gas and pV = nRT, with the reading marked. */
export function ContentsChart({
  points,
  reading,
  realNow,
  pressureUnit,
  temperatureLabel,
}: {
  points: ChartPoint[];
  reading: number;
  realNow: number;
  pressureUnit: string;
  temperatureLabel: string;
}) {
  if (points.length < 2) return null;
  const last = points[points.length - 1];
  const diff = last.idealL > 0 ? ((last.realL - last.idealL) / last.idealL) * 100 : 0;
  const summary = `At ${formatNumber(last.pressure)} ${pressureUnit} the real gas gives ${formatNumber(last.realL)} L and the ideal-gas law ${formatNumber(last.idealL)} L (${diff >= 0 ? '+' : ''}${formatNumber(diff, 1)} %). The reading of ${formatNumber(reading)} ${pressureUnit} gives ${formatNumber(realNow)} L.`;
  return (
    <ChartFrame
      title="Contents against gauge pressure"
      caption={`Free gas at ${temperatureLabel}. The gap between the lines is what pV = nRT gets wrong.`}
      summary={summary}
      height={260}
      legend={
        <div className="flex flex-wrap gap-4">
          <LegendItem colour={REAL} label="Real gas" />
          <LegendItem colour={IDEAL} label="Ideal gas (pV = nRT)" dashed />
        </div>
      }
    >
      <ResponsiveContainer width="100%" height="100%">
        <LineChart data={points} margin={{ top: 22, right: 12, bottom: 18, left: 4 }}>
          <CartesianGrid stroke="var(--color-sand-200)" strokeDasharray="3 3" />
          <XAxis
            dataKey="pressure"
            type="number"
            domain={[0, 'dataMax']}
            tickFormatter={(v: number) => formatNumber(v)}
            tick={{ fontSize: 12, fill: 'var(--color-fg-muted)' }}
            label={{ value: `gauge, ${pressureUnit}`, position: 'insideBottom', offset: -10, fontSize: 12, fill: 'var(--color-fg-muted)' }}
          />
          <YAxis
            tickFormatter={(v: number) => formatNumber(v)}
            tick={{ fontSize: 12, fill: 'var(--color-fg-muted)' }}
            width={52}
            label={{ value: 'L', position: 'insideTopLeft', offset: 0, fontSize: 12, fill: 'var(--color-fg-muted)' }}
          />
          <Tooltip
            formatter={(value, name) => [`${formatNumber(Number(value))} L`, name === 'realL' ? 'Real gas' : 'Ideal gas']}
            labelFormatter={(label) => `${formatNumber(Number(label))} ${pressureUnit}`}
          />
          <ReferenceLine
            x={reading}
            stroke="var(--color-fg)"
            strokeDasharray="2 3"
            label={{ value: 'reading', position: 'top', fontSize: 12, fill: 'var(--color-fg)' }}
          />
          <Line type="monotone" dataKey="idealL" stroke={IDEAL} strokeWidth={2} strokeDasharray="6 4" dot={false} isAnimationActive={false} />
          <Line type="monotone" dataKey="realL" stroke={REAL} strokeWidth={3} dot={false} isAnimationActive={false} />
          <ReferenceDot x={reading} y={realNow} r={6} fill={REAL} stroke="white" strokeWidth={2} />
        </LineChart>
      </ResponsiveContainer>
    </ChartFrame>
  );
}
