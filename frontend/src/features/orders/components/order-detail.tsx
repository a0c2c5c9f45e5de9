import { useState } from 'react';
import { Link } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { errorMessage } from '@/lib/api-client';
import { formatDateTime, formatMoney } from '@/lib/format';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Field, Input } from '@/components/ui/field';
import { Icon } from '@/components/ui/icons';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { newIdempotencyKey, orderPdfUrl, ordersQueries, useRecordDelivery, type OrderDetail } from '../api/orders-api';
import { OrderStatusBadge } from './status-badge';
import { formatOrderQuantity } from './format-order';

/** A purchase order: its PDF, its e-mail's progress, and the delivery against it. */
export function OrderDetailView({ id }: { id: number }) {
  const q = useQuery(ordersQueries.order(id));
  if (q.isPending) return <LoadingState label="Loading the order…" />;
  if (q.isError) return <ErrorState error={q.error} onRetry={() => q.refetch()} />;
  const o = q.data;
  const open = o.status === 'approved' || o.status === 'ordered';
  return (
    <div className="grid gap-5 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
      <div className="flex flex-col gap-5">
        <Card>
          <CardHeader
            title={`${o.poNumber} · ${o.supplierName}`}
            description={`${o.siteName} · ${o.sourceName}`}
            actions={<OrderStatusBadge status={o.status} text={o.statusText} />}
          />
          <CardBody className="flex flex-col gap-4">
            <table className="w-full text-left">
              <thead className="text-sm text-fg-muted">
                <tr>
                  <th className="py-1 font-bold">Item</th>
                  <th className="py-1 text-right font-bold">Quantity</th>
                  <th className="py-1 text-right font-bold">Unit price</th>
                  <th className="py-1 text-right font-bold">Amount</th>
                </tr>
              </thead>
              <tbody className="tabular">
                <tr className="border-t border-line">
                  <td className="py-2">{o.description}</td>
                  <td className="py-2 text-right">{formatOrderQuantity(o.quantity, o.unit)}</td>
                  <td className="py-2 text-right">{formatMoney(o.unitPriceMinor, o.currency)}</td>
                  <td className="py-2 text-right font-bold">{formatMoney(o.totalMinor, o.currency)}</td>
                </tr>
              </tbody>
            </table>
            <dl className="grid gap-3 sm:grid-cols-2">
              <div>
                <dt className="text-sm text-fg-muted">Delivery window</dt>
                <dd className="font-bold">
                  {formatDateTime(o.windowStart)} – {formatDateTime(o.windowEnd)}
                </dd>
              </div>
              <div>
                <dt className="text-sm text-fg-muted">Deliver to</dt>
                <dd className="font-bold whitespace-pre-line">{o.deliveryAddress}</dd>
              </div>
              <div>
                <dt className="text-sm text-fg-muted">Contact</dt>
                <dd className="font-bold">
                  {o.contact.name} · {o.contact.email}
                </dd>
              </div>
              <div>
                <dt className="text-sm text-fg-muted">Approved by</dt>
                <dd className="font-bold">{o.approvedBy.map((a) => a.name).join(', ')}</dd>
              </div>
            </dl>
            <div className="flex flex-wrap gap-2">
              <a
                className="inline-flex min-h-11 items-center gap-2 rounded-lg border border-line-strong px-4 font-bold text-primary hover:bg-primary-soft"
                href={orderPdfUrl(o.id)}
                target="_blank"
                rel="noreferrer"
              >
                <Icon name="paperclip" /> Open the PDF
              </a>
              <a
                className="inline-flex min-h-11 items-center gap-2 rounded-lg border border-line-strong px-4 font-bold text-primary hover:bg-primary-soft"
                href={orderPdfUrl(o.id, true)}
              >
                <Icon name="download" /> Download
              </a>
              <Link className="inline-flex min-h-11 items-center px-2 font-bold text-primary underline" to={`/orders/requests/${o.request.id}`}>
                Request {o.request.reference}
              </Link>
            </div>
          </CardBody>
        </Card>
        <Card>
          <CardHeader title="E-mail to the supplier" />
          <CardBody className="flex flex-col gap-2">
            {o.emails.map((e) => (
              <div key={e.id} className="text-sm">
                <span className="font-bold">
                  {e.status === 'sent'
                    ? `Sent ${formatDateTime(e.sentAt)}`
                    : e.status === 'failed'
                      ? 'Failed: an administrator can send it again'
                      : `Queued${e.attempts ? ` (attempt ${e.attempts + 1} at ${formatDateTime(e.nextAttemptAt)})` : ''}`}
                </span>{' '}
                to {e.to}
                {e.cc && `, copy to ${e.cc}`}
                {e.lastError && e.status !== 'sent' && <div className="text-critical">{e.lastError}</div>}
              </div>
            ))}
          </CardBody>
        </Card>
      </div>
      {o.delivery ? (
        <Card>
          <CardHeader title="Delivery" />
          <CardBody>
            <dl className="grid gap-3">
              <div>
                <dt className="text-sm text-fg-muted">Delivery note</dt>
                <dd className="font-bold">{o.delivery.deliveryNote}</dd>
              </div>
              <div>
                <dt className="text-sm text-fg-muted">Delivered</dt>
                <dd className="font-bold">
                  {formatOrderQuantity(o.delivery.quantity, o.delivery.unit)} of {formatOrderQuantity(o.quantity, o.unit)} ·{' '}
                  {formatDateTime(o.delivery.deliveredAt)}
                </dd>
              </div>
              <div>
                <dt className="text-sm text-fg-muted">Empty cylinders collected</dt>
                <dd className="font-bold">{o.delivery.emptiesCollected}</dd>
              </div>
            </dl>
          </CardBody>
        </Card>
      ) : open ? (
        <DeliveryForm o={o} />
      ) : null}
    </div>
  );
}

function localNow(): string {
  const d = new Date();
  d.setMinutes(d.getMinutes() - d.getTimezoneOffset());
  return d.toISOString().slice(0, 16);
}

function DeliveryForm({ o }: { o: OrderDetail }) {
  const record = useRecordDelivery(o.id);
  const [note, setNote] = useState('');
  const [at, setAt] = useState(localNow);
  const [quantity, setQuantity] = useState(String(o.quantity));
  const [empties, setEmpties] = useState('0');
  const [key] = useState(() => newIdempotencyKey(`delivery-${o.id}`));
  const [error, setError] = useState<string | null>(null);
  const short = Number(quantity) < o.quantity;
  return (
    <Card>
      <CardHeader title="Record the delivery" description="Stock and the forecast update at once from the delivery note." />
      <CardBody>
        <form
          className="flex flex-col gap-3"
          onSubmit={(e) => {
            e.preventDefault();
            record.mutate(
              { deliveryNote: note, deliveredAt: new Date(at).toISOString(), quantity: Number(quantity), emptiesCollected: Number(empties), note: '', key },
              { onSuccess: () => toast.ok('Delivery recorded: stock and forecast updated'), onError: (err) => setError(errorMessage(err)) },
            );
          }}
        >
          {error && (
            <Alert tone="critical" role="alert" title="Not recorded">
              {error}
            </Alert>
          )}
          <Field label="Delivery-note number">{(c) => <Input {...c} value={note} onChange={(e) => setNote(e.target.value)} required maxLength={60} />}</Field>
          <Field label="Delivered at">{(c) => <Input {...c} type="datetime-local" value={at} onChange={(e) => setAt(e.target.value)} required />}</Field>
          <Field label={`Delivered (${o.unit === 'kg' ? 'kg' : 'cylinders'})`} hint={`Ordered: ${formatOrderQuantity(o.quantity, o.unit)}`}>
            {(c) => (
              <Input {...c} type="number" min={0} step={o.unit === 'kg' ? 'any' : 1} value={quantity} onChange={(e) => setQuantity(e.target.value)} required />
            )}
          </Field>
          {o.unit === 'cylinders' && (
            <Field label="Empty cylinders collected">
              {(c) => <Input {...c} type="number" min={0} step={1} value={empties} onChange={(e) => setEmpties(e.target.value)} />}
            </Field>
          )}
          {short && <Alert tone="warn">A short delivery closes the order in part; if the source still runs low, Plenum raises a new request.</Alert>}
          <div>
            <Button type="submit" busy={record.isPending}>
              Record delivery
            </Button>
          </div>
        </form>
      </CardBody>
    </Card>
  );
}
