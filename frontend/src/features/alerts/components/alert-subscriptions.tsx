import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { subscriptionSchema, type SubscriptionInput } from '@common/schemas/orders.schema';
import { errorMessage } from '@/lib/api-client';
import { formatDateTime, formatNumber } from '@/lib/format';
import { applyServerErrors } from '@/lib/form-errors';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Dialog, FormActions } from '@/components/ui/dialog';
import { Field, FieldError, UnitInput, humaniseMessage } from '@/components/ui/field';
import { Icon } from '@/components/ui/icons';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { subscriptionQueries, useDeleteSubscription, useSetSubscription, type Subscription } from '../api/subscriptions-api';

const MODE_TEXT: Record<SubscriptionInput['mode'], { label: string; hint: string }> = {
  immediate: { label: 'At once', hint: 'one e-mail for each change, as it happens' },
  digest: { label: 'Daily digest', hint: 'one e-mail a day gathering the changes' },
};
/** A starting alert level for a new subscription; the person sets their own before saving. */
const DEFAULT_POLICY_DAYS = 3;

function daysText(d: number): string {
  return `${formatNumber(d, d < 10 ? 1 : 0)} ${d === 1 ? 'day' : 'days'}`;
}

/**
 * The signed-in person's stock alerts, one line per site they can see: an e-mail when a source's days of
 * stock fall below their level or its first forecast risk changes, at once or in a daily digest.
 */
export function AlertSubscriptions({ sites }: { sites: { id: number; name: string }[] }) {
  const subs = useQuery(subscriptionQueries.mine());
  const remove = useDeleteSubscription();
  const [editing, setEditing] = useState<{ siteId: number; siteName: string; current: Subscription | null } | null>(null);
  if (sites.length === 0)
    return (
      <EmptyState title="No sites yet" icon="sites">
        Alerts are set per site; an administrator grants you sites.
      </EmptyState>
    );
  if (subs.isPending) return <LoadingState label="Loading your alerts…" />;
  if (subs.isError) return <ErrorState error={subs.error} onRetry={() => subs.refetch()} />;
  const bySite = new Map(subs.data.map((s) => [s.siteId, s]));
  return (
    <>
      <ul className="-my-2 divide-y divide-line">
        {sites.map((site) => {
          const sub = bySite.get(site.id) ?? null;
          return (
            <li key={site.id} className="flex flex-wrap items-center justify-between gap-3 py-3">
              <div className="min-w-0">
                <p className="font-bold">{site.name}</p>
                {sub ? (
                  <p className="text-sm text-fg-muted">
                    Below {daysText(sub.policyDays)} of stock · {MODE_TEXT[sub.mode].label.toLowerCase()}
                    {sub.mode === 'digest' && sub.lastDigestAt ? ` · last digest ${formatDateTime(sub.lastDigestAt)}` : ''}
                  </p>
                ) : (
                  <p className="text-sm text-fg-muted">No e-mails for this site</p>
                )}
              </div>
              <div className="flex flex-wrap items-center gap-2">
                {sub ? (
                  <Badge tone="ok" icon="check">
                    Subscribed
                  </Badge>
                ) : (
                  <Badge>Not subscribed</Badge>
                )}
                {sub ? (
                  <>
                    <Button
                      variant="ghost"
                      size="sm"
                      onClick={() => setEditing({ siteId: site.id, siteName: site.name, current: sub })}
                      aria-label={`Change alerts for ${site.name}`}
                    >
                      <Icon name="pencil" className="size-4" />
                      Change
                    </Button>
                    <Button
                      variant="secondary"
                      size="sm"
                      busy={remove.isPending && remove.variables === site.id}
                      aria-label={`Unsubscribe from ${site.name}`}
                      onClick={() =>
                        remove.mutate(site.id, { onSuccess: () => toast.ok(`No more alerts for ${site.name}.`), onError: (e) => toast.error(errorMessage(e)) })
                      }
                    >
                      Unsubscribe
                    </Button>
                  </>
                ) : (
                  <Button
                    variant="secondary"
                    size="sm"
                    onClick={() => setEditing({ siteId: site.id, siteName: site.name, current: null })}
                    aria-label={`Subscribe to alerts for ${site.name}`}
                  >
                    <Icon name="mail" className="size-4" />
                    Subscribe
                  </Button>
                )}
              </div>
            </li>
          );
        })}
      </ul>
      <Dialog
        open={editing !== null}
        onClose={() => setEditing(null)}
        title={editing?.current ? `Alerts for ${editing.siteName}` : `Subscribe to ${editing?.siteName ?? ''}`}
      >
        {editing && <SubscriptionForm siteId={editing.siteId} siteName={editing.siteName} current={editing.current} onDone={() => setEditing(null)} />}
      </Dialog>
    </>
  );
}

function SubscriptionForm({ siteId, siteName, current, onDone }: { siteId: number; siteName: string; current: Subscription | null; onDone: () => void }) {
  const save = useSetSubscription();
  const [banner, setBanner] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm({
    resolver: zodResolver(subscriptionSchema),
    defaultValues: { mode: current?.mode ?? 'immediate', policyDays: current?.policyDays ?? DEFAULT_POLICY_DAYS },
  });
  const e = formState.errors;
  const onSubmit = handleSubmit((body) => {
    setBanner(null);
    save.mutate(
      { siteId, body },
      {
        onSuccess: () => {
          toast.ok(current ? `Alerts for ${siteName} saved.` : `You will get alerts for ${siteName}.`);
          onDone();
        },
        onError: (error) => setBanner(applyServerErrors(error, setError, ['mode', 'policyDays'])),
      },
    );
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {banner && (
        <Alert tone="critical" title="Not saved" role="alert">
          {banner}
        </Alert>
      )}
      <Field
        label="Alert below"
        hint="An e-mail when a source’s forecast days of stock fall below this, or its first forecast risk changes."
        error={e.policyDays?.message}
      >
        {(c) => <UnitInput {...c} {...register('policyDays', { valueAsNumber: true })} unit="days" inputMode="decimal" className="max-w-48" />}
      </Field>
      <fieldset className="flex flex-col gap-1" aria-describedby={e.mode ? 'sub-mode-error' : undefined}>
        <legend className="mb-1 text-sm font-bold text-fg">Send</legend>
        {(Object.keys(MODE_TEXT) as SubscriptionInput['mode'][]).map((m) => (
          <label key={m} className="inline-flex min-h-11 cursor-pointer items-center gap-3">
            <input type="radio" value={m} className="size-5 accent-primary" {...register('mode')} />
            <span>
              {MODE_TEXT[m].label} <span className="text-sm text-fg-muted">({MODE_TEXT[m].hint})</span>
            </span>
          </label>
        ))}
        {e.mode?.message && <FieldError id="sub-mode-error">{humaniseMessage(e.mode.message)}</FieldError>}
      </fieldset>
      <p className="text-xs text-fg-muted">
        Alerts are planning estimates from the forecast: they do not replace the site’s own checks, local codes or the authorised person’s judgement.
      </p>
      <FormActions onCancel={onDone} busy={save.isPending} submitLabel={current ? 'Save' : 'Subscribe'} />
    </form>
  );
}
