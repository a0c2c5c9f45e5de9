import { useState } from 'react';
import { Controller, useFieldArray, useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { GAS_CODES_CATALOGUE, supplierSchema } from '@common/schemas/admin.schema';
import { applyServerErrors } from '@/lib/form-errors';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { FormActions } from '@/components/ui/dialog';
import { Checkbox, Field, FieldError, Input, Select, UnitInput } from '@/components/ui/field';
import { Icon } from '@/components/ui/icons';
import { MoneyInput } from '@/components/ui/money-input';
import { useSaveSupplier, type CylinderType, type Gas, type Supplier } from '../api/catalogue-api';

const FIELDS = ['name', 'orderEmail', 'phone', 'leadTimeHours', 'rentalMinorPerCylinderDay', 'minBulkDropKg', 'currency', 'active', 'prices'] as const;
const optionalId = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));
const optionalCode = (v: unknown) => (v === '' || v === null || v === undefined ? null : String(v));

export function SupplierForm({
  initial,
  gases,
  cylinderTypes,
  defaultCurrency,
  onDone,
}: {
  initial: Supplier | null;
  gases: Gas[];
  cylinderTypes: CylinderType[];
  defaultCurrency: string;
  onDone: () => void;
}) {
  const save = useSaveSupplier();
  const [banner, setBanner] = useState<string | null>(null);
  const { register, handleSubmit, setError, control, formState } = useForm({
    resolver: zodResolver(supplierSchema),
    defaultValues: initial
      ? {
          name: initial.name,
          orderEmail: initial.orderEmail,
          phone: initial.phone,
          leadTimeHours: String(initial.leadTimeHours),
          rentalMinorPerCylinderDay: initial.rentalMinorPerCylinderDay,
          minBulkDropKg: String(initial.minBulkDropKg),
          currency: initial.currency,
          active: initial.active,
          prices: initial.prices.map((p) => ({
            cylinderTypeId: p.cylinderTypeId,
            gasCode: p.gasCode as (typeof GAS_CODES_CATALOGUE)[number] | null,
            unit: p.unit,
            priceMinor: p.priceMinor,
          })),
        }
      : {
          name: '',
          orderEmail: '',
          phone: '',
          leadTimeHours: '24',
          rentalMinorPerCylinderDay: 0,
          minBulkDropKg: '0',
          currency: defaultCurrency,
          active: true,
          prices: [],
        },
  });
  const prices = useFieldArray({ control, name: 'prices' });
  const currency = String(useWatch({ control, name: 'currency' }) || defaultCurrency);
  const units = useWatch({ control, name: 'prices' }) ?? [];
  const gasName = (code: string) => gases.find((g) => g.code === code)?.name ?? code;

  const onSubmit = handleSubmit((body) => {
    setBanner(null);
    save.mutate(
      { id: initial?.id, body },
      {
        onSuccess: (saved) => {
          toast.ok(`Saved ${saved.name}.`);
          onDone();
        },
        onError: (error) => setBanner(applyServerErrors(error, setError, FIELDS)),
      },
    );
  });

  const e = formState.errors;
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {banner && (
        <Alert tone="critical" title="Not saved" role="alert">
          {banner}
        </Alert>
      )}
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Name" error={e.name?.message} className="sm:col-span-2">
          {(c) => <Input {...c} {...register('name')} />}
        </Field>
        <Field label="Order e-mail" hint="Purchase orders go to this address." error={e.orderEmail?.message}>
          {(c) => <Input {...c} {...register('orderEmail')} type="email" autoCapitalize="none" spellCheck={false} />}
        </Field>
        <Field label="Phone" error={e.phone?.message}>
          {(c) => <Input {...c} {...register('phone')} type="tel" />}
        </Field>
        <Field label="Lead time" hint="From order to delivery." error={e.leadTimeHours?.message}>
          {(c) => <UnitInput {...c} {...register('leadTimeHours')} unit="hours" inputMode="numeric" />}
        </Field>
        <Field label="Currency" error={e.currency?.message}>
          {(c) => <Input {...c} {...register('currency')} maxLength={3} autoCapitalize="characters" className="uppercase" />}
        </Field>
        <Field label="Cylinder rental per cylinder and day" error={e.rentalMinorPerCylinderDay?.message}>
          {(c) => (
            <Controller
              control={control}
              name="rentalMinorPerCylinderDay"
              render={({ field }) => <MoneyInput {...c} currency={currency} value={field.value as number} onChange={field.onChange} onBlur={field.onBlur} />}
            />
          )}
        </Field>
        <Field label="Smallest bulk delivery" error={e.minBulkDropKg?.message}>
          {(c) => <UnitInput {...c} {...register('minBulkDropKg')} unit="kg" inputMode="decimal" />}
        </Field>
      </div>
      <Checkbox label="Active (can receive orders)" {...register('active')} />

      <fieldset className="flex flex-col gap-3 rounded-lg border border-line p-3">
        <legend className="px-1 font-bold">Prices</legend>
        {prices.fields.length === 0 && <p className="text-sm text-fg-muted">No prices yet. Add one per cylinder type, or per kg for bulk liquid.</p>}
        {prices.fields.map((f, i) => {
          const unit = units[i]?.unit ?? f.unit;
          const pe = e.prices?.[i];
          return (
            <div key={f.id} className="grid gap-3 rounded-lg bg-surface-sunken p-3 sm:grid-cols-[8rem_1fr_10rem_auto] sm:items-start">
              <Field label="Priced per" error={pe?.unit?.message}>
                {(c) => (
                  <Select {...c} {...register(`prices.${i}.unit`)}>
                    <option value="cylinder">cylinder</option>
                    <option value="kg">kg</option>
                  </Select>
                )}
              </Field>
              {unit === 'kg' ? (
                <Field label="Gas" error={pe?.gasCode?.message}>
                  {(c) => (
                    <Select {...c} {...register(`prices.${i}.gasCode`, { setValueAs: optionalCode })}>
                      <option value="">Choose…</option>
                      {GAS_CODES_CATALOGUE.map((code) => (
                        <option key={code} value={code}>
                          {gasName(code)}
                        </option>
                      ))}
                    </Select>
                  )}
                </Field>
              ) : (
                <Field label="Cylinder type" error={pe?.cylinderTypeId?.message}>
                  {(c) => (
                    <Select {...c} {...register(`prices.${i}.cylinderTypeId`, { setValueAs: optionalId })}>
                      <option value="">Choose…</option>
                      {cylinderTypes.map((t) => (
                        <option key={t.id} value={t.id}>
                          {gasName(t.gasCode)} · {t.name}
                          {t.active ? '' : ' (retired)'}
                        </option>
                      ))}
                    </Select>
                  )}
                </Field>
              )}
              <Field label="Price" error={pe?.priceMinor?.message}>
                {(c) => (
                  <Controller
                    control={control}
                    name={`prices.${i}.priceMinor`}
                    render={({ field }) => <MoneyInput {...c} currency={currency} value={field.value} onChange={field.onChange} onBlur={field.onBlur} />}
                  />
                )}
              </Field>
              <Button variant="ghost" onClick={() => prices.remove(i)} className="sm:mt-6" aria-label={`Remove price ${i + 1}`}>
                <Icon name="close" />
                Remove
              </Button>
            </div>
          );
        })}
        {e.prices?.message && <FieldError>{e.prices.message}</FieldError>}
        <div>
          <Button variant="secondary" onClick={() => prices.append({ unit: 'cylinder', cylinderTypeId: null, gasCode: null, priceMinor: NaN })}>
            <Icon name="plus" />
            Add price
          </Button>
        </div>
      </fieldset>
      <FormActions onCancel={onDone} busy={save.isPending} />
    </form>
  );
}
