import { useMemo, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { ApiError } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { formatDateTime, formatRelative } from '@/lib/format';
import { SOURCE_STATUS, SOURCE_STATUSES, type SourceStatus } from '@common/forecast/status';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Select } from '@/components/ui/field';
import { Icon } from '@/components/ui/icons';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { overviewQueries } from '../api/overview-api';
import { countByStatus, rankSources } from '../lib/rank-sources';
import { SourceCard } from './source-card';

const TILE: Record<SourceStatus, string> = {
  critical: 'bg-critical-soft text-critical border-critical/40',
  reorder: 'bg-warn-soft text-warn border-warn/40',
  watch: 'bg-watch-soft text-watch border-watch/40',
  unknown: 'bg-surface-sunken text-fg border-line-strong',
  ok: 'bg-ok-soft text-ok border-ok/40',
};

/** Every supply source, worst first: days of stock, reorder date, first risk and the 14-day trend. */
export function OverviewBoard() {
  const overview = useQuery(overviewQueries.summary());
  const [siteId, setSiteId] = useState<number | 'all'>('all');
  const ranked = useMemo(() => (overview.data ? rankSources(overview.data) : []), [overview.data]);

  if (overview.isPending)
    return (
      <Card>
        <LoadingState label="Loading the supply overview…" />
      </Card>
    );
  if (overview.isError) {
    const notReady = overview.error instanceof ApiError && (overview.error.status === 404 || overview.error.status === 501);
    return (
      <Card>
        {notReady ? (
          <EmptyState
            title="The supply overview is not available yet"
            icon="clock"
            action={
              <Button variant="secondary" onClick={() => overview.refetch()} busy={overview.isFetching}>
                <Icon name="refresh" />
                Try again
              </Button>
            }
          >
            The forecast service has not answered. Days of stock and reorder dates appear here once it runs.
          </EmptyState>
        ) : (
          <ErrorState error={overview.error} title="The supply overview could not be loaded" onRetry={() => overview.refetch()} />
        )}
      </Card>
    );
  }

  const sites = overview.data.sites;
  const shown = siteId === 'all' ? ranked : ranked.filter((s) => s.siteId === siteId);
  const counts = countByStatus(shown);
  // sources without a forecast get their own tile only while there are any
  const tiles = SOURCE_STATUSES.filter((st) => st !== 'unknown' || counts.unknown > 0);
  if (ranked.length === 0) {
    return (
      <Card>
        <EmptyState title="No supply sources yet" icon="cylinder">
          Once the bulk tanks, manifolds and cylinder stores of your sites are set up, each appears here with its days of stock.
        </EmptyState>
      </Card>
    );
  }

  return (
    <section aria-labelledby="overview-sources" className="flex flex-col gap-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 id="overview-sources" className="text-xl">
            Supply sources
          </h2>
          <p className="text-sm text-fg-muted">
            Worst first. Forecast made {formatRelative(overview.data.generatedAt)} ({formatDateTime(overview.data.generatedAt)}).
          </p>
        </div>
        {sites.length > 1 && (
          <Select
            aria-label="Show sources of"
            value={String(siteId)}
            onChange={(e) => setSiteId(e.target.value === 'all' ? 'all' : Number(e.target.value))}
            className="w-full sm:w-64"
          >
            <option value="all">All my sites</option>
            {sites.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </Select>
        )}
      </div>

      <p className="flex items-start gap-2 text-sm text-fg-muted">
        <Icon name="info" className="mt-0.5 size-4 shrink-0" />
        {overview.data.caution ??
          'Planning estimate only: check against the site’s own records and the supplier’s figures; the site’s authorised person decides.'}
      </p>

      <ul className={cn('grid grid-cols-2 gap-2', tiles.length > 4 ? 'sm:grid-cols-5' : 'sm:grid-cols-4')} aria-label="Sources by status">
        {tiles.map((st) => (
          <li
            key={st}
            className={cn(
              'flex items-center justify-between gap-2 rounded-lg border px-3 py-2',
              counts[st] === 0 ? 'border-line bg-surface-sunken text-fg-muted' : TILE[st],
            )}
          >
            <span className="font-bold">{SOURCE_STATUS[st].label}</span>
            <span className="text-2xl font-black tabular">{counts[st]}</span>
          </li>
        ))}
      </ul>

      {shown.length === 0 ? (
        <Card>
          <EmptyState title="This site has no supply sources yet" />
        </Card>
      ) : (
        <ul className="grid gap-3 md:grid-cols-2 2xl:grid-cols-3">
          {shown.map((s) => (
            <li key={`${s.siteId}-${s.id}`}>
              <SourceCard s={s} showSite={sites.length > 1 && siteId === 'all'} />
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
