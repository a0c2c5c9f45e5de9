import { useMemo } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { GAS_INFO, type GasCode } from '@common/gas/gases';
import { formatMoney, formatNumber } from '@/lib/format';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { ChartFrame } from '@/components/ui/chart-frame';
import { Icon } from '@/components/ui/icons';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { ordersQueries, spendCsvUrl, type SpendRow } from '../api/orders-api';

const COLOURS = ['var(--color-ink-700)', 'var(--color-sand-500)', '#4f8fa3', '#c26a00', '#6b4f8c'];

function sumBy(rows: SpendRow[], key: (r: SpendRow) => string, value: (r: SpendRow) => number) {
  const m = new Map<string, number>();
  for (const r of rows) m.set(key(r), (m.get(key(r)) ?? 0) + value(r));
  return m;
}

/** Spend by month (orders and cylinder rental), and by site, gas and supplier; CSV of the same rows. */
export function SpendView({ siteId }: { siteId: number | null }) {
  const q = useQuery(ordersQueries.spend(siteId));
  const data = q.data;
  const currency = data?.currencies[0] ?? 'GBP';
  const rows = useMemo(() => (data ? data.rows.filter((r) => r.currency === currency) : []), [data, currency]);
  const byMonth = useMemo(
    () =>
      data
        ? data.months.map((month) => ({
            month,
            orders: rows.filter((r) => r.month === month).reduce((s, r) => s + r.orderedMinor, 0) / 100,
            rental: rows.filter((r) => r.month === month).reduce((s, r) => s + r.rentalMinor, 0) / 100,
          }))
        : [],
    [data, rows],
  );
  const gases = useMemo(() => [...new Set(rows.map((r) => r.gasCode))], [rows]);
  const byMonthGas = useMemo(
    () =>
      data
        ? data.months.map((month) =>
            Object.fromEntries([
              ['month', month],
              ...gases.map((g) => [g, rows.filter((r) => r.month === month && r.gasCode === g).reduce((s, r) => s + r.orderedMinor + r.rentalMinor, 0) / 100]),
            ]),
          )
        : [],
    [data, rows, gases],
  );
  if (q.isPending) return <LoadingState label="Loading spend…" />;
  if (q.isError) return <ErrorState error={q.error} onRetry={() => q.refetch()} />;
  if (!rows.length) return <EmptyState title="No spend yet">Orders and cylinder rental appear here by month.</EmptyState>;
  const total = rows.reduce((s, r) => s + r.orderedMinor + r.rentalMinor, 0);
  const rental = rows.reduce((s, r) => s + r.rentalMinor, 0);
  const bySupplier = sumBy(
    rows,
    (r) => r.supplierName,
    (r) => r.orderedMinor + r.rentalMinor,
  );
  const bySite = sumBy(
    rows,
    (r) => r.siteName,
    (r) => r.orderedMinor + r.rentalMinor,
  );
  const money = (v: number) => formatMoney(Math.round(v * 100), currency);
  return (
    <div className="flex flex-col gap-5">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <p className="text-sm text-fg-muted">
          {data!.from} to {data!.to}: {formatMoney(total, currency)} in all, of which cylinder rental {formatMoney(rental, currency)}. Amounts in {currency}
          {data!.currencies.length > 1 ? ` (other currencies are in the CSV)` : ''}.
        </p>
        <a
          className="inline-flex min-h-11 items-center gap-2 rounded-lg border border-line-strong px-4 font-bold text-primary hover:bg-primary-soft"
          href={spendCsvUrl(siteId)}
        >
          <Icon name="download" /> Export CSV
        </a>
      </div>
      <Card>
        <CardBody>
          <ChartFrame
            title="Spend by month"
            caption="Orders placed and cylinder rental (cylinders on site × days × the supplier’s daily rate)"
            summary={`Monthly spend from ${data!.from} to ${data!.to}; total ${formatMoney(total, currency)}.`}
            height={280}
          >
            <ResponsiveContainer width="100%" height="100%">
              <BarChart data={byMonth} margin={{ top: 8, right: 8, bottom: 0, left: 8 }}>
                <CartesianGrid strokeDasharray="3 3" vertical={false} />
                <XAxis dataKey="month" tick={{ fontSize: 12 }} />
                <YAxis tickFormatter={(v: number) => formatNumber(v)} tick={{ fontSize: 12 }} width={56} />
                <Tooltip formatter={(v) => money(Number(v))} />
                <Legend />
                <Bar dataKey="orders" name="Orders" stackId="a" fill={COLOURS[0]} />
                <Bar dataKey="rental" name="Cylinder rental" stackId="a" fill={COLOURS[1]} />
              </BarChart>
            </ResponsiveContainer>
          </ChartFrame>
        </CardBody>
      </Card>
      <Card>
        <CardBody>
          <ChartFrame title="Spend by gas" caption="Orders and rental, by month" summary={`Spend by gas: ${gases.join(', ')}.`} height={240}>
            <ResponsiveContainer width="100%" height="100%">
              <BarChart data={byMonthGas} margin={{ top: 8, right: 8, bottom: 0, left: 8 }}>
                <CartesianGrid strokeDasharray="3 3" vertical={false} />
                <XAxis dataKey="month" tick={{ fontSize: 12 }} />
                <YAxis tickFormatter={(v: number) => formatNumber(v)} tick={{ fontSize: 12 }} width={56} />
                <Tooltip formatter={(v) => money(Number(v))} />
                <Legend />
                {gases.map((g, i) => (
                  <Bar key={g} dataKey={g} name={GAS_INFO[g as GasCode]?.name ?? g} stackId="g" fill={COLOURS[i % COLOURS.length]} />
                ))}
              </BarChart>
            </ResponsiveContainer>
          </ChartFrame>
        </CardBody>
      </Card>
      <div className="grid gap-5 md:grid-cols-2">
        {[
          ['By supplier', bySupplier],
          ['By site', bySite],
        ].map(([title, m]) => (
          <Card key={title as string}>
            <CardHeader title={title as string} headingLevel={3} />
            <CardBody>
              <table className="w-full tabular">
                <tbody>
                  {[...(m as Map<string, number>)]
                    .sort((a, b) => b[1] - a[1])
                    .map(([k, v]) => (
                      <tr key={k} className="border-t border-line">
                        <td className="py-2">{k}</td>
                        <td className="py-2 text-right font-bold">{formatMoney(v, currency)}</td>
                      </tr>
                    ))}
                </tbody>
              </table>
            </CardBody>
          </Card>
        ))}
      </div>
    </div>
  );
}
