import { formatDateTime, formatNumber } from '@/lib/format';
import { formatHours, formatWeekdays } from '@/lib/schedule-format';
import { Alert } from '@/components/ui/alert';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import type { SourceDetail } from '../api/sources-api';
import { BASIS_LABEL } from '../lib/source-labels';
import { DEFAULT_TANK_OPERATING_GAUGE_BAR, DEFAULT_TANK_OPERATING_SOURCE, loxDensityAtTankPressureKgPerL } from '@common/gas/liquid-oxygen';

/** How the forecast was made: its inputs, conversions, demand lines and the caution that goes with it. */
export function MethodPanel({ detail }: { detail: SourceDetail }) {
  const { method, site, source } = detail;
  const lines = method.demandLines;
  const totalLMin = lines.reduce((s, l) => s + l.flowLMin, 0);
  return (
    <Card>
      <CardHeader title="How this forecast is made" description="Inputs and method, so the figures can be checked." />
      <CardBody className="flex flex-col gap-4">
        <Alert tone="warn" title="Planning estimate only">
          {method.caution}
        </Alert>
        {(method.cautions ?? []).map((c) => (
          <Alert key={c} tone="critical" title="Caution">
            {c}
          </Alert>
        ))}
        <dl className="grid gap-3 text-sm sm:grid-cols-2">
          <div>
            <dt className="text-fg-muted">Demand basis</dt>
            <dd className="font-bold">{BASIS_LABEL[method.basis.used]}</dd>
            <dd>{method.basis.message}</dd>
          </div>
          <div>
            <dt className="text-fg-muted">Modelled and measured use</dt>
            <dd className="tabular">
              {formatNumber(method.basis.modelledLPerDay)} L/day modelled
              <br />
              {method.basis.measuredLPerDay === null ? 'no measured use yet' : `${formatNumber(method.basis.measuredLPerDay)} L/day measured`}
              {source.modelCorrectionFactor !== 1 && (
                <>
                  <br />
                  correction factor × {formatNumber(source.modelCorrectionFactor, 2)}
                </>
              )}
            </dd>
          </div>
          <div>
            <dt className="text-fg-muted">Free gas stated at</dt>
            <dd className="font-bold">{method.reference}</dd>
          </div>
          <div>
            <dt className="text-fg-muted">{method.freeGasLitresPerKg !== null ? 'Gas per kg of liquid' : 'Gas in a full cylinder'}</dt>
            <dd className="font-bold tabular">
              {method.freeGasLitresPerKg !== null
                ? `${formatNumber(method.freeGasLitresPerKg, 1)} L per kg`
                : method.fullCylinderFreeGasL !== null
                  ? `${formatNumber(method.fullCylinderFreeGasL)} L per full cylinder${source.cylinderTypeName ? ` (${source.cylinderTypeName})` : ''}`
                  : '–'}
            </dd>
          </div>
          {source.type === 'bulk_liquid' && source.gasCode === 'O2' && (
            <div>
              <dt className="text-fg-muted">Litres of liquid converted at</dt>
              <dd className="font-bold tabular">
                {loxDensityAtTankPressureKgPerL(source.operatingPressureBar ?? DEFAULT_TANK_OPERATING_GAUGE_BAR).toFixed(3)} kg/L
              </dd>
              <dd>
                saturated liquid oxygen at {source.operatingPressureBar ?? DEFAULT_TANK_OPERATING_GAUGE_BAR} bar g (
                {source.operatingPressureBar == null ? DEFAULT_TANK_OPERATING_SOURCE : 'the tank’s working pressure'}), from the reference equation of state
                (Schmidt &amp; Wagner 1985)
              </dd>
            </div>
          )}
          {method.residual && (
            <div>
              <dt className="text-fg-muted">Each cylinder is changed at</dt>
              <dd className="font-bold tabular">{formatNumber(method.residual.gaugeBar, 1)} bar g</dd>
              <dd>{method.residual.basis}; the gas left behind is not counted as stock.</dd>
            </div>
          )}
          <div>
            <dt className="text-fg-muted">Starts from</dt>
            <dd>{method.startedFrom ? `the reading of ${formatDateTime(method.startedFrom, site.timeZone)} (hour start)` : 'no reading yet'}</dd>
          </div>
          <div>
            <dt className="text-fg-muted">Lead time</dt>
            <dd>{formatNumber(method.leadTimeHours)} h from order to delivery</dd>
          </div>
        </dl>
        <ol className="list-decimal space-y-1 pl-5 text-sm">
          {method.text.map((t, i) => (
            <li key={i}>{t}</li>
          ))}
        </ol>
        <section aria-labelledby="demand-lines">
          <h3 id="demand-lines" className="font-bold">
            Demand lines
          </h3>
          <p className="pb-2 text-sm text-fg-muted">Patients × device flow, with the ward’s leakage allowance, in the hours and days each runs.</p>
          {lines.length === 0 ? (
            <p className="text-sm">No ward draws on this source as its primary supply, so the model has no demand for it.</p>
          ) : (
            <div className="overflow-x-auto">
              <table className="w-full text-left text-sm">
                <caption className="sr-only">Demand lines of this source</caption>
                <thead>
                  <tr className="border-b border-line-strong text-fg-muted">
                    <th scope="col" className="px-2 py-2">
                      Line
                    </th>
                    <th scope="col" className="px-2 py-2 text-right">
                      Flow
                    </th>
                    <th scope="col" className="px-2 py-2">
                      When
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {lines.map((l, i) => (
                    <tr key={i} className="border-b border-line last:border-0">
                      <td className="px-2 py-2">{l.label}</td>
                      <td className="px-2 py-2 text-right whitespace-nowrap tabular">{formatNumber(l.flowLMin, 1)} L/min</td>
                      <td className="px-2 py-2">
                        {formatHours(l.hours)}, {formatWeekdays(l.weekdays)}
                      </td>
                    </tr>
                  ))}
                </tbody>
                <tfoot>
                  <tr className="border-t border-line-strong font-bold">
                    <td className="px-2 py-2">All lines at once</td>
                    <td className="px-2 py-2 text-right whitespace-nowrap tabular">{formatNumber(totalLMin, 1)} L/min</td>
                    <td className="px-2 py-2 text-fg-muted">peak if every line runs</td>
                  </tr>
                </tfoot>
              </table>
            </div>
          )}
        </section>
      </CardBody>
    </Card>
  );
}
