import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { isApiError } from '@/lib/api-client';
import { Link } from 'react-router-dom';
import type { Role } from '@common/api/roles';
import { formatNumber } from '@/lib/format';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Dialog } from '@/components/ui/dialog';
import { Icon } from '@/components/ui/icons';
import { PageHeader } from '@/components/ui/page-header';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { wardsQueries, type SourceOption } from '../api/wards-api';
import { DEPARTMENT_LABEL } from '../lib/ward-labels';
import { DemandCheck } from './demand-check';
import { FeedsEditor } from './feeds-editor';
import { ScenariosPanel } from './scenarios-panel';
import { TherapyEditor } from './therapy-editor';
import { WardForm } from './ward-form';

/**
 * One ward: its therapy lines (the modelled demand), the sources that feed it, modelled against
 * measured use with the correction a facilities manager may accept, and the scenarios that touch it.
 */
export function WardDetailScreen({
  id,
  roles,
  sources,
  onSupplyChanged,
}: {
  id: number;
  roles: readonly Role[];
  sources: SourceOption[];
  onSupplyChanged?: () => void;
}) {
  const q = useQuery(wardsQueries.detail(id));
  const flows = useQuery(wardsQueries.deviceFlows());
  const siteId = q.data?.ward.siteId;
  const wards = useQuery({ ...wardsQueries.site(siteId ?? 0), enabled: siteId !== undefined });
  const [editing, setEditing] = useState(false);
  if (q.isPending) return <LoadingState label="Loading the ward…" />;
  if (q.isError) {
    return (
      <Card>
        <ErrorState
          error={q.error}
          title="This ward could not be loaded"
          onRetry={isApiError(q.error) && q.error.status === 404 ? undefined : () => q.refetch()}
        />
      </Card>
    );
  }
  const detail = q.data;
  const { ward, site } = detail;
  const fm = roles.includes('facilities_manager');
  const canTherapy = fm || roles.includes('ward_lead');

  // a ward lead comes here for the therapy lines: they lead the page for them
  const therapyPanel = (
    <PanelBoundary title="Therapy lines">
      {flows.isPending ? (
        <Card>
          <LoadingState label="Loading device flows…" />
        </Card>
      ) : (
        <TherapyEditor detail={detail} deviceFlows={flows.data ?? []} canEdit={canTherapy} onSaved={onSupplyChanged} />
      )}
    </PanelBoundary>
  );

  return (
    <div className="flex flex-col gap-5">
      <nav aria-label="Breadcrumb" className="-mb-3 text-sm">
        <Link to={`/sites/${site.id}/wards`} className="text-primary underline-offset-2 hover:underline">
          Wards of {site.name}
        </Link>
      </nav>
      <PageHeader
        className="mb-0"
        title={ward.name}
        description={`${DEPARTMENT_LABEL[ward.department] ?? ward.department} · ${formatNumber(ward.beds)} beds · leakage allowance ${formatNumber(ward.leakagePercent, 1)} %`}
        actions={
          fm && (
            <Button variant="secondary" onClick={() => setEditing(true)}>
              <Icon name="pencil" />
              Edit ward
            </Button>
          )
        }
      />
      {!ward.active && (
        <p>
          <Badge tone="neutral">Closed: its therapy lines do not count in the forecast</Badge>
        </p>
      )}

      {!fm && canTherapy && therapyPanel}
      <div className="grid items-start gap-5 xl:grid-cols-2">
        <DemandCheck detail={detail} sources={sources} canAccept={fm} onSaved={onSupplyChanged} />
        <FeedsEditor detail={detail} sources={sources} canEdit={fm} onSaved={onSupplyChanged} />
      </div>
      {(fm || !canTherapy) && therapyPanel}
      <ScenariosPanel
        siteId={site.id}
        timeZone={site.timeZone}
        scenarios={detail.scenarios}
        wards={wards.data ?? [ward]}
        canEdit={fm}
        defaultWardId={ward.id}
        description="Site-wide scenarios and those of this ward."
        onSaved={onSupplyChanged}
      />
      <Dialog open={editing} onClose={() => setEditing(false)} title={`Edit ${ward.name}`}>
        {editing && <WardForm siteId={site.id} initial={ward} onDone={() => setEditing(false)} onSaved={onSupplyChanged} />}
      </Dialog>
    </div>
  );
}
