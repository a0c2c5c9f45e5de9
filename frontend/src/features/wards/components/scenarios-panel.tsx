import { useState } from 'react';
import { formatNumber } from '@/lib/format';
import { Button } from '@/components/ui/button';
import { Card, CardHeader } from '@/components/ui/card';
import { Dialog } from '@/components/ui/dialog';
import { Icon } from '@/components/ui/icons';
import { EmptyState } from '@/components/ui/states';
import type { Scenario, Ward } from '../api/wards-api';
import { ScenarioForm } from './scenario-form';

function when(s: Scenario): string {
  const f = (l: string) => l.replace('T', ' ');
  return s.untilLocal ? `${f(s.fromLocal)} to ${f(s.untilLocal)}` : `from ${f(s.fromLocal)}`;
}

function what(s: Scenario, wards: Ward[]): string {
  const ward = s.wardId ? (wards.find((w) => w.id === s.wardId)?.name ?? 'a ward') : null;
  const parts: string[] = [];
  if (s.multiplier !== 1) parts.push(`demand × ${formatNumber(s.multiplier, 2)}`);
  if (s.extraPatients > 0) parts.push(`+${formatNumber(s.extraPatients)} patients at ${formatNumber(s.extraFlowLMin, 1)} L/min`);
  if (s.wardChange && ward) parts.push(`${ward} ${s.wardChange === 'close' ? 'closes' : 'opens'}`);
  if (parts.length === 0) parts.push('no change to demand');
  return `${parts.join(', ')}${ward && !s.wardChange ? ` (${ward})` : ''}`;
}

/** What-ifs the forecasts offer in their scenario switcher; facilities managers keep them. */
export function ScenariosPanel({
  siteId,
  timeZone,
  scenarios,
  wards,
  canEdit,
  defaultWardId,
  description,
  onSaved,
}: {
  siteId: number;
  timeZone?: string;
  scenarios: Scenario[];
  wards: Ward[];
  canEdit: boolean;
  defaultWardId?: number | null;
  description?: string;
  onSaved?: () => void;
}) {
  const [editing, setEditing] = useState<Scenario | 'new' | null>(null);
  return (
    <Card>
      <CardHeader
        title="Scenarios"
        description={description ?? 'Surges, extra patients and ward closures to try on every forecast of the site.'}
        actions={
          canEdit && (
            <Button variant="secondary" size="sm" onClick={() => setEditing('new')}>
              <Icon name="plus" className="size-4" />
              New scenario
            </Button>
          )
        }
      />
      {scenarios.length === 0 ? (
        <EmptyState title="No scenarios yet" className="py-6">
          {canEdit ? 'Add one to see how a surge or a closure moves the reorder dates.' : 'A facilities manager adds scenarios.'}
        </EmptyState>
      ) : (
        <ul className="divide-y divide-line">
          {scenarios.map((s) => (
            <li key={s.id} className="flex items-start justify-between gap-3 px-4 py-3 sm:px-5">
              <div className="min-w-0 flex-1">
                <p className="font-bold">{s.name}</p>
                <p className="text-sm">{what(s, wards)}</p>
                <p className="text-sm text-fg-muted">
                  {when(s)} (site time){s.note ? ` · ${s.note}` : ''}
                </p>
              </div>
              {canEdit && (
                <Button variant="ghost" size="sm" onClick={() => setEditing(s)} aria-label={`Edit scenario ${s.name}`}>
                  <Icon name="pencil" className="size-4" />
                  Edit
                </Button>
              )}
            </li>
          ))}
        </ul>
      )}
      <Dialog open={editing !== null} onClose={() => setEditing(null)} title={editing === 'new' ? 'New scenario' : `Edit ${editing?.name ?? ''}`}>
        {editing !== null && (
          <ScenarioForm
            siteId={siteId}
            timeZone={timeZone}
            wards={wards}
            initial={editing === 'new' ? null : editing}
            defaultWardId={defaultWardId}
            onDone={() => setEditing(null)}
            onSaved={onSaved}
          />
        )}
      </Dialog>
    </Card>
  );
}
