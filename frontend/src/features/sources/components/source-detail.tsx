import { useQuery } from '@tanstack/react-query';
import { isApiError } from '@/lib/api-client';
import { Link } from 'react-router-dom';
import type { Role } from '@common/api/roles';
import { Button, ButtonLink, buttonClasses } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Icon } from '@/components/ui/icons';
import { PageHeader } from '@/components/ui/page-header';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { forecastCsvUrl, sourcesQueries } from '../api/sources-api';
import { gasName, SOURCE_TYPE_LABEL } from '../lib/source-labels';
import { DeliveriesCard } from './deliveries-card';
import { ForecastCard } from './forecast-card';
import { MethodPanel } from './method-panel';
import { ReadingForm } from './reading-form';
import { ReadingsCard } from './readings-card';
import { SourceStatus } from './source-status';
import { WardsFedCard } from './wards-fed-card';

const READING_ROLES: Role[] = ['facilities_manager', 'ward_lead'];
const DELIVERY_ROLES: Role[] = ['facilities_manager', 'purchasing_officer'];

/**
 * One supply source: status and dates, the forecast with its scenario, readings (and a form to enter
 * one), deliveries, the wards it feeds and how the figures were made.
 */
export function SourceDetailScreen({
  id,
  scenarioId,
  onScenarioChange,
  roles,
  meId,
  onSupplyChanged,
}: {
  id: number;
  scenarioId: number | null;
  onScenarioChange: (id: number | null) => void;
  roles: readonly Role[];
  meId: number;
  onSupplyChanged?: () => void;
}) {
  const q = useQuery(sourcesQueries.detail(id, scenarioId));
  if (q.isPending) return <LoadingState label="Working out the forecast…" />;
  if (q.isError) {
    return (
      <Card>
        <ErrorState
          error={q.error}
          title="This source could not be loaded"
          onRetry={isApiError(q.error) && q.error.status === 404 ? undefined : () => q.refetch()}
        />
      </Card>
    );
  }
  const detail = q.data;
  const { source, site } = detail;
  const can = (allowed: Role[]) => roles.some((r) => allowed.includes(r));
  // on a phone the form is far below the chart: take the person there and into the first field
  const goToReadingForm = () => {
    const card = document.getElementById('enter-reading');
    card?.scrollIntoView({ behavior: 'smooth', block: 'start' });
    card?.querySelector<HTMLElement>('input:not([type=radio]), select')?.focus({ preventScroll: true });
  };
  const updating = q.isPlaceholderData || (q.isFetching && detail.scenarioId !== scenarioId);

  return (
    <div className="flex flex-col gap-5">
      <nav aria-label="Breadcrumb" className="-mb-3 text-sm">
        <Link to="/" className="text-primary underline underline-offset-2">
          Today
        </Link>
        <span className="px-1 text-fg-muted">/</span>
        <span className="text-fg-muted">{site.name}</span>
      </nav>
      <PageHeader
        className="mb-0"
        title={source.name}
        description={`${gasName(source.gasCode)} · ${SOURCE_TYPE_LABEL[source.type] ?? source.type}${source.cylinderTypeName ? ` · ${source.cylinderTypeName} cylinders` : ''}${source.type === 'bulk_liquid' && source.capacityKg ? ` · ${source.capacityKg.toLocaleString('en-GB')} kg tank` : ''}`}
        actions={
          <>
            {can(READING_ROLES) && (
              <Button onClick={goToReadingForm}>
                <Icon name="pencil" />
                Enter a reading
              </Button>
            )}
            <a href={forecastCsvUrl(id, scenarioId)} download className={buttonClasses({ variant: 'secondary' })}>
              <Icon name="download" />
              Export CSV
            </a>
            {can(['facilities_manager']) && (
              <ButtonLink variant="secondary" to={`/sites/${source.siteId}/sources?edit=${source.id}`}>
                <Icon name="pencil" />
                Settings
              </ButtonLink>
            )}
          </>
        }
      />

      <SourceStatus detail={detail} />
      <ForecastCard detail={detail} onScenarioChange={onScenarioChange} updating={updating} />

      <div className="grid gap-5 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="flex min-w-0 flex-col gap-5">
          {can(READING_ROLES) && (
            <Card id="enter-reading" className="scroll-mt-20">
              <CardHeader
                title="Enter a reading"
                description={
                  source.type === 'bulk_liquid'
                    ? 'From the tank’s contents gauge or telemetry.'
                    : source.type === 'manifold'
                      ? 'Both bank gauges and the spare full cylinders.'
                      : 'After the store round: full, in use and empty.'
                }
              />
              <CardBody>
                <PanelBoundary bare title="The reading form">
                  <ReadingForm key={source.id} detail={detail} onSaved={onSupplyChanged} />
                </PanelBoundary>
              </CardBody>
            </Card>
          )}
          <ReadingsCard detail={detail} meId={meId} />
        </div>
        <div className="flex min-w-0 flex-col gap-5">
          <DeliveriesCard detail={detail} canSchedule={can(DELIVERY_ROLES)} onSaved={onSupplyChanged} />
          <WardsFedCard detail={detail} />
        </div>
      </div>
      <MethodPanel detail={detail} />
    </div>
  );
}
