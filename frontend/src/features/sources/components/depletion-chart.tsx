import { useMemo } from 'react';
import { Area, CartesianGrid, ComposedChart, ReferenceArea, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { formatDateTime, formatNumber } from '@/lib/format';
import { ChartFrame, LegendItem } from '@/components/ui/chart-frame';
import type { SourceDetail } from '../api/sources-api';
import { niceAxis, thinSeries } from '../lib/chart-data';
import { dayTicks, formatTick } from '../lib/site-time';
import { chartPoints, chartSeriesEnd } from '@common/forecast/chart-series';

const COLOURS = {
  contents: 'var(--color-series-real)',
  reorder: 'var(--color-warn)',
  placed: 'var(--color-watch)',
  arrives: 'var(--color-ok)',
  delivery: 'var(--color-info)',
  band: 'var(--color-critical)',
};

function ms(iso: string | null | undefined): number | null {
  if (!iso) return null;
  const t = Date.parse(iso);
  return Number.isFinite(t) ? t : null;
}

/** The band of the empty time in words, for the caption and for screen readers. */
export function describeBand(band: SourceDetail['band'], timeZone: string, horizonEndIso: string | undefined): string {
  if (!band) return 'No spread of the empty time: the forecast ran without demand draws.';
  const n = formatNumber(band.draws);
  if (band.drawsOutlastingHorizon === band.draws) return `All ${n} demand draws last beyond the end of the forecast: no empty time to show.`;
  const p10 = band.p10 ? formatDateTime(band.p10, timeZone) : null;
  const p90 = band.p90 ? formatDateTime(band.p90, timeZone) : `beyond the forecast (${formatDateTime(horizonEndIso, timeZone)})`;
  return `10–90 % range of the empty time over ${n} demand draws: ${p10 ?? 'before the first hour'} to ${p90}.`;
}

/**
 * Contents against time from now: the reorder level, the orders the rule would place (placed and
 * arriving), the scheduled deliveries, and the 10–90 % range of the empty time as a shaded span.
 */
export function DepletionChart({ detail, height = 300 }: { detail: SourceDetail; height?: number }) {
  const { series, band, reorderLevel, orders, deliveries, site, outlook } = detail;
  const tz = site.timeZone;
  const unit = outlook.unit;
  const data = useMemo(() => thinSeries(chartPoints(series)), [series]);
  if (data.length < 2) return null;
  const start = data[0].t;
  const end = data[data.length - 1].t;
  const ticks = dayTicks(start, end, 7, tz);
  const inRange = (t: number | null): t is number => t !== null && t >= start && t <= end;

  const bandFrom = band && band.drawsOutlastingHorizon < band.draws ? (ms(band.p10) ?? start) : null;
  const bandTo = bandFrom !== null ? (ms(band?.p90) ?? end) : null;
  const placed = orders.map((o) => ms(o.placedAt)).filter(inRange);
  const arrives = orders.map((o) => ms(o.arrivesAt)).filter(inRange);
  const dues = deliveries.map((d) => ms(d.dueAt)).filter(inRange);
  const max = Math.max(...data.map((p) => p.contents), reorderLevel ?? 0, outlook.capacity ?? 0);
  const axis = niceAxis(max);
  const low = data.reduce((a, b) => (b.contents < a.contents ? b : a));

  const summary = [
    `Projected contents from ${formatDateTime(new Date(start).toISOString(), tz)} to ${formatDateTime(new Date(end).toISOString(), tz)}:`,
    `now ${formatNumber(data[0].contents)} ${unit}, lowest ${formatNumber(low.contents)} ${unit} on ${formatDateTime(new Date(low.t).toISOString(), tz)}.`,
    reorderLevel !== null ? `Reorder level ${formatNumber(reorderLevel)} ${unit}.` : 'No reorder level.',
    `${orders.length} order${orders.length === 1 ? '' : 's'} placed by the reorder rule, ${deliveries.length} scheduled deliver${deliveries.length === 1 ? 'y' : 'ies'}.`,
    describeBand(band, tz, chartSeriesEnd(series) ?? undefined),
  ].join(' ');

  return (
    <ChartFrame
      title={`Contents, ${unit === 'kg' ? 'kg of liquid' : 'litres of free gas'}`}
      caption={describeBand(band, tz, chartSeriesEnd(series) ?? undefined)}
      summary={summary}
      height={height}
      legend={
        <div className="flex flex-wrap gap-x-4 gap-y-1">
          <LegendItem colour={COLOURS.contents} label="Contents" />
          {reorderLevel !== null && <LegendItem colour={COLOURS.reorder} label="Reorder level" dashed />}
          {placed.length > 0 && <LegendItem colour={COLOURS.placed} label="Order placed" dashed />}
          {arrives.length > 0 && <LegendItem colour={COLOURS.arrives} label="Order arrives" dashed />}
          {dues.length > 0 && <LegendItem colour={COLOURS.delivery} label="Scheduled delivery" />}
          {bandFrom !== null && (
            <span className="inline-flex items-center gap-2 text-sm">
              <span className="inline-block h-3 w-7 rounded-sm border border-critical/40 bg-critical/15" aria-hidden="true" />
              Empty time, 10–90 %
            </span>
          )}
        </div>
      }
    >
      <ResponsiveContainer width="100%" height="100%">
        <ComposedChart data={data} margin={{ top: 10, right: 12, bottom: 0, left: 4 }} accessibilityLayer={false}>
          <CartesianGrid stroke="var(--color-line)" strokeDasharray="2 4" vertical={false} />
          <XAxis
            dataKey="t"
            type="number"
            scale="time"
            domain={[start, end]}
            ticks={ticks}
            tickFormatter={(t: number) => formatTick(t, tz)}
            tick={{ fontSize: 12, fill: 'var(--color-fg-muted)' }}
            minTickGap={16}
          />
          <YAxis
            domain={[0, axis.top]}
            ticks={axis.ticks}
            tickFormatter={(v: number) => formatNumber(v)}
            width={unit === 'L' ? 76 : 56}
            tick={{ fontSize: 12, fill: 'var(--color-fg-muted)' }}
          />
          {bandFrom !== null && bandTo !== null && (
            <ReferenceArea
              x1={bandFrom}
              x2={Math.max(bandTo, bandFrom + 3_600_000)}
              fill={COLOURS.band}
              fillOpacity={0.12}
              stroke={COLOURS.band}
              strokeOpacity={0.3}
              ifOverflow="extendDomain"
            />
          )}
          <Area
            type="linear"
            dataKey="contents"
            stroke={COLOURS.contents}
            strokeWidth={2}
            fill={COLOURS.contents}
            fillOpacity={0.12}
            isAnimationActive={false}
            dot={false}
            activeDot={{ r: 4 }}
          />
          {reorderLevel !== null && <ReferenceLine y={reorderLevel} stroke={COLOURS.reorder} strokeWidth={2} strokeDasharray="6 4" ifOverflow="extendDomain" />}
          {placed.map((t, i) => (
            <ReferenceLine key={`p${i}`} x={t} stroke={COLOURS.placed} strokeDasharray="3 3" strokeOpacity={0.8} />
          ))}
          {arrives.map((t, i) => (
            <ReferenceLine key={`a${i}`} x={t} stroke={COLOURS.arrives} strokeDasharray="3 3" strokeOpacity={0.8} />
          ))}
          {dues.map((t, i) => (
            <ReferenceLine key={`d${i}`} x={t} stroke={COLOURS.delivery} strokeWidth={2} />
          ))}
          <Tooltip
            isAnimationActive={false}
            labelFormatter={(t) => formatDateTime(new Date(Number(t)).toISOString(), tz)}
            formatter={(v) => [`${formatNumber(Number(v))} ${unit}`, 'Contents']}
            contentStyle={{ borderRadius: 8, borderColor: 'var(--color-line)', fontSize: 14 }}
          />
        </ComposedChart>
      </ResponsiveContainer>
    </ChartFrame>
  );
}
