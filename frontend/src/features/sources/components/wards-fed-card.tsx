import { Link } from 'react-router-dom';
import { formatNumber } from '@/lib/format';
import { Card, CardHeader } from '@/components/ui/card';
import { Icon } from '@/components/ui/icons';
import { EmptyState } from '@/components/ui/states';
import type { SourceDetail } from '../api/sources-api';

/** The wards that draw on this source as their primary supply of its gas. */
export function WardsFedCard({ detail }: { detail: SourceDetail }) {
  const wards = detail.wardsFed;
  return (
    <Card>
      <CardHeader title="Wards fed" description="Their therapy lines make up the modelled demand." />
      {wards.length === 0 ? (
        <EmptyState title="No ward draws on this source" className="py-6">
          A ward’s feeds (on its ward page) name its primary source for each gas.
        </EmptyState>
      ) : (
        <ul className="divide-y divide-line">
          {wards.map((w) => (
            <li key={w.id}>
              <Link to={`/wards/${w.id}`} className="flex min-h-12 items-center justify-between gap-3 px-4 py-2 hover:bg-primary-soft sm:px-5">
                <span>
                  <span className="font-bold text-primary underline-offset-2 hover:underline">{w.name}</span>
                  <span className="block text-sm text-fg-muted">
                    {formatNumber(w.beds)} beds · leakage {formatNumber(w.leakagePercent, 1)} %{w.active ? '' : ' · closed'}
                  </span>
                </span>
                <Icon name="chevronRight" className="text-fg-muted" />
              </Link>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
