import { useState } from 'react';
import { Controller, useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { approvalLimitSchema } from '@common/schemas/orders.schema';
import { formatMoney } from '@/lib/format';
import { applyServerErrors } from '@/lib/form-errors';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card, CardHeader } from '@/components/ui/card';
import { Dialog, FormActions } from '@/components/ui/dialog';
import { Field, Select } from '@/components/ui/field';
import { Icon } from '@/components/ui/icons';
import { MoneyInput } from '@/components/ui/money-input';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { approvalLimitQueries, useSetApprovalLimit, type ApprovalLimitRow } from '../api/approval-limits-api';

/** The currency the organisation's sites use most: what a new limit is set in. */
function mainCurrency(currencies: string[]): string {
  const n = new Map<string, number>();
  for (const c of currencies) n.set(c, (n.get(c) ?? 0) + 1);
  return [...n.entries()].sort((a, b) => b[1] - a[1])[0]?.[0] ?? 'GBP';
}

/**
 * Each purchasing officer's approval limit. Within it one approval orders; above it a second officer whose
 * limit covers the total must approve too. An officer with no limit cannot approve.
 */
export function ApprovalLimits({ siteCurrencies }: { siteCurrencies: string[] }) {
  const limits = useQuery(approvalLimitQueries.list());
  const [editing, setEditing] = useState<ApprovalLimitRow | null>(null);
  const currencies = [...new Set(siteCurrencies)].sort();
  const fallback = mainCurrency(siteCurrencies);
  return (
    <Card>
      <CardHeader
        title="Approval limits"
        description="Purchasing officers approve orders up to their limit; above it a second officer whose limit covers the total must approve as well."
      />
      {limits.isPending ? (
        <LoadingState label="Loading approval limits…" />
      ) : limits.isError ? (
        <ErrorState error={limits.error} onRetry={() => limits.refetch()} />
      ) : limits.data.length === 0 ? (
        <EmptyState title="No purchasing officers yet" icon="users">
          Give someone the Purchasing officer role above; their limit can then be set here.
        </EmptyState>
      ) : (
        <ul className="divide-y divide-line">
          {limits.data.map((o) => (
            <li key={o.userId} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3 sm:px-5">
              <div className="min-w-0">
                <p className="font-bold">
                  {o.name}
                  {!o.active && <span className="ml-2 text-sm font-normal text-fg-muted">(inactive)</span>}
                </p>
                <p className="text-xs wrap-anywhere text-fg-muted">{o.email}</p>
              </div>
              <div className="flex flex-wrap items-center gap-3">
                {o.limitMinor === null || o.limitMinor <= 0 || !o.currency ? (
                  <Badge tone="warn" icon="alert">
                    No limit: cannot approve
                  </Badge>
                ) : (
                  <span className="text-lg font-bold tabular">{formatMoney(o.limitMinor, o.currency)}</span>
                )}
                <Button variant="ghost" size="sm" onClick={() => setEditing(o)} aria-label={`Change the approval limit of ${o.name}`}>
                  <Icon name="pencil" className="size-4" />
                  {o.limitMinor === null ? 'Set limit' : 'Change'}
                </Button>
              </div>
            </li>
          ))}
        </ul>
      )}
      <Dialog open={editing !== null} onClose={() => setEditing(null)} title={`Approval limit of ${editing?.name ?? ''}`}>
        {editing && (
          <ApprovalLimitForm
            officer={editing}
            currencies={currencies.length ? currencies : [fallback]}
            defaultCurrency={editing.currency ?? fallback}
            onDone={() => setEditing(null)}
          />
        )}
      </Dialog>
    </Card>
  );
}

function ApprovalLimitForm({
  officer,
  currencies,
  defaultCurrency,
  onDone,
}: {
  officer: ApprovalLimitRow;
  currencies: string[];
  defaultCurrency: string;
  onDone: () => void;
}) {
  const save = useSetApprovalLimit();
  const [banner, setBanner] = useState<string | null>(null);
  const options = currencies.includes(defaultCurrency) ? currencies : [defaultCurrency, ...currencies];
  const { handleSubmit, setError, control, register, watch, formState } = useForm({
    resolver: zodResolver(approvalLimitSchema),
    defaultValues: { limitMinor: officer.limitMinor ?? (undefined as unknown as number), currency: defaultCurrency },
  });
  const currency = watch('currency');
  const e = formState.errors;
  const onSubmit = handleSubmit((body) => {
    setBanner(null);
    save.mutate(
      { userId: officer.userId, body },
      {
        onSuccess: (r) => {
          toast.ok(`${r.name} may approve up to ${formatMoney(r.limitMinor, r.currency ?? body.currency)}.`);
          onDone();
        },
        onError: (error) => setBanner(applyServerErrors(error, setError, ['limitMinor', 'currency'])),
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
      <div className="grid gap-4 sm:grid-cols-[1fr_8rem]">
        <Field label="Limit per order" hint="The total of one order this officer may approve alone. 0 means they cannot approve." error={e.limitMinor?.message}>
          {(c) => (
            <Controller
              control={control}
              name="limitMinor"
              render={({ field }) => (
                <MoneyInput {...c} key={currency} currency={currency} value={field.value} onChange={field.onChange} onBlur={field.onBlur} />
              )}
            />
          )}
        </Field>
        <Field label="Currency" hint={options.length > 1 ? 'As the sites’ orders.' : undefined} error={e.currency?.message}>
          {(c) => (
            <Select {...c} {...register('currency')}>
              {options.map((cur) => (
                <option key={cur} value={cur}>
                  {cur}
                </option>
              ))}
            </Select>
          )}
        </Field>
      </div>
      <FormActions onCancel={onDone} busy={save.isPending} submitLabel="Save limit" />
    </form>
  );
}
