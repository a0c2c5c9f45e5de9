import { useMemo, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { useSearchParams } from 'react-router-dom';
import type { GasOut } from '@common/schemas/capacity.schema';
import { cn } from '@/lib/cn';
import { formatNumber } from '@/lib/format';
import { Alert } from '@/components/ui/alert';
import { Button, ButtonLink } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Dialog } from '@/components/ui/dialog';
import { Icon } from '@/components/ui/icons';
import { PageHeader } from '@/components/ui/page-header';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { capacityQueries, type CapacityWhatIf } from '../api/capacity-api';
import { formatFlow, formatPercent, gasLabel, utilisationTone } from '../lib/capacity-format';
import { GasSection } from './gas-section';
import { PipeRunsEditor } from './pipe-runs-editor';
import { PrintableReport } from './printable-report';
import { SignoffPanel } from './signoff-panel';
import { WhatIfForm } from './what-if-form';
import { ZoneForm } from './zone-form';

/** Reads the what-if inputs from the page address, so a check can be linked and printed as seen. */
export function whatIfFromSearch(search: URLSearchParams): CapacityWhatIf {
  const num = (k: string) => {
    const v = search.get(k);
    const n = v === null || v === '' ? Number.NaN : Number(v);
    return Number.isFinite(n) && n > 0 ? n : undefined;
  };
  const out: CapacityWhatIf = {};
  const flow = num('flow');
  const derating = num('derating');
  const hours = num('hours');
  if (flow !== undefined) out.flowPerPatientLMin = flow;
  if (derating !== undefined && derating <= 1) out.vaporiserDerating = derating;
  if (hours !== undefined && hours <= 24) out.peakHoursPerDay = hours;
  return out;
}

export function CapacityScreen({
  siteId,
  siteName,
  timeZone,
  canEdit,
  engineerName,
}: {
  siteId: number;
  siteName: string;
  timeZone: string;
  canEdit: boolean;
  engineerName: string;
}) {
  const [search, setSearch] = useSearchParams();
  const whatIf = useMemo(() => whatIfFromSearch(search), [search]);
  const report = useQuery(capacityQueries.report(siteId, whatIf));
  const zones = useQuery({ ...capacityQueries.zones(siteId), enabled: canEdit });
  const ruleSets = useQuery({ ...capacityQueries.ruleSets(), enabled: canEdit });
  const [zoneDialog, setZoneDialog] = useState<number | 'new' | null>(null);
  const [pipeDialog, setPipeDialog] = useState<number | null>(null);

  const applyWhatIf = (next: CapacityWhatIf) => {
    const params = new URLSearchParams();
    if (next.flowPerPatientLMin !== undefined && next.flowPerPatientLMin !== 40) params.set('flow', String(next.flowPerPatientLMin));
    if (next.vaporiserDerating !== undefined) params.set('derating', String(next.vaporiserDerating));
    if (next.peakHoursPerDay !== undefined && next.peakHoursPerDay !== 10) params.set('hours', String(next.peakHoursPerDay));
    setSearch(params, { replace: true });
  };

  const editingZone = typeof zoneDialog === 'number' ? zones.data?.find((z) => z.id === zoneDialog) : undefined;
  const pipeZone = pipeDialog !== null ? zones.data?.find((z) => z.id === pipeDialog) : undefined;

  return (
    <div className="flex flex-col gap-5">
      <div className="print:hidden">
        <PageHeader
          title="Capacity"
          description={`Can the plant carry the peak? ${siteName}: the diversified design flow of each pipeline zone against what its supply and pipework deliver.`}
          actions={
            <>
              <ButtonLink to="/capacity/rule-sets" variant="secondary">
                Diversity rule sets
              </ButtonLink>
              <Button variant="secondary" onClick={() => window.print()} disabled={!report.data}>
                Print report
              </Button>
              {canEdit && (
                <Button onClick={() => setZoneDialog('new')}>
                  <Icon name="plus" />
                  Add zone
                </Button>
              )}
            </>
          }
        />
      </div>
      <div className="flex flex-col gap-5 print:hidden">
        <Alert tone="warn" title="Supports the site's authorised person; does not replace them">
          {report.data?.caution ??
            "Planning estimate only: it does not replace the site's Authorised Person (MGPS), the authority having jurisdiction, local codes and standards, or the supplier's figures."}{' '}
          Every figure shows its inputs and method below.
        </Alert>

        <Card>
          <CardHeader title="Inputs of this check" description="Everything else comes from the zones, the supply sources and their demand model." />
          <CardBody>
            <WhatIfForm key={search.toString()} value={whatIf} onApply={applyWhatIf} />
          </CardBody>
        </Card>

        {report.isPending ? (
          <Card>
            <LoadingState label="Computing the capacity check…" />
          </Card>
        ) : report.isError ? (
          <Card>
            <ErrorState error={report.error} onRetry={() => report.refetch()} />
          </Card>
        ) : (
          <>
            <SignoffPanel report={report.data} whatIf={whatIf} canSign={canEdit} engineerName={engineerName} timeZone={timeZone} />
            {report.data.gases.length === 0 ? (
              <Card>
                <EmptyState
                  title="No pipeline zones on this site yet"
                  icon="sites"
                  action={
                    canEdit ? (
                      <Button onClick={() => setZoneDialog('new')}>
                        <Icon name="plus" />
                        Add the first zone
                      </Button>
                    ) : undefined
                  }
                >
                  {canEdit
                    ? 'Add a zone per gas and department: terminal units, the source that feeds it, and its pipe runs.'
                    : 'The biomedical engineer enters the zones of this site.'}
                </EmptyState>
              </Card>
            ) : (
              <>
                <SummaryTiles gases={report.data.gases} flowPerPatientLMin={report.data.options.flowPerPatientLMin} />
                <div className={cn('flex flex-col gap-5', report.isFetching && 'opacity-70 transition-opacity')} aria-busy={report.isFetching}>
                  {report.data.gases.map((g) => (
                    <GasSection
                      key={g.gasCode}
                      gas={g}
                      flowPerPatientLMin={report.data.options.flowPerPatientLMin}
                      canEdit={canEdit}
                      onEditZone={setZoneDialog}
                      onPipeRuns={setPipeDialog}
                    />
                  ))}
                </div>
                <Card>
                  <CardHeader title="Method and sources" headingLevel={2} />
                  <CardBody>
                    <ul className="flex flex-col gap-2 text-sm">
                      {report.data.method.map((m) => (
                        <li key={m.topic}>
                          <strong>{m.topic}.</strong> {m.text} <span className="text-fg-muted">Source: {m.source}</span>
                        </li>
                      ))}
                      <li className="text-fg-muted">
                        Free gas at {report.data.reference.label}; atmospheric pressure {formatNumber(report.data.reference.atmosphericBar, 4)} bar.
                      </li>
                    </ul>
                  </CardBody>
                </Card>
              </>
            )}
          </>
        )}
      </div>

      {report.data && <PrintableReport report={report.data} signoff={report.data.latestSignoff} timeZone={timeZone} />}

      <Dialog
        open={zoneDialog !== null}
        onClose={() => setZoneDialog(null)}
        title={zoneDialog === 'new' ? 'New pipeline zone' : `Edit ${editingZone?.name ?? 'zone'}`}
        wide
      >
        {zoneDialog !== null &&
          (zones.isPending || ruleSets.isPending ? (
            <LoadingState />
          ) : zones.isError || ruleSets.isError ? (
            <ErrorState error={zones.error ?? ruleSets.error} />
          ) : (
            <ZoneForm
              siteId={siteId}
              initial={editingZone ?? null}
              sources={report.data?.sources ?? []}
              ruleSets={ruleSets.data}
              onDone={() => setZoneDialog(null)}
            />
          ))}
      </Dialog>
      <Dialog
        open={pipeDialog !== null}
        onClose={() => setPipeDialog(null)}
        title={`Pipe runs: ${pipeZone?.name ?? ''}`}
        description="Each run is checked for pressure drop at the zone's design flow."
        wide
      >
        {pipeDialog !== null && (pipeZone ? <PipeRunsEditor siteId={siteId} zone={pipeZone} onDone={() => setPipeDialog(null)} /> : <LoadingState />)}
      </Dialog>
    </div>
  );
}

function SummaryTiles({ gases, flowPerPatientLMin }: { gases: GasOut[]; flowPerPatientLMin: number }) {
  return (
    <ul className="grid gap-3 sm:grid-cols-2 xl:grid-cols-4" aria-label="Summary per gas">
      {gases.map((g) => {
        const tone = utilisationTone(g.limiting?.utilisation ?? null);
        const border = {
          ok: 'border-l-ok',
          watch: 'border-l-watch',
          warn: 'border-l-warn',
          critical: 'border-l-critical',
          neutral: 'border-l-line-strong',
          info: 'border-l-info',
        }[tone];
        return (
          <li key={g.gasCode}>
            <a
              href={`#gas-${g.gasCode}`}
              className={cn('block h-full rounded-card border border-l-8 border-line bg-surface px-4 py-3 shadow-card hover:bg-primary-soft', border)}
            >
              <p className="font-bold">{gasLabel(g.gasCode)}</p>
              <p className="text-2xl font-bold tabular">{formatFlow(g.designFlowLMin)}</p>
              <p className="text-sm text-fg-muted">
                {g.limiting ? (
                  <>
                    {formatPercent(g.limiting.utilisation)} of {g.limiting.name}
                    <br />
                    {g.headroom.extraPatients === null
                      ? 'headroom not known'
                      : `${formatNumber(g.headroom.extraPatients)} more at ${formatNumber(flowPerPatientLMin)} L/min`}
                  </>
                ) : (
                  'no limit to check against'
                )}
              </p>
            </a>
          </li>
        );
      })}
    </ul>
  );
}
