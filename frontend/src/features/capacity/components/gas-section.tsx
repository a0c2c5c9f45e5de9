import type { GasOut, LimitOut, SourceOut, ZoneOut } from '@common/schemas/capacity.schema';
import { cn } from '@/lib/cn';
import { formatDays, formatLitres, formatNumber } from '@/lib/format';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Icon } from '@/components/ui/icons';
import {
  COUNT_LABELS,
  LIMIT_KIND_LABELS,
  SOURCE_TYPE_LABELS,
  departmentLabel,
  formatFlow,
  formatHours,
  formatPercent,
  gasLabel,
  patientsPhrase,
  utilisationTone,
} from '../lib/capacity-format';
import { UtilisationBar } from './utilisation-bar';

interface GasSectionProps {
  gas: GasOut;
  flowPerPatientLMin: number;
  canEdit: boolean;
  onEditZone: (zoneId: number) => void;
  onPipeRuns: (zoneId: number) => void;
}

/** One gas of the check: the limiting element first, then the sources, then the zones. */
export function GasSection({ gas, flowPerPatientLMin, canEdit, onEditZone, onPipeRuns }: GasSectionProps) {
  const headingId = `gas-${gas.gasCode}`;
  return (
    <Card aria-labelledby={headingId}>
      <CardHeader
        title={
          <span id={headingId}>
            {gasLabel(gas.gasCode)} · design flow <span className="tabular">{formatFlow(gas.designFlowLMin)}</span>
          </span>
        }
        description={gas.totalNote}
        actions={
          <>
            {gas.incomplete && (
              <Badge tone="warn" icon="alert">
                Incomplete
              </Badge>
            )}
            {gas.warnings.length > 0 && (
              <Badge tone="watch" icon="info">
                Rules from memory
              </Badge>
            )}
          </>
        }
      />
      <CardBody className="flex flex-col gap-5">
        <LimitingCallout gas={gas} flowPerPatientLMin={flowPerPatientLMin} />
        {gas.sources.length > 0 && <SourcesTable gas={gas} />}
        <ZonesTable gas={gas} flowPerPatientLMin={flowPerPatientLMin} canEdit={canEdit} onEditZone={onEditZone} onPipeRuns={onPipeRuns} />
        <RuleNotes gas={gas} />
      </CardBody>
    </Card>
  );
}

function LimitingCallout({ gas, flowPerPatientLMin }: { gas: GasOut; flowPerPatientLMin: number }) {
  const l = gas.limiting;
  if (!l) {
    return (
      <div className="rounded-lg border border-line bg-surface-sunken px-4 py-3 text-sm">
        <p className="font-bold">No capacity limit to check against.</p>
        <p className="text-fg-muted">{gas.headroom.note ?? 'Link the zones to their supply source and enter its regulator flow or vaporiser rating.'}</p>
      </div>
    );
  }
  const tone = utilisationTone(l.utilisation);
  const box = {
    ok: 'border-ok/40 bg-ok-soft',
    watch: 'border-watch/40 bg-watch-soft',
    warn: 'border-warn/50 bg-warn-soft',
    critical: 'border-critical/60 bg-critical-soft',
    neutral: 'border-line bg-surface-sunken',
    info: 'border-info/40 bg-info-soft',
  }[tone];
  return (
    <div className={cn('grid gap-3 rounded-lg border-2 px-4 py-3 sm:grid-cols-[1fr_auto] sm:items-center', box)} data-testid={`limiting-${gas.gasCode}`}>
      <div>
        <p className="text-xs font-bold tracking-wider text-fg-muted uppercase">Limiting element</p>
        <p className="text-lg font-bold">
          {l.name}{' '}
          <Badge tone="neutral" className="align-middle">
            {LIMIT_KIND_LABELS[l.kind]}
          </Badge>
        </p>
        <p className="text-sm">
          {l.ok ? (
            <>
              Design flow {formatFlow(l.flowLMin)} uses {formatPercent(l.utilisation)} of {formatFlow(l.capacityLMin)}; margin {formatFlow(l.marginLMin)}.
            </>
          ) : (
            <strong className="text-critical">
              Design flow {formatFlow(l.flowLMin)} exceeds its {formatFlow(l.capacityLMin)} by {formatFlow(-l.marginLMin)}.
            </strong>
          )}
          {l.detail && <span className="block text-fg-muted">{l.detail}</span>}
        </p>
      </div>
      <div className="sm:text-right">
        <p className="text-xs font-bold tracking-wider text-fg-muted uppercase">Surge headroom, site</p>
        <p className="text-2xl font-bold tabular">{gas.headroom.extraPatients === null ? '–' : formatNumber(gas.headroom.extraPatients)}</p>
        <p className="text-sm text-fg-muted">
          {gas.headroom.extraPatients === null ? 'no source limit known' : `more patients at ${formatNumber(flowPerPatientLMin)} L/min`}
        </p>
      </div>
      {gas.headroom.note && <p className="text-sm text-fg-muted sm:col-span-2">{gas.headroom.note}</p>}
    </div>
  );
}

function LimitRow({ limit }: { limit: LimitOut }) {
  return (
    <div className={cn('flex flex-col gap-1 rounded-md px-2 py-1', limit.limiting && 'ring-2 ring-warn')}>
      <div className="flex flex-wrap items-center gap-2 text-sm">
        <span className="font-bold">{LIMIT_KIND_LABELS[limit.kind]}</span>
        <span className="tabular">{formatFlow(limit.capacityLMin)}</span>
        {limit.limiting && <Badge tone="warn">Limiting</Badge>}
        {!limit.ok && (
          <Badge tone="critical" icon="alert">
            Over
          </Badge>
        )}
      </div>
      <UtilisationBar fraction={limit.utilisation} label={`${limit.name}: share in use at design flow`} />
      {limit.detail && <p className="text-xs text-fg-muted">{limit.detail}</p>}
    </div>
  );
}

function SourcesTable({ gas }: { gas: GasOut }) {
  return (
    <div>
      <h3 className="mb-2 text-base">Supply sources</h3>
      <div className="flex flex-col gap-3">
        {gas.sources.map((s) => (
          <SourceBlock key={s.id} source={s} />
        ))}
      </div>
    </div>
  );
}

function SourceBlock({ source: s }: { source: SourceOut }) {
  return (
    <div className="rounded-lg border border-line">
      <div className="grid gap-3 px-4 py-3 md:grid-cols-[minmax(12rem,1fr)_minmax(14rem,1.2fr)_auto]">
        <div>
          <p className="font-bold">{s.name}</p>
          <p className="text-sm text-fg-muted">{SOURCE_TYPE_LABELS[s.type] ?? s.type}</p>
          <p className="mt-1 text-sm">
            Design flow <strong className="tabular">{formatFlow(s.designFlowLMin)}</strong>
            <span className="block text-fg-muted">
              Forecast mean {formatFlow(s.forecastFlowLMin)}
              {s.forecastBasis ? ` (${s.forecastBasis})` : ''}
            </span>
          </p>
        </div>
        <div className="flex flex-col gap-2">
          {s.limits.length > 0 ? s.limits.map((l) => <LimitRow key={l.name} limit={l} />) : <p className="text-sm text-warn">{s.missingLimit}</p>}
        </div>
        <div className="text-sm md:text-right">
          <p className="text-fg-muted">Surge headroom</p>
          <p className="text-xl font-bold tabular">{s.headroom.extraPatients === null ? '–' : formatNumber(s.headroom.extraPatients)}</p>
          {s.headroom.firstLimit && <p className="text-xs text-fg-muted">before {s.headroom.firstLimit.name}</p>}
        </div>
      </div>
      {(s.manifold || s.reserves.rules.length > 0) && (
        <div className="grid gap-4 border-t border-line bg-surface-sunken px-4 py-3 text-sm md:grid-cols-2">
          {s.manifold && <ManifoldFacts source={s} />}
          <ReserveFacts source={s} />
        </div>
      )}
    </div>
  );
}

function Fact({ label, value, hint }: { label: string; value: string; hint?: string }) {
  return (
    <div className="flex justify-between gap-3 border-b border-line/60 py-1 last:border-0">
      <dt className="text-fg-muted">{label}</dt>
      <dd className="text-right font-bold tabular">
        {value}
        {hint && <span className="block text-xs font-normal text-fg-muted">{hint}</span>}
      </dd>
    </div>
  );
}

function ManifoldFacts({ source: s }: { source: SourceOut }) {
  const m = s.manifold!;
  return (
    <div>
      <h4 className="mb-1 font-bold">Manifold</h4>
      <dl>
        <Fact
          label="Bank"
          value={`${m.cylindersPerBank} × ${m.cylinder}`}
          hint={`${formatLitres(m.bankFreeGasL)} free gas (${formatLitres(m.cylinderFreeGasL)} each, real gas)`}
        />
        <Fact label="Bank lasts at design flow" value={formatHours(m.bankDurationAtDesignH)} />
        <Fact label="Bank lasts at forecast flow" value={formatHours(m.bankDurationAtForecastH)} />
        <Fact label="Changeover interval" value={formatDays(m.changeoverIntervalDays)} hint="at forecast use" />
        <Fact
          label="Cylinders per week"
          value={formatNumber(m.cylindersPerWeekAtForecast, 1)}
          hint={`forecast; ${formatNumber(m.cylindersPerWeekAtDesign, 0)} at design flow all week`}
        />
        <Fact
          label="Manifold for the peak"
          value={m.recommended ? m.recommended.label : '–'}
          hint={
            m.recommended ? `${formatLitres(m.recommended.dailyDemandL)}/day at design flow × ${m.recommended.hoursPerDay} h` : (m.recommendedNote ?? undefined)
          }
        />
      </dl>
    </div>
  );
}

function ReserveFacts({ source: s }: { source: SourceOut }) {
  const r = s.reserves;
  return (
    <div>
      <h4 className="mb-1 font-bold">Reserve{r.reserveSources.length > 0 ? `: ${r.reserveSources.map((x) => x.name).join(', ')}` : ''}</h4>
      <ul className="flex flex-col gap-2">
        {r.rules.map((rule) => (
          <li key={rule.rule}>
            <div className="flex flex-wrap items-center gap-2">
              <span className="font-bold">{rule.rule === 'four_hour_secondary' ? '4-hour rule' : 'Average-day rule'}</span>
              {rule.meets === true && (
                <Badge tone="ok" icon="check">
                  Met
                </Badge>
              )}
              {rule.meets === false && (
                <Badge tone="critical" icon="alert">
                  Short
                </Badge>
              )}
              {rule.meets === null && <Badge>Not checked</Badge>}
            </div>
            <p>
              Needs {formatLitres(rule.requiredFreeGasL)} ({formatFlow(rule.basisFlowLMin)} × {rule.rule === 'four_hour_secondary' ? '4 h' : '24 h'})
              {rule.cylindersRequired !== null && rule.cylinderName && (
                <>
                  {' '}
                  = {rule.cylindersRequired} × {rule.cylinderName}
                </>
              )}
              {rule.heldFreeGasL !== null && (
                <>
                  ; holds {formatLitres(rule.heldFreeGasL)}, {rule.coversUnit === 'h' ? formatHours(rule.covers) : formatDays(rule.covers)}
                </>
              )}
            </p>
            <p className="text-xs text-fg-muted">{rule.source}</p>
          </li>
        ))}
      </ul>
      {r.note && <p className="mt-1 text-xs text-warn">{r.note}</p>}
    </div>
  );
}

function ZonesTable({ gas, flowPerPatientLMin, canEdit, onEditZone, onPipeRuns }: Omit<GasSectionProps, 'gas'> & { gas: GasOut }) {
  const sourceName = new Map(gas.sources.map((s) => [s.id, s.name]));
  return (
    <div>
      <h3 className="mb-2 text-base">Pipeline zones</h3>
      <div className="overflow-x-auto">
        <table className="w-full min-w-[56rem] text-sm">
          <caption className="sr-only">{gasLabel(gas.gasCode)} zones: design flow, pipework and surge headroom</caption>
          <thead>
            <tr className="border-b border-line text-left text-xs tracking-wide text-fg-muted uppercase">
              <th scope="col" className="py-2 pr-3">
                Zone
              </th>
              <th scope="col" className="py-2 pr-3">
                Rule
              </th>
              <th scope="col" className="py-2 pr-3 text-right">
                Design flow
              </th>
              <th scope="col" className="py-2 pr-3">
                Pipe runs at design flow
              </th>
              <th scope="col" className="py-2 pr-3 text-right">
                Surge headroom
              </th>
              {canEdit && (
                <th scope="col" className="py-2">
                  <span className="sr-only">Actions</span>
                </th>
              )}
            </tr>
          </thead>
          <tbody>
            {gas.zones.map((z) => (
              <ZoneRowView
                key={z.id}
                zone={z}
                sourceName={z.sourceId ? (sourceName.get(z.sourceId) ?? null) : null}
                flowPerPatientLMin={flowPerPatientLMin}
                canEdit={canEdit}
                onEditZone={onEditZone}
                onPipeRuns={onPipeRuns}
                isVacuum={gas.gasCode === 'VAC'}
              />
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}

function ZoneRowView({
  zone: z,
  sourceName,
  flowPerPatientLMin,
  canEdit,
  onEditZone,
  onPipeRuns,
  isVacuum,
}: {
  zone: ZoneOut;
  sourceName: string | null;
  flowPerPatientLMin: number;
  canEdit: boolean;
  onEditZone: (id: number) => void;
  onPipeRuns: (id: number) => void;
  isVacuum: boolean;
}) {
  return (
    <tr className="border-b border-line/70 align-top last:border-0">
      <th scope="row" className="py-2 pr-3 text-left font-normal">
        <span className="font-bold">{z.name}</span>
        <span className="block text-fg-muted">
          {departmentLabel(z.department)} · {formatNumber(z.terminalUnits)} {COUNT_LABELS[z.countedAs ?? 'terminal_unit'] ?? 'units'}
        </span>
        <span className="block text-xs text-fg-muted">{sourceName ? `Fed by ${sourceName}` : isVacuum ? 'Vacuum plant' : 'No supply source linked'}</span>
      </th>
      <td className="py-2 pr-3">
        {z.diversityMethod === 'binomial' ? <Badge tone="info">Binomial</Badge> : <span className="block text-fg-muted">{z.ruleSet.name}</span>}
        {z.warning && (
          <div className="mt-1">
            <Badge tone="watch" icon="info">
              {z.warning}
            </Badge>
          </div>
        )}
        {z.ruleSource && <span className="mt-1 block text-xs text-fg-muted">{z.ruleSource}</span>}
      </td>
      <td className="py-2 pr-3 text-right">
        {z.refused ? (
          <span className="inline-block max-w-64 text-left text-warn">
            <strong>No documented rule.</strong> {z.refused}
          </span>
        ) : (
          <>
            <strong className="tabular text-base">{formatFlow(z.designFlowLMin)}</strong>
            <span className="block text-xs text-fg-muted">{z.formula}</span>
          </>
        )}
      </td>
      <td className="py-2 pr-3">
        {z.pipeRuns.length === 0 ? (
          <span className="text-fg-muted">{isVacuum ? 'not checked (vacuum)' : 'none entered'}</span>
        ) : (
          <ul className="flex flex-col gap-2">
            {z.pipeRuns.map((p) => (
              <li key={p.id} className={cn('rounded-md px-2 py-1', p.limiting && 'ring-2 ring-warn')}>
                <span className="font-bold">{p.name}</span>{' '}
                <span className="text-fg-muted">
                  {p.tube} mm · {formatNumber(p.lengthM, 1)} m
                </span>
                {p.error ? (
                  <span className="block text-warn">{p.error}</span>
                ) : (
                  <>
                    <span className="block">
                      Drop {formatNumber(p.pressureDropKPa, 2)} of {formatNumber(p.allowedDropKPa, 1)} kPa · carries {formatFlow(p.capacityLMin)} at the allowed
                      drop
                      {p.limiting && (
                        <Badge tone="warn" className="ml-2">
                          Limiting
                        </Badge>
                      )}
                    </span>
                    <UtilisationBar fraction={p.utilisation} label={`${p.name}: pressure drop as a share of the allowed drop`} />
                    {p.verdictNote && <span className="block text-xs text-warn">{p.verdictNote}</span>}
                  </>
                )}
              </li>
            ))}
          </ul>
        )}
      </td>
      <td className="py-2 pr-3 text-right">
        {z.headroom ? (
          <>
            <strong className="tabular text-base">{z.headroom.extraPatientsWithSource ?? z.headroom.extraPatients ?? '–'}</strong>
            <span className="block text-xs text-fg-muted">
              {z.headroom.extraPatientsWithSource !== null || z.headroom.extraPatients !== null
                ? `at ${formatNumber(flowPerPatientLMin)} L/min`
                : patientsPhrase(null, flowPerPatientLMin)}
            </span>
            {z.headroom.limitedBy && <span className="block text-xs text-fg-muted">limit: {z.headroom.limitedBy.name}</span>}
          </>
        ) : (
          '–'
        )}
      </td>
      {canEdit && (
        <td className="py-2">
          <div className="flex flex-col items-end gap-1">
            <Button variant="ghost" size="sm" onClick={() => onEditZone(z.id)} aria-label={`Edit zone ${z.name}`}>
              <Icon name="pencil" className="size-4" />
              Edit
            </Button>
            {!isVacuum && (
              <Button variant="ghost" size="sm" onClick={() => onPipeRuns(z.id)} aria-label={`Pipe runs of ${z.name}`}>
                Pipe runs
              </Button>
            )}
          </div>
        </td>
      )}
    </tr>
  );
}

function RuleNotes({ gas }: { gas: GasOut }) {
  if (gas.ruleSources.length === 0 && gas.warnings.length === 0) return null;
  return (
    <details className="rounded-lg border border-line bg-surface-sunken px-4 py-2 text-sm">
      <summary className="cursor-pointer py-1 font-bold">Sources of the rules used</summary>
      <ul className="mt-1 flex flex-col gap-1 pb-1">
        {gas.ruleSources.map((s) => (
          <li key={s.id}>
            {s.verified ? <Badge tone="ok">Seen in source</Badge> : <Badge tone="watch">From memory, not verified</Badge>} {s.citation}
            {s.note && <span className="block text-xs text-fg-muted">{s.note}</span>}
          </li>
        ))}
      </ul>
    </details>
  );
}
