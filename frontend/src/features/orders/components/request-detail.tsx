import { useState } from 'react';
import { Link } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { errorMessage, isApiError } from '@/lib/api-client';
import { formatDateTime, formatDays, formatMoney } from '@/lib/format';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Field, Input, Textarea } from '@/components/ui/field';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { newIdempotencyKey, ordersQueries, useChangeQuantity, useRequestDecision, type RequestDetail } from '../api/orders-api';
import { OrderStatusBadge } from './status-badge';
import { ACTION_TEXT, formatOrderQuantity } from './format-order';

function Fact({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div>
      <dt className="text-sm text-fg-muted">{label}</dt>
      <dd className="font-bold">{children}</dd>
    </div>
  );
}

/** A request: what, how much, why, its timeline, and what the person may do with it (and why not). */
export function RequestDetailView({ id }: { id: number }) {
  const q = useQuery(ordersQueries.request(id));
  if (q.isPending) return <LoadingState label="Loading the request…" />;
  if (q.isError) return <ErrorState error={q.error} onRetry={() => q.refetch()} />;
  const r = q.data;
  return (
    <div className="grid gap-5 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
      <div className="flex flex-col gap-5">
        <Card>
          <CardHeader
            title={`${r.reference} · ${r.sourceName}`}
            description={`${r.siteName} · ${r.description}`}
            actions={<OrderStatusBadge status={r.status} text={r.statusText} />}
          />
          <CardBody>
            <dl className="grid grid-cols-2 gap-4 sm:grid-cols-3">
              <Fact label="Quantity">{formatOrderQuantity(r.quantity, r.unit)}</Fact>
              <Fact label="Suggested">{formatOrderQuantity(r.suggestedQuantity, r.unit)}</Fact>
              <Fact label="Total">{r.totalMinor === null ? 'no price' : formatMoney(r.totalMinor, r.currency)}</Fact>
              <Fact label="Unit price">
                {r.unitPriceMinor === null ? '–' : `${formatMoney(r.unitPriceMinor, r.currency)} per ${r.unit === 'kg' ? 'kg' : 'cylinder'}`}
              </Fact>
              <Fact label="Supplier">{r.supplierName ?? '–'}</Fact>
              <Fact label="Needed by">{formatDateTime(r.neededBy)}</Fact>
              {r.trigger?.daysOfStock !== undefined && <Fact label="Days of stock when raised">{formatDays(r.trigger.daysOfStock)}</Fact>}
              <Fact label="Raised">{r.origin === 'auto' ? 'by Plenum (forecast)' : `by ${r.requestedBy?.name ?? '–'}`}</Fact>
              {r.amendedBy && <Fact label="Quantity or price last changed">{`by ${r.amendedBy.name}`}</Fact>}
              {r.order && (
                <Fact label="Purchase order">
                  <Link className="text-primary underline" to={`/orders/purchase-orders/${r.order.id}`}>
                    {r.order.poNumber}
                  </Link>
                </Fact>
              )}
            </dl>
            {r.quantityReason && <p className="mt-4 text-sm">Quantity reason: {r.quantityReason}</p>}
            {r.problem && (
              <Alert tone="warn" className="mt-4" title="This request cannot go on yet">
                {r.problem}
              </Alert>
            )}
            <p className="mt-4 text-sm text-fg-muted">
              <Link className="text-primary underline" to={`/sources/${r.sourceId}`}>
                Open the source and its forecast
              </Link>{' '}
              · Planning estimate only: the site’s authorised person and the supplier’s instructions decide.
            </p>
          </CardBody>
        </Card>
        <Card>
          <CardHeader title="Timeline" />
          <CardBody>
            <ol className="flex flex-col gap-3 border-l-2 border-line pl-4">
              {r.timeline.map((e, i) => (
                <li key={i} className="relative">
                  <span className="absolute top-1.5 -left-[1.4rem] size-3 rounded-full border-2 border-surface bg-primary" aria-hidden="true" />
                  <div className="font-bold">{ACTION_TEXT[e.action] ?? e.action}</div>
                  <div className="text-sm text-fg-muted">
                    {formatDateTime(e.at)} · {e.by}
                  </div>
                  {e.comment && <div className="text-sm">{e.comment}</div>}
                  {e.action === 'quantity_changed' && e.detail && (
                    <div className="text-sm">
                      {String(e.detail.from)} → {String(e.detail.to)} {String(e.detail.unit)}
                    </div>
                  )}
                  {e.action === 'submitted' && e.detail?.priceChanged !== undefined && (
                    <div className="text-sm">{priceChangeText(e.detail.priceChanged as { from: number | null; to: number; currency: string })}</div>
                  )}
                </li>
              ))}
            </ol>
          </CardBody>
        </Card>
      </div>
      <DecisionPanel r={r} />
    </div>
  );
}

function DecisionPanel({ r }: { r: RequestDetail }) {
  const decide = useRequestDecision(r.id);
  const change = useChangeQuantity(r.id);
  const [comment, setComment] = useState('');
  const [quantity, setQuantity] = useState(String(r.quantity));
  const [reason, setReason] = useState('');
  // One key per intended decision: a double click or a retry sends it again and gets the same answer.
  const [key, setKey] = useState(() => newIdempotencyKey(`req-${r.id}`));
  const [error, setError] = useState<string | null>(null);
  const run = (kind: 'approve' | 'reject' | 'submit' | 'cancel') =>
    decide.mutate(
      { kind, comment, reason: comment, version: r.version, key: `${key}-${kind}` },
      {
        onSuccess: (d) => {
          setError(null);
          setComment('');
          setKey(newIdempotencyKey(`req-${r.id}`));
          toast.ok(
            kind === 'approve'
              ? d.status === 'approved'
                ? `Approved: ${d.order?.poNumber ?? 'order'} is on its way to the supplier`
                : 'First approval recorded: a second officer must approve'
              : `Request ${kind === 'submit' ? 'submitted' : kind === 'reject' ? 'rejected' : 'cancelled'}`,
          );
        },
        onError: (e) => setError(isApiError(e) ? e.message : errorMessage(e)),
      },
    );
  const a = r.actions;
  const anything = a.approve.allowed || a.reject.allowed || a.submit.allowed || a.cancel.allowed;
  return (
    <div className="flex flex-col gap-5">
      <Card>
        <CardHeader
          title="Decision"
          description={r.myApprovalLimit ? `Your approval limit: ${formatMoney(r.myApprovalLimit.limitMinor, r.myApprovalLimit.currency)}` : undefined}
        />
        <CardBody className="flex flex-col gap-4">
          {r.approvals.length > 0 && (
            <Alert tone="info" title="Approvals so far">
              {r.approvals.map((x) => `${x.name} (${formatDateTime(x.at)})`).join(', ')}
            </Alert>
          )}
          {error && (
            <Alert tone="critical" role="alert" title="Not done">
              {error}
            </Alert>
          )}
          {!a.approve.allowed && a.approve.reason && r.status === 'submitted' && (
            <Alert tone="warn" title="You cannot approve this request">
              {a.approve.reason}
            </Alert>
          )}
          {anything ? (
            <>
              <Field label="Comment" hint="Required to reject or cancel; kept on the timeline.">
                {(c) => <Textarea {...c} rows={3} value={comment} onChange={(e) => setComment(e.target.value)} maxLength={1000} />}
              </Field>
              <div className="flex flex-wrap gap-2">
                {a.approve.allowed && (
                  <Button busy={decide.isPending} onClick={() => run('approve')}>
                    Approve {r.totalMinor !== null ? formatMoney(r.totalMinor, r.currency) : ''}
                  </Button>
                )}
                {a.submit.allowed && (
                  <Button busy={decide.isPending} onClick={() => run('submit')}>
                    Submit for approval
                  </Button>
                )}
                {a.reject.allowed && (
                  <Button variant="danger" busy={decide.isPending} onClick={() => run('reject')}>
                    Reject
                  </Button>
                )}
                {a.cancel.allowed && (
                  <Button variant="secondary" busy={decide.isPending} onClick={() => run('cancel')}>
                    Cancel request
                  </Button>
                )}
              </div>
            </>
          ) : (
            <p className="text-sm text-fg-muted">Nothing to decide: {r.statusText.toLowerCase()}.</p>
          )}
        </CardBody>
      </Card>
      {a.changeQuantity.allowed && (
        <Card>
          <CardHeader
            title="Change the quantity"
            description={`Suggested: ${formatOrderQuantity(r.suggestedQuantity, r.unit)}. A change clears approvals given so far.`}
          />
          <CardBody>
            <form
              className="flex flex-col gap-3"
              onSubmit={(e) => {
                e.preventDefault();
                change.mutate(
                  { quantity: Number(quantity), reason, version: r.version },
                  {
                    onSuccess: () => {
                      setReason('');
                      toast.ok('Quantity changed');
                    },
                    onError: (err) => toast.error(errorMessage(err)),
                  },
                );
              }}
            >
              <Field label={`Quantity (${r.unit})`}>
                {(c) => (
                  <Input {...c} type="number" min={0} step={r.unit === 'kg' ? 1 : 1} value={quantity} onChange={(e) => setQuantity(e.target.value)} required />
                )}
              </Field>
              <Field label="Reason">{(c) => <Input {...c} value={reason} onChange={(e) => setReason(e.target.value)} minLength={3} required />}</Field>
              <div>
                <Button type="submit" variant="secondary" busy={change.isPending}>
                  Change quantity
                </Button>
              </div>
            </form>
          </CardBody>
        </Card>
      )}
    </div>
  );
}

function priceChangeText(p: { from: number | null; to: number; currency: string }): string {
  return `Price from the list: ${p.from === null ? 'none' : formatMoney(p.from, p.currency)} → ${formatMoney(p.to, p.currency)}`;
}
