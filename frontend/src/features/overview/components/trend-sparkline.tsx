import { Line, LineChart, ResponsiveContainer, YAxis } from 'recharts';
import { formatNumber } from '@/lib/format';
import type { SourceStatus } from '../api/overview-api';

const COLOUR: Record<SourceStatus, string> = {
  ok: 'var(--color-ok)',
  watch: 'var(--color-watch)',
  reorder: 'var(--color-warn)',
  critical: 'var(--color-critical)',
  unknown: 'var(--color-line-strong)',
};

/** The next 14 days of contents as a small line; its text alternative says where it starts and ends. */
export function TrendSparkline({ trend, status, unit }: { trend: number[]; status: SourceStatus; unit: string }) {
  const points = trend.filter((v) => Number.isFinite(v));
  if (points.length < 2) return <p className="text-xs text-fg-muted">No 14-day projection yet.</p>;
  const data = points.map((v, day) => ({ day, v }));
  const summary = `Projected contents over the next ${points.length} days: from ${formatNumber(points[0])} ${unit} to ${formatNumber(points[points.length - 1])} ${unit}.`;
  return (
    <div role="img" aria-label={summary} className="h-12 w-full">
      <ResponsiveContainer width="100%" height="100%">
        <LineChart data={data} margin={{ top: 4, right: 2, bottom: 4, left: 2 }} accessibilityLayer={false}>
          <YAxis hide domain={[0, 'dataMax']} />
          <Line type="monotone" dataKey="v" stroke={COLOUR[status]} strokeWidth={2.5} dot={false} isAnimationActive={false} />
        </LineChart>
      </ResponsiveContainer>
    </div>
  );
}
