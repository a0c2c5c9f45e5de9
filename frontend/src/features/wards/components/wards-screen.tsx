import { useQuery } from '@tanstack/react-query';
import { wardLeadOnly, type Role } from '@common/api/roles';
import { Card } from '@/components/ui/card';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { wardsQueries } from '../api/wards-api';
import { DeviceFlowsPanel } from './device-flows-panel';
import { ScenariosPanel } from './scenarios-panel';
import { WardsAdmin } from './wards-admin';

function SiteScenarios({ siteId, timeZone, canEdit, onSaved }: { siteId: number; timeZone: string; canEdit: boolean; onSaved?: () => void }) {
  const scenarios = useQuery(wardsQueries.scenarios(siteId));
  const wards = useQuery(wardsQueries.site(siteId));
  if (scenarios.isPending)
    return (
      <Card>
        <LoadingState label="Loading scenarios…" />
      </Card>
    );
  if (scenarios.isError)
    return (
      <Card>
        <ErrorState error={scenarios.error} onRetry={() => scenarios.refetch()} />
      </Card>
    );
  return <ScenariosPanel siteId={siteId} timeZone={timeZone} scenarios={scenarios.data} wards={wards.data ?? []} canEdit={canEdit} onSaved={onSaved} />;
}

/** The wards of a site, the scenarios of its forecasts and the organisation's device flows. */
export function WardsScreen({
  siteId,
  timeZone,
  roles,
  onSupplyChanged,
}: {
  siteId: number;
  timeZone: string;
  roles: readonly Role[];
  onSupplyChanged?: () => void;
}) {
  const fm = roles.includes('facilities_manager');
  return (
    <div className="flex flex-col gap-5">
      <PanelBoundary title="Wards">
        <WardsAdmin siteId={siteId} canEdit={fm} onSaved={onSupplyChanged} grantedOnly={wardLeadOnly(roles)} />
      </PanelBoundary>
      <div className="grid items-start gap-5 xl:grid-cols-2">
        <PanelBoundary title="Scenarios">
          <SiteScenarios siteId={siteId} timeZone={timeZone} canEdit={fm} onSaved={onSupplyChanged} />
        </PanelBoundary>
        <PanelBoundary title="Device flows">
          <DeviceFlowsPanel canEdit={fm || roles.includes('administrator')} onSaved={onSupplyChanged} />
        </PanelBoundary>
      </div>
    </div>
  );
}
