import { useState } from 'react';
import { formatDateTime, formatKg, formatNumber } from '@/lib/format';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Select } from '@/components/ui/field';
import { Spinner } from '@/components/ui/spinner';
import { EmptyState } from '@/components/ui/states';
import type { Scenario, SourceDetail } from '../api/sources-api';
import { DepletionChart } from './depletion-chart';

function describeScenario(s: Scenario): string {
  const parts: string[] = [];
  if (s.multiplier !== 1) parts.push(`demand × ${formatNumber(s.multiplier, 2)}`);
  if (s.extraPatients > 0) parts.push(`${formatNumber(s.extraPatients)} extra patients at ${formatNumber(s.extraFlowLMin, 1)} L/min`);
  if (s.wardChange) parts.push(s.wardChange === 'close' ? 'a ward closes' : 'a ward opens');
  const when = `from ${s.fromLocal.replace('T', ' ')}${s.untilLocal ? ` until ${s.untilLocal.replace('T', ' ')}` : ''} (site time)`;
  return `${parts.length ? parts.join(', ') : 'no change to demand'}, ${when}.${s.note ? ` ${s.note}` : ''}`;
}

const EVENT_LABEL: Record<string, string> = {
  changeover: 'Changeover to bank',
  bank_replaced: 'Bank replaced:',
  supply_lost: 'Both banks empty: supply lost, last bank',
  supply_restored: 'Supply restored from bank',
};
const SHOWN_EVENTS = 8;

/** The forecast: which scenario, the depletion chart, the orders the rule places and the manifold's changeovers. */
export function ForecastCard({
  detail,
  onScenarioChange,
  updating,
}: {
  detail: SourceDetail;
  onScenarioChange: (id: number | null) => void;
  updating: boolean;
}) {
  const tz = detail.site.timeZone;
  const [allEvents, setAllEvents] = useState(false);
  const chosen = detail.scenarios.find((s) => s.id === detail.scenarioId) ?? null;
  const events = allEvents ? detail.manifoldEvents : detail.manifoldEvents.slice(0, SHOWN_EVENTS);
  const qty = (o: SourceDetail['orders'][number]) =>
    o.quantity === null ? '–' : o.quantityUnit === 'kg' ? formatKg(o.quantity) : `${formatNumber(o.quantity)} cylinders`;

  return (
    <Card>
      <CardHeader
        title="Forecast"
        description={`Hour by hour over the next ${Math.max(1, Math.round(detail.series.contents.length / 24))} days, in ${tz} time.`}
        actions={
          <label className="flex w-full flex-col gap-1 sm:w-72">
            <span className="flex items-center gap-2 text-sm font-bold">Scenario {updating && <Spinner className="size-4" />}</span>
            <Select value={detail.scenarioId ?? ''} onChange={(e) => onScenarioChange(e.target.value ? Number(e.target.value) : null)}>
              <option value="">Baseline (no scenario)</option>
              {detail.scenarios.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
            </Select>
          </label>
        }
      />
      <CardBody className="flex flex-col gap-5">
        {chosen && (
          <p className="rounded-lg bg-info-soft px-3 py-2 text-sm">
            <span className="font-bold">{chosen.name}: </span>
            {describeScenario(chosen)}
          </p>
        )}
        {detail.series.contents.length < 2 ? (
          <EmptyState title="No forecast to draw" icon="clock">
            {detail.outlook.note ?? 'Enter a reading to start the forecast of this source.'}
          </EmptyState>
        ) : (
          <div aria-busy={updating || undefined} className={updating ? 'opacity-60 transition-opacity' : undefined}>
            <DepletionChart detail={detail} />
          </div>
        )}

        {detail.orders.length > 0 && (
          <section aria-labelledby="planned-orders">
            <h3 id="planned-orders" className="font-bold">
              Orders the reorder rule would place
            </h3>
            <p className="pb-2 text-sm text-fg-muted">Placed when the contents reach the reorder level; each arrives after the lead time.</p>
            <div className="overflow-x-auto">
              <table className="w-full text-left text-sm">
                <caption className="sr-only">Planned orders</caption>
                <thead>
                  <tr className="border-b border-line-strong text-fg-muted">
                    <th scope="col" className="px-2 py-2">
                      Placed
                    </th>
                    <th scope="col" className="px-2 py-2">
                      Arrives
                    </th>
                    <th scope="col" className="px-2 py-2 text-right">
                      Quantity
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {detail.orders.slice(0, 6).map((o, i) => (
                    <tr key={i} className="border-b border-line last:border-0">
                      <td className="px-2 py-2">{formatDateTime(o.placedAt, tz)}</td>
                      <td className="px-2 py-2">{formatDateTime(o.arrivesAt, tz)}</td>
                      <td className="px-2 py-2 text-right tabular">{qty(o)}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
            {detail.orders.length > 6 && (
              <p className="pt-1 text-sm text-fg-muted">…and {detail.orders.length - 6} more in the horizon (all are in the CSV export).</p>
            )}
          </section>
        )}

        {detail.manifoldEvents.length > 0 && (
          <section aria-labelledby="manifold-events">
            <h3 id="manifold-events" className="font-bold">
              Changeovers and bank replacements
            </h3>
            <p className="pb-2 text-sm text-fg-muted">
              When the duty bank reaches the changeover pressure the manifold switches banks; the empty bank is replaced with full cylinders.
            </p>
            <ol className="divide-y divide-line rounded-lg border border-line">
              {events.map((ev, i) => (
                <li
                  key={i}
                  className={`flex flex-wrap items-baseline justify-between gap-x-4 gap-y-0.5 px-3 py-2 text-sm ${ev.kind === 'supply_lost' ? 'bg-critical-soft' : ''}`}
                >
                  <span className={`font-bold ${ev.kind === 'supply_lost' ? 'text-critical' : ''}`}>
                    {EVENT_LABEL[ev.kind] ?? ev.kind} {ev.bank}
                    {ev.cylinders ? ` (${ev.cylinders} cylinders)` : ''}
                  </span>
                  <span className="tabular text-fg-muted">{formatDateTime(ev.at, tz)}</span>
                </li>
              ))}
            </ol>
            {detail.manifoldEvents.length > SHOWN_EVENTS && (
              <Button variant="ghost" size="sm" className="mt-2" onClick={() => setAllEvents((v) => !v)} aria-expanded={allEvents}>
                {allEvents ? 'Show fewer' : `Show all ${formatNumber(detail.manifoldEvents.length)}`}
              </Button>
            )}
          </section>
        )}
      </CardBody>
    </Card>
  );
}
