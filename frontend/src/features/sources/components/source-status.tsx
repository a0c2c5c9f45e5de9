import { DateTime } from 'luxon';
import { cn } from '@/lib/cn';
import { formatDateTime, formatDays, formatKg, formatLitres, formatNumber, formatRelative } from '@/lib/format';
import { SOURCE_STATUS } from '@common/forecast/status';
import { StatusBadge } from '@/components/ui/badge';
import { Card } from '@/components/ui/card';
import { Icon } from '@/components/ui/icons';
import type { SourceDetail } from '../api/sources-api';

const EDGE: Record<SourceDetail['outlook']['status'], string> = {
  critical: 'border-l-critical',
  reorder: 'border-l-warn',
  watch: 'border-l-watch',
  ok: 'border-l-ok',
  unknown: 'border-l-line-strong',
};

function Figure({ label, children, sub, className }: { label: string; children: React.ReactNode; sub?: React.ReactNode; className?: string }) {
  return (
    <div className={cn('min-w-0', className)}>
      <dt className="text-sm text-fg-muted">{label}</dt>
      <dd className="text-lg font-bold tabular">{children}</dd>
      {sub && <dd className="text-sm text-fg-muted">{sub}</dd>}
    </div>
  );
}

/** Status in words and colour, and the figures a facilities manager acts on. */
export function SourceStatus({ detail }: { detail: SourceDetail }) {
  const { outlook, site, source, method } = detail;
  const tz = site.timeZone;
  const contents = outlook.contents;
  const fmt = (v: number | null) => (outlook.unit === 'kg' ? formatKg(v) : formatLitres(v));
  const reorderPast = outlook.reorderAt ? DateTime.fromISO(outlook.reorderAt) <= DateTime.now() : false;
  const fill = outlook.capacity && contents !== null ? contents / outlook.capacity : null;
  const ownLeadTime = source.leadTimeHours !== null;
  return (
    <Card className={cn('border-l-[6px]', Object.hasOwn(EDGE, outlook.status) ? EDGE[outlook.status] : EDGE.unknown)} aria-labelledby="source-status">
      <div className="flex flex-col gap-4 px-4 py-4 sm:px-5">
        <div className="flex flex-wrap items-center gap-3">
          <h2 id="source-status" className="sr-only">
            Status
          </h2>
          <StatusBadge status={outlook.status} />
          {SOURCE_STATUS[outlook.status]?.label !== outlook.statusText && <p className="font-bold">{outlook.statusText}</p>}
        </div>
        {outlook.note && (
          <p className="flex items-start gap-2 rounded-lg bg-surface-sunken px-3 py-2 text-sm">
            <Icon name="info" className="mt-0.5 size-4 text-info" />
            {outlook.note}
          </p>
        )}
        <dl className="grid grid-cols-2 gap-x-6 gap-y-4 md:grid-cols-3 xl:grid-cols-6">
          <div className="col-span-2 md:col-span-1">
            <dt className="text-sm text-fg-muted">Days of stock</dt>
            {outlook.daysOfStock !== null ? (
              <dd className="text-3xl leading-tight font-black tabular">{formatDays(outlook.daysOfStock)}</dd>
            ) : outlook.note ? (
              <dd className="text-3xl leading-tight font-black">–</dd>
            ) : (
              <>
                <dd className="text-xl leading-tight font-black">Lasts the forecast</dd>
                <dd className="text-sm text-fg-muted">{detail.method.basis.modelledLPerDay > 0 ? 'no run-out in the horizon' : 'no demand drawn from it'}</dd>
              </>
            )}
          </div>
          <Figure label="Holds now" sub={fill !== null ? `${formatNumber(fill * 100)} % of ${fmt(outlook.capacity)}` : undefined}>
            {fmt(contents)}
          </Figure>
          <Figure label="Empty around" sub={outlook.emptyAt ? formatRelative(outlook.emptyAt) : undefined}>
            {outlook.emptyAt ? formatDateTime(outlook.emptyAt, tz) : outlook.note ? '–' : 'Not in the forecast'}
          </Figure>
          <Figure
            label="Reorder by"
            sub={outlook.reorderAt ? (reorderPast ? 'the date has passed' : formatRelative(outlook.reorderAt)) : undefined}
            className={reorderPast ? '[&_dd]:text-critical' : undefined}
          >
            {outlook.reorderAt ? formatDateTime(outlook.reorderAt, tz) : 'No reorder due'}
          </Figure>
          <Figure
            label="Delivery lead time"
            sub={ownLeadTime ? 'set on this source' : source.supplierName ? `from ${source.supplierName}` : 'default: no supplier set'}
          >
            {formatNumber(method.leadTimeHours)} h
          </Figure>
          <Figure label="Supplier">{source.supplierName ?? 'None set'}</Figure>
        </dl>
        {outlook.firstRisk && (
          <p className="flex items-start gap-2 rounded-lg bg-warn-soft px-3 py-2 text-sm">
            <Icon name="alert" className="mt-0.5 size-4 text-warn" />
            <span>
              <span className="font-bold">First risk{outlook.firstRisk.at ? ` (${formatDateTime(outlook.firstRisk.at, tz)})` : ''}: </span>
              {outlook.firstRisk.message}
            </span>
          </p>
        )}
      </div>
    </Card>
  );
}
