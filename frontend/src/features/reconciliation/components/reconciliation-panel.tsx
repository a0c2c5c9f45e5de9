import { useMemo, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { CartesianGrid, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { DateTime } from 'luxon';
import type { Role } from '@common/api/roles';
import { errorMessage } from '@/lib/api-client';
import { formatDateTime, formatNumber } from '@/lib/format';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { ChartFrame, LegendItem } from '@/components/ui/chart-frame';
import { Dialog } from '@/components/ui/dialog';
import { Icon } from '@/components/ui/icons';
import { ErrorState, LoadingState } from '@/components/ui/states';
import {
  reconciliationQueries,
  useSetCorrection,
  type SiteReconciliation,
  type SourceReconciliation,
  type WardReconciliation,
} from '../api/reconciliation-api';

const COLOURS = { measured: 'var(--color-series-real)', modelled: 'var(--color-series-ideal)' };

/** m³ of free gas per day, the unit people read tank use in. */
const m3 = (l: number | null | undefined) => (l === null || l === undefined ? '–' : `${formatNumber(l / 1000, l < 10_000 ? 1 : 0)} m³`);
const ratioText = (r: number | null) => (r === null ? '–' : `${formatNumber(r * 100)} %`);

function RatioBadge({ ratio }: { ratio: number | null }) {
  if (ratio === null) return <Badge tone="neutral">no measure</Badge>;
  const off = Math.abs(ratio - 1);
  if (off < 0.005)
    return (
      <Badge tone="ok" icon="check">
        as modelled
      </Badge>
    );
  return (
    <Badge tone={off <= 0.05 ? 'ok' : off <= 0.15 ? 'watch' : 'warn'} icon={off <= 0.05 ? 'check' : 'alert'}>
      {ratio >= 1 ? `${formatNumber((ratio - 1) * 100)} % above model` : `${formatNumber((1 - ratio) * 100)} % below model`}
    </Badge>
  );
}

/**
 * Measured use against the demand model for a site: every source with readings (tank level, store
 * counts) and every ward (flow meters, historic usage, reported patients), with a chart of both per
 * day, and the correction factor a facilities manager may accept for a source (recorded; reversible).
 */
export function ReconciliationPanel({ siteId, roles }: { siteId: number; roles: readonly Role[] }) {
  const [days, setDays] = useState(28);
  const q = useQuery(reconciliationQueries.site(siteId, days));
  const [selected, setSelected] = useState<number | null>(null);
  if (q.isPending)
    return (
      <Card>
        <LoadingState label="Comparing measured use with the model…" />
      </Card>
    );
  if (q.isError)
    return (
      <Card>
        <ErrorState error={q.error} onRetry={() => q.refetch()} />
      </Card>
    );
  const d = q.data;
  const measuredSources = d.sources.filter((s) => s.measuredLPerDay !== null);
  const source = d.sources.find((s) => s.id === selected) ?? measuredSources[0] ?? d.sources[0];
  return (
    <div className="flex flex-col gap-5">
      <div className="flex flex-wrap items-center gap-2" role="group" aria-label="Period">
        {[14, 28, 90].map((n) => (
          <Button key={n} size="sm" variant={n === days ? 'primary' : 'secondary'} aria-pressed={n === days} onClick={() => setDays(n)}>
            Last {n} days
          </Button>
        ))}
      </div>
      <Alert tone="info" title="Before accepting a factor">
        {d.caution}
      </Alert>
      <Card>
        <CardHeader title="Sources" description="Use measured from readings between deliveries, against the model of the wards each source feeds." />
        <div className="w-full overflow-x-auto">
          <table className="w-full border-collapse text-sm">
            <caption className="sr-only">Measured against modelled use per source</caption>
            <thead className="bg-surface-sunken">
              <tr>
                {['Source', 'Measured / day', 'Model / day', 'Measured vs model', 'Day-to-day CV', 'Factor in use', ''].map((h) => (
                  <th key={h} scope="col" className="px-3 py-2 text-left font-bold whitespace-nowrap">
                    {h}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {d.sources.map((s) => (
                <tr key={s.id} className="border-t border-line" aria-selected={s.id === source?.id}>
                  <th scope="row" className="px-3 py-2 text-left font-bold">
                    {s.name}
                    <span className="block text-xs font-normal text-fg-muted">{s.gasCode.replace(/_/g, ' ')}</span>
                  </th>
                  <td className="px-3 py-2 tabular">{m3(s.measuredLPerDay)}</td>
                  <td className="px-3 py-2 tabular">{m3(s.modelledLPerDay)}</td>
                  <td className="px-3 py-2">{s.measuredLPerDay === null ? <span className="text-fg-muted">{s.note}</span> : <RatioBadge ratio={s.ratio} />}</td>
                  <td className="px-3 py-2 tabular">
                    {s.demandCv.measured ? formatNumber(s.demandCv.cv, 2) : <span className="text-fg-muted">0.20 (default)</span>}
                  </td>
                  <td className="px-3 py-2 tabular">
                    {s.forecastBasis === 'scaled' ? `× ${formatNumber(s.acceptedFactor, 2)}` : s.forecastBasis === 'measured' ? 'measured' : 'model'}
                  </td>
                  <td className="px-3 py-2">
                    {s.daily.length > 0 && (
                      <Button
                        size="sm"
                        variant={s.id === source?.id ? 'primary' : 'ghost'}
                        onClick={() => setSelected(s.id)}
                        aria-pressed={s.id === source?.id}
                      >
                        Chart
                      </Button>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </Card>
      {source && source.daily.length > 0 && <SourceCard key={source.id} source={source} data={d} canAccept={roles.includes('facilities_manager')} />}
      <WardsCard wards={d.wards} />
      <details className="rounded-card border border-line bg-surface p-4 text-sm">
        <summary className="cursor-pointer font-bold">How this is worked out</summary>
        <ul className="mt-2 list-disc space-y-1 pl-5">
          {d.method.map((m) => (
            <li key={m}>{m}</li>
          ))}
        </ul>
      </details>
    </div>
  );
}

function SourceCard({ source, data, canAccept }: { source: SourceReconciliation; data: SiteReconciliation; canAccept: boolean }) {
  const [confirm, setConfirm] = useState<null | 'accept' | 'revert'>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const set = useSetCorrection();
  const detail = useQuery(reconciliationQueries.source(source.id, data.days));
  const points = useMemo(() => source.daily.map((p) => ({ date: p.date, measured: p.measuredL / 1000, modelled: p.modelledL / 1000 })), [source.daily]);
  const max = Math.max(...points.map((p) => Math.max(p.measured, p.modelled)), 1);
  const summary = `Measured use of ${source.name} per day, ${source.daily.length} days: mean ${m3(source.measuredLPerDay)} against a model of ${m3(source.modelledLPerDay)} (${ratioText(source.ratio)} of the model).`;
  const apply = async () => {
    setProblem(null);
    try {
      if (confirm === 'accept' && source.suggestedFactor !== null)
        await set.mutateAsync({ sourceId: source.id, factor: source.suggestedFactor, basis: 'scaled' });
      if (confirm === 'revert') await set.mutateAsync({ sourceId: source.id, factor: 1, basis: 'model' });
      setConfirm(null);
    } catch (e) {
      setProblem(errorMessage(e));
    }
  };
  return (
    <Card>
      <CardHeader
        title={`${source.name}: measured and modelled use`}
        description={`Per local day, m³ of free gas at the site’s reference conditions. ${source.refills.length} deliver${source.refills.length === 1 ? 'y' : 'ies'} found and bridged.`}
        actions={<RatioBadge ratio={source.ratio} />}
      />
      <CardBody className="flex flex-col gap-4">
        <ChartFrame
          title="Use per day"
          summary={summary}
          height={260}
          legend={
            <div className="flex flex-wrap gap-4">
              <LegendItem colour={COLOURS.measured} label="Measured" />
              <LegendItem colour={COLOURS.modelled} label="Model" dashed />
            </div>
          }
        >
          <ResponsiveContainer width="100%" height="100%">
            <LineChart data={points} margin={{ top: 8, right: 12, bottom: 4, left: 0 }}>
              <CartesianGrid stroke="var(--color-line)" strokeDasharray="3 3" />
              <XAxis dataKey="date" tickFormatter={(v: string) => DateTime.fromISO(v).toFormat('d LLL')} minTickGap={24} tick={{ fontSize: 12 }} />
              <YAxis domain={[0, Math.ceil(max * 1.15)]} tickFormatter={(v: number) => formatNumber(v)} width={48} tick={{ fontSize: 12 }} unit="" />
              <Tooltip formatter={(v) => `${formatNumber(Number(v), 1)} m³`} labelFormatter={(v) => DateTime.fromISO(String(v)).toFormat('cccc d LLLL')} />
              <Line type="monotone" dataKey="measured" name="Measured" stroke={COLOURS.measured} strokeWidth={2.5} dot={false} isAnimationActive={false} />
              <Line
                type="stepAfter"
                dataKey="modelled"
                name="Model"
                stroke={COLOURS.modelled}
                strokeWidth={2}
                strokeDasharray="6 4"
                dot={false}
                isAnimationActive={false}
              />
            </LineChart>
          </ResponsiveContainer>
        </ChartFrame>
        <dl className="grid grid-cols-2 gap-3 text-sm sm:grid-cols-4">
          <div>
            <dt className="text-fg-muted">Measured</dt>
            <dd className="text-lg font-bold tabular">{m3(source.measuredLPerDay)} / day</dd>
          </div>
          <div>
            <dt className="text-fg-muted">Model</dt>
            <dd className="text-lg font-bold tabular">{m3(source.modelledLPerDay)} / day</dd>
          </div>
          <div>
            <dt className="text-fg-muted">Suggested factor</dt>
            <dd className="text-lg font-bold tabular">{source.suggestedFactor === null ? '–' : `× ${formatNumber(source.suggestedFactor, 2)}`}</dd>
          </div>
          <div>
            <dt className="text-fg-muted">Day-to-day variation (CV)</dt>
            <dd className="text-lg font-bold tabular">{source.dailyCv === null ? '–' : formatNumber(source.dailyCv, 2)}</dd>
          </div>
        </dl>
        {problem && (
          <Alert tone="critical" role="alert">
            {problem}
          </Alert>
        )}
        {canAccept && (
          <div className="flex flex-wrap gap-2">
            {source.suggestedFactor !== null && !(source.forecastBasis === 'scaled' && source.acceptedFactor === source.suggestedFactor) && (
              <Button onClick={() => setConfirm('accept')}>
                <Icon name="check" />
                Accept × {formatNumber(source.suggestedFactor, 2)} for the forecast
              </Button>
            )}
            {source.forecastBasis === 'scaled' && (
              <Button variant="secondary" onClick={() => setConfirm('revert')}>
                Go back to the model
              </Button>
            )}
          </div>
        )}
        {detail.data && detail.data.corrections.length > 0 && (
          <div className="text-sm">
            <h3 className="font-bold">Corrections recorded</h3>
            <ul className="mt-1 space-y-1">
              {detail.data.corrections.map((c) => (
                <li key={c.at}>
                  {formatDateTime(c.at, data.site.timeZone)}: × {formatNumber(c.factor, 2)} ({c.basis})
                  {c.previousFactor !== null ? `, was × ${formatNumber(c.previousFactor, 2)}` : ''}
                  {c.by ? ` · ${c.by}` : ''}
                </li>
              ))}
            </ul>
          </div>
        )}
      </CardBody>
      <Dialog
        open={confirm !== null}
        onClose={() => setConfirm(null)}
        title={confirm === 'accept' ? `Scale the model of ${source.name}?` : `Forecast ${source.name} from the model again?`}
        footer={
          <>
            <Button variant="secondary" onClick={() => setConfirm(null)}>
              Cancel
            </Button>
            <Button busy={set.isPending} onClick={() => void apply()}>
              {confirm === 'accept' ? 'Accept the factor' : 'Use the model'}
            </Button>
          </>
        }
      >
        {confirm === 'accept' ? (
          <p>
            The forecast of {source.name} will use the modelled demand of {source.wardsFed.map((w) => w.name).join(', ') || 'its wards'} ×{' '}
            {formatNumber(source.suggestedFactor ?? 1, 2)}: measured {m3(source.measuredLPerDay)} against {m3(source.modelledLPerDay)} a day over the last{' '}
            {data.days} days. The change is recorded in the audit log and can be undone here.
          </p>
        ) : (
          <p>The forecast goes back to the modelled demand without a factor. The change is recorded in the audit log.</p>
        )}
      </Dialog>
    </Card>
  );
}

function WardsCard({ wards }: { wards: WardReconciliation[] }) {
  const [open, setOpen] = useState<number | null>(null);
  return (
    <Card>
      <CardHeader title="Wards (oxygen)" description="A flow meter or historic usage where there is one; otherwise the patients reported on each device." />
      <ul className="divide-y divide-line">
        {wards.map((w) => (
          <li key={w.id}>
            <button
              type="button"
              aria-expanded={open === w.id}
              onClick={() => setOpen(open === w.id ? null : w.id)}
              className="flex min-h-14 w-full flex-wrap items-center justify-between gap-2 px-4 py-2 text-left hover:bg-primary-soft sm:px-5"
            >
              <span className="min-w-0">
                <span className="block font-bold">{w.name}</span>
                <span className="block text-sm text-fg-muted">
                  {w.measuredLPerDay === null
                    ? 'No reports, meter or history in this period'
                    : `${m3(w.measuredLPerDay)} a day (${w.basis}) · model ${m3(w.modelledLPerDay)}`}
                </span>
              </span>
              <RatioBadge ratio={w.ratio} />
            </button>
            {open === w.id && (
              <div className="grid gap-4 px-4 pb-4 sm:grid-cols-2 sm:px-5">
                <div>
                  <h3 className="text-sm font-bold">
                    Patients per device ({w.reports} report{w.reports === 1 ? '' : 's'})
                  </h3>
                  <table className="mt-1 w-full text-sm">
                    <thead>
                      <tr className="text-left text-fg-muted">
                        <th scope="col">Device</th>
                        <th scope="col">Model</th>
                        <th scope="col">Reported (mean now)</th>
                        <th scope="col">Most</th>
                      </tr>
                    </thead>
                    <tbody>
                      {w.devices.map((x) => (
                        <tr key={x.device} className="border-t border-line">
                          <td className="py-1">{x.label}</td>
                          <td className="tabular">{formatNumber(x.modelPatients, 1)}</td>
                          <td className="tabular">{x.reportedMeanNow === null ? '–' : formatNumber(x.reportedMeanNow, 1)}</td>
                          <td className="tabular">{x.reportedMaxShift ?? '–'}</td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </div>
                <div className="text-sm">
                  <h3 className="font-bold">Per week</h3>
                  {w.weekly.length ? (
                    <ul>
                      {w.weekly.map((k) => (
                        <li key={k.week} className="flex justify-between gap-2 tabular">
                          <span>{k.week}</span>
                          <span>
                            {m3(k.total)} ({k.days} day{k.days === 1 ? '' : 's'})
                          </span>
                        </li>
                      ))}
                    </ul>
                  ) : (
                    <p className="text-fg-muted">–</p>
                  )}
                  {w.cylinders.length > 0 && (
                    <p className="mt-2">
                      Cylinders changed: {w.cylinders.map((c) => `${c.cylinders} ${c.gasCode.replace(/_/g, ' ')} (${m3(c.litres)})`).join(', ')}
                    </p>
                  )}
                </div>
              </div>
            )}
          </li>
        ))}
      </ul>
    </Card>
  );
}
