import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { DateTime } from 'luxon';
import { deliverySchema } from '@common/schemas/supply.schema';
import { bodyResolver } from '@/lib/body-resolver';
import { applyServerErrors } from '@/lib/form-errors';
import { formatDateTime } from '@/lib/format';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { FormActions } from '@/components/ui/dialog';
import { Field, Input, UnitInput } from '@/components/ui/field';
import { useScheduleDelivery, type SourceDetail } from '../api/sources-api';
import { localInputToIso, toLocalInput } from '../lib/site-time';

/** An empty number field: shown blank, and reported by the schema as "must be a number" if left so. */
const BLANK = '' as unknown as number;

interface DeliveryFormValues {
  dueAt: string;
  amount: number;
  reference: string;
}

const FIELDS = ['dueAt', 'amount', 'kg', 'cylinders', 'reference'] as const;

/** Schedule a delivery to this source: kg of liquid for a tank, full cylinders otherwise. */
export function DeliveryForm({ detail, onDone, onSaved }: { detail: SourceDetail; onDone: () => void; onSaved?: () => void }) {
  const { source, site } = detail;
  const tz = site.timeZone;
  const bulk = source.type === 'bulk_liquid';
  const schedule = useScheduleDelivery(source.id, onSaved);
  const [banner, setBanner] = useState<string | null>(null);
  const tomorrow = DateTime.now().setZone(tz).plus({ days: 1 }).set({ hour: 10, minute: 0 });
  const { register, handleSubmit, setError, formState } = useForm<DeliveryFormValues, unknown, ReturnType<typeof deliverySchema.parse>>({
    resolver: bodyResolver<DeliveryFormValues, typeof deliverySchema>(
      deliverySchema,
      (v) => ({ dueAt: localInputToIso(v.dueAt, tz) ?? '', kg: bulk ? v.amount : null, cylinders: bulk ? null : v.amount, reference: v.reference }),
      (p) => (p === 'kg' || p === 'cylinders' ? 'amount' : p),
    ),
    defaultValues: { dueAt: toLocalInput(tomorrow.toJSDate(), tz), amount: BLANK, reference: '' },
  });
  const e = formState.errors;
  const dueError = e.dueAt
    ? /ISO|offset/i.test(e.dueAt.message ?? '')
      ? 'enter the date and time the delivery is due, at the site'
      : e.dueAt.message
    : undefined;

  const onSubmit = handleSubmit((body) => {
    setBanner(null);
    schedule.mutate(body, {
      onSuccess: (saved) => {
        toast.ok(`Delivery scheduled for ${formatDateTime(saved.dueAt, tz)}.`);
        onDone();
      },
      onError: (error) =>
        setBanner(
          applyServerErrors(error, (name, err) => setError((String(name) === 'kg' || String(name) === 'cylinders' ? 'amount' : name) as never, err), FIELDS),
        ),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {banner && (
        <Alert tone="critical" title="Not scheduled" role="alert">
          {banner}
        </Alert>
      )}
      <Field label="Due at" hint={`Site time (${tz}).`} error={dueError}>
        {(c) => <Input {...c} {...register('dueAt')} type="datetime-local" />}
      </Field>
      <Field
        label={bulk ? 'Liquid delivered' : 'Full cylinders delivered'}
        hint={bulk && source.capacityKg ? `The tank holds ${source.capacityKg.toLocaleString('en-GB')} kg when full.` : undefined}
        error={e.amount?.message}
      >
        {(c) => (
          <UnitInput
            {...c}
            {...register('amount', { valueAsNumber: true })}
            unit={bulk ? 'kg' : 'cylinders'}
            inputMode={bulk ? 'decimal' : 'numeric'}
            autoComplete="off"
          />
        )}
      </Field>
      <Field label="Reference" hint="Optional: the supplier’s order or delivery number." error={e.reference?.message}>
        {(c) => <Input {...c} {...register('reference')} maxLength={120} />}
      </Field>
      <p className="text-sm text-fg-muted">The forecast adds this delivery at its due time. A delivery that arrives is recorded with a reading.</p>
      <FormActions onCancel={onDone} busy={schedule.isPending} submitLabel="Schedule delivery" />
    </form>
  );
}
