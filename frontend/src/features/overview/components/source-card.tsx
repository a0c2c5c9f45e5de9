import { lazy, Suspense } from 'react';
import { DateTime } from 'luxon';
import { Link } from 'react-router-dom';
import { GAS_INFO, isGasCode } from '@common/gas/gases';
import { cn } from '@/lib/cn';
import { formatDateTime, formatDay, formatDays, formatNumber, formatRelative } from '@/lib/format';
import { StatusBadge } from '@/components/ui/badge';
import { Icon } from '@/components/ui/icons';
import type { RankedSource } from '../lib/rank-sources';

// the chart library is large: the cards show their figures at once and the lines follow
const TrendSparkline = lazy(() => import('./trend-sparkline').then((m) => ({ default: m.TrendSparkline })));

const TYPE_LABEL: Record<RankedSource['type'], string> = {
  bulk_liquid: 'Bulk liquid tank',
  manifold: 'Cylinder manifold',
  cylinder_store: 'Cylinder store',
  emergency_reserve: 'Emergency reserve',
};
const EDGE: Record<RankedSource['status'], string> = {
  critical: 'border-l-critical',
  reorder: 'border-l-warn',
  watch: 'border-l-watch',
  unknown: 'border-l-line-strong',
  ok: 'border-l-ok',
};

function gasName(code: string): string {
  return isGasCode(code) ? GAS_INFO[code].name : code;
}

function ReorderLine({ s }: { s: RankedSource }) {
  if (s.status === 'unknown') return <span className="text-fg-muted">No reorder date without a forecast</span>;
  if (!s.reorderAt) return <span className="text-fg-muted">No reorder due in the horizon</span>;
  const past = DateTime.fromISO(s.reorderAt) <= DateTime.now();
  return past ? (
    <span className="font-bold text-critical">Reorder date passed ({formatDay(s.reorderAt, s.timeZone)})</span>
  ) : (
    <span>
      Reorder by <strong>{formatDay(s.reorderAt, s.timeZone)}</strong> <span className="text-fg-muted">({formatRelative(s.reorderAt)})</span>
    </span>
  );
}

export function SourceCard({ s, showSite }: { s: RankedSource; showSite: boolean }) {
  const fill = s.contents !== null && s.capacity && s.capacity > 0 ? Math.max(0, Math.min(1, s.contents / s.capacity)) : null;
  return (
    <article
      className={cn('relative flex flex-col gap-3 rounded-card border border-l-[6px] border-line bg-surface p-4 shadow-card', EDGE[s.status])}
      aria-labelledby={`source-${s.siteId}-${s.id}`}
    >
      <header className="flex flex-wrap items-start justify-between gap-2">
        <div className="min-w-0">
          <h3 id={`source-${s.siteId}-${s.id}`} className="text-lg leading-tight">
            <Link to={`/sources/${s.id}`} className="text-primary underline-offset-2 after:absolute after:inset-0 hover:underline">
              {s.name}
            </Link>
          </h3>
          <p className="text-sm text-fg-muted">
            {gasName(s.gasCode)} · {TYPE_LABEL[s.type] ?? s.type}
            {showSite && <> · {s.siteName}</>}
          </p>
        </div>
        <StatusBadge status={s.status} />
      </header>

      <div className="flex items-end justify-between gap-3">
        <div>
          {s.status === 'unknown' ? (
            <>
              <p className="text-xl font-black leading-tight">{s.statusText}</p>
              <p className="text-sm text-fg-muted">no days of stock until it can be forecast</p>
            </>
          ) : s.daysOfStock === null ? (
            <>
              <p className="text-xl font-black leading-tight">Lasts the forecast</p>
              <p className="text-sm text-fg-muted">no run-out in the forecast horizon</p>
            </>
          ) : (
            <>
              <p className="text-3xl font-black tabular leading-none">{formatDays(s.daysOfStock)}</p>
              <p className="text-sm text-fg-muted">of stock{s.emptyAt ? `, empty around ${formatDateTime(s.emptyAt, s.timeZone)}` : ''}</p>
            </>
          )}
        </div>
        <div className="w-28 shrink-0 sm:w-36">
          <Suspense fallback={<div className="h-12 w-full" />}>
            <TrendSparkline trend={s.trend} status={s.status} unit={s.unit} />
          </Suspense>
        </div>
      </div>

      {s.status === 'unknown' ? s.note && <p className="text-sm">{s.note}</p> : <p className="text-sm font-bold">{s.statusText}</p>}

      <dl className="grid gap-1 text-sm">
        <div className="flex gap-2">
          <dt className="sr-only">Reorder</dt>
          <dd>
            <ReorderLine s={s} />
          </dd>
        </div>
        <div className="flex flex-wrap gap-x-2">
          <dt className="text-fg-muted">Holds</dt>
          <dd className="tabular">
            {s.contents === null ? 'no reading yet' : `${formatNumber(s.contents)} ${s.unit}`}
            {fill !== null && (
              <>
                {' '}
                of {formatNumber(s.capacity)} {s.unit} ({formatNumber(fill * 100)} %)
              </>
            )}
          </dd>
        </div>
        {s.leadTimeHours !== null && (
          <div className="flex gap-2">
            <dt className="text-fg-muted">Delivery lead time</dt>
            <dd>{formatNumber(s.leadTimeHours)} h</dd>
          </div>
        )}
      </dl>

      {s.firstRisk && (
        <p className="flex items-start gap-2 rounded-lg bg-surface-sunken px-3 py-2 text-sm">
          <Icon name="alert" className="mt-0.5 size-4 text-warn" />
          <span>
            <span className="font-bold">First risk: </span>
            {s.firstRisk.message}
          </span>
        </p>
      )}
    </article>
  );
}
