import { useState } from 'react';
import { formatDateTime, formatKg, formatNumber, formatRelative } from '@/lib/format';
import { toast } from '@/lib/toast';
import { Button } from '@/components/ui/button';
import { Card, CardHeader } from '@/components/ui/card';
import { Dialog } from '@/components/ui/dialog';
import { Icon } from '@/components/ui/icons';
import { EmptyState } from '@/components/ui/states';
import { useCancelDelivery, type SourceDetail } from '../api/sources-api';
import { DeliveryForm } from './delivery-form';

/** Scheduled deliveries to this source; those who order can add and cancel them. */
export function DeliveriesCard({ detail, canSchedule, onSaved }: { detail: SourceDetail; canSchedule: boolean; onSaved?: () => void }) {
  const tz = detail.site.timeZone;
  const [open, setOpen] = useState(false);
  const [confirmId, setConfirmId] = useState<number | null>(null);
  const cancel = useCancelDelivery(onSaved);
  return (
    <Card>
      <CardHeader
        title="Scheduled deliveries"
        description="Counted in the forecast at their due time."
        actions={
          canSchedule && (
            <Button variant="secondary" size="sm" onClick={() => setOpen(true)}>
              <Icon name="plus" className="size-4" />
              Schedule a delivery
            </Button>
          )
        }
      />
      {detail.deliveries.length === 0 ? (
        <EmptyState title="None scheduled" icon="supplier" className="py-6">
          {canSchedule ? 'Add a delivery the supplier has confirmed.' : 'A facilities manager or purchasing officer schedules deliveries.'}
        </EmptyState>
      ) : (
        <ul className="divide-y divide-line">
          {detail.deliveries.map((d) => (
            <li key={d.id} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3 sm:px-5">
              <div>
                <p className="font-bold">
                  {d.kg !== null ? formatKg(d.kg) : `${formatNumber(d.cylinders)} cylinders`} · {formatDateTime(d.dueAt, tz)}
                </p>
                <p className="text-sm text-fg-muted">
                  {formatRelative(d.dueAt)}
                  {d.reference && ` · ${d.reference}`}
                </p>
              </div>
              {canSchedule &&
                (confirmId === d.id ? (
                  <span className="flex flex-wrap items-center gap-2">
                    <span className="text-sm">Cancel this delivery?</span>
                    <Button
                      variant="danger"
                      size="sm"
                      busy={cancel.isPending}
                      onClick={() =>
                        cancel.mutate(d.id, {
                          onSuccess: () => {
                            toast.ok('Delivery cancelled.');
                            setConfirmId(null);
                          },
                        })
                      }
                    >
                      Cancel delivery
                    </Button>
                    <Button variant="secondary" size="sm" onClick={() => setConfirmId(null)}>
                      Keep
                    </Button>
                  </span>
                ) : (
                  <Button variant="ghost" size="sm" onClick={() => setConfirmId(d.id)}>
                    Cancel…
                  </Button>
                ))}
            </li>
          ))}
        </ul>
      )}
      <Dialog open={open} onClose={() => setOpen(false)} title="Schedule a delivery" description={detail.source.name}>
        {open && <DeliveryForm detail={detail} onDone={() => setOpen(false)} onSaved={onSaved} />}
      </Dialog>
    </Card>
  );
}
