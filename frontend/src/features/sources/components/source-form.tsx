import { useState } from 'react';
import { Controller, useFieldArray, useForm, useWatch } from 'react-hook-form';
import type { z } from 'zod';
import { GAS_CODES_CATALOGUE } from '@common/schemas/admin.schema';
import { FORECAST_BASES, REORDER_MODES, SOURCE_TYPES, sourceSchema } from '@common/schemas/supply.schema';
import { bodyResolver } from '@/lib/body-resolver';
import { applyServerErrors } from '@/lib/form-errors';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { CheckboxGroup } from '@/components/ui/checkbox-group';
import { FormActions } from '@/components/ui/dialog';
import { Checkbox, Field, FieldError, Input, Select, Textarea, UnitInput } from '@/components/ui/field';
import { Icon } from '@/components/ui/icons';
import { useSaveSource, type Source } from '../api/sources-api';
import { BASIS_LABEL, gasName, SOURCE_TYPE_LABEL } from '../lib/source-labels';

/** An empty number field: shown blank, and reported by the schema as "must be a number" if left so. */
const BLANK = '' as unknown as number;

/** The schema's input, with the calibration table always a list (empty means none) for the row editor. */
type SourceFormValues = Omit<z.input<typeof sourceSchema>, 'calibration'> & { calibration: { reading: number; kg: number }[] };
type SourceBody = z.output<typeof sourceSchema>;

/** The few catalogue fields the form needs (the route passes the organisation's catalogue in). */
export interface CylinderTypeOption {
  id: number;
  name: string;
  gasCode: string;
  active: boolean;
}
export interface SupplierOption {
  id: number;
  name: string;
  active: boolean;
  leadTimeHours: number;
}

const FIELDS = Object.keys(sourceSchema.shape);
const optionalNumber = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));
const optionalId = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));

const BULK_ONLY = [
  'capacityKg',
  'evaporationPercentPerDay',
  'operatingPressureBar',
  'vaporiserM3H',
  'vaporiserDerating',
  'minLevelAlarmPercent',
  'reservePercent',
  'calibration',
  'calibrationUnit',
] as const;
const CYLINDER_ONLY = ['cylinderTypeId', 'temperatureC'] as const;
const MANIFOLD_ONLY = ['regulatorLMin', 'changeoverGaugeBar'] as const;

/** Fields that do not apply to the chosen type (typed in before the type changed) are not sent. */
function cleanForType(v: SourceFormValues): unknown {
  const out: Record<string, unknown> = { ...v };
  if (v.type === 'bulk_liquid') for (const k of [...CYLINDER_ONLY, ...MANIFOLD_ONLY, 'cylindersPerBank']) out[k] = null;
  else for (const k of BULK_ONLY) out[k] = null;
  if (v.type !== 'manifold') for (const k of MANIFOLD_ONLY) out[k] = null;
  if (v.type !== 'manifold' && v.type !== 'emergency_reserve') out.cylindersPerBank = null;
  if (v.type !== 'emergency_reserve') out.backsUp = [];
  if (v.reorderMode === 'none') {
    out.reorderLevel = null;
    out.orderUpTo = null;
  }
  if (v.calibration.length === 0) out.calibration = null;
  return out;
}

function defaultsFrom(initial: Source | null): SourceFormValues {
  if (!initial) {
    return {
      name: '',
      type: 'bulk_liquid',
      gasCode: 'O2',
      supplierId: null,
      capacityKg: null,
      evaporationPercentPerDay: null,
      vaporiserM3H: null,
      operatingPressureBar: null,
      vaporiserDerating: null,
      minLevelAlarmPercent: null,
      reservePercent: null,
      calibration: [],
      calibrationUnit: null,
      cylinderTypeId: null,
      cylindersPerBank: null,
      regulatorLMin: null,
      changeoverGaugeBar: null,
      temperatureC: null,
      backsUp: [],
      reorderMode: 'none',
      reorderLevel: null,
      orderUpTo: null,
      leadTimeHours: null,
      forecastBasis: 'model',
      notes: '',
      active: true,
    };
  }
  const { id: _id, siteId: _site, modelCorrectionFactor: _f, ...rest } = initial;
  return {
    ...rest,
    operatingPressureBar: rest.operatingPressureBar ?? null,
    gasCode: rest.gasCode as SourceFormValues['gasCode'],
    calibration: rest.calibration ?? [],
  };
}

const REORDER_MODE_LABEL: Record<(typeof REORDER_MODES)[number], string> = {
  none: 'No reorder rule',
  days: 'Days of stock left',
  percent: 'Percentage',
  amount: 'Amount left',
};

const BASIS_HINT: Record<(typeof FORECAST_BASES)[number], string> = {
  model: 'From the therapy lines of the wards it feeds.',
  measured: 'The mean rate of the last weeks of readings (bulk tanks with two days of readings or more).',
  scaled: 'The model times the correction factor accepted on a ward page.',
};

/**
 * Create or change a supply source. The fields follow the type: a bulk tank's capacity, evaporation
 * and vaporiser; a manifold's cylinders per bank and changeover pressure; the cylinder type of any
 * cylinder source; the reorder rule and forecast basis of all.
 */
export function SourceForm({
  siteId,
  initial,
  siteSources,
  cylinderTypes,
  suppliers,
  onDone,
  onSaved,
}: {
  siteId: number;
  initial: Source | null;
  siteSources: Source[];
  cylinderTypes: CylinderTypeOption[];
  suppliers: SupplierOption[];
  onDone: () => void;
  onSaved?: () => void;
}) {
  const save = useSaveSource(siteId, onSaved);
  const [banner, setBanner] = useState<string | null>(null);
  const { register, handleSubmit, setError, setValue, control, formState } = useForm<SourceFormValues, unknown, SourceBody>({
    resolver: bodyResolver<SourceFormValues, typeof sourceSchema>(sourceSchema, cleanForType),
    defaultValues: defaultsFrom(initial),
  });
  const calibration = useFieldArray({ control, name: 'calibration' });
  const [type, gasCode, reorderMode, supplierId, calibrationUnit] = useWatch({
    control,
    name: ['type', 'gasCode', 'reorderMode', 'supplierId', 'calibrationUnit'],
  });
  const e = formState.errors;
  const bulk = type === 'bulk_liquid';
  const gasTypes = cylinderTypes.filter((c) => c.gasCode === gasCode && (c.active || c.id === initial?.cylinderTypeId));
  const supplier = suppliers.find((s) => s.id === supplierId);
  const backUpOptions = siteSources.filter((s) => s.id !== initial?.id && s.gasCode === gasCode && s.type !== 'emergency_reserve');
  const amountUnit = bulk ? 'kg' : 'cylinders';

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

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-5">
      {banner && (
        <Alert tone="critical" title="Not saved" role="alert">
          {banner}
        </Alert>
      )}
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Name" error={e.name?.message} className="sm:col-span-2">
          {(c) => <Input {...c} {...register('name')} maxLength={120} />}
        </Field>
        {initial ? (
          <div className="flex flex-col gap-1.5">
            <p className="text-sm font-bold">Type</p>
            <p className="flex min-h-11 items-center">{SOURCE_TYPE_LABEL[initial.type]}</p>
            <p className="text-xs text-fg-muted">A source keeps its type: add a new source for another kind.</p>
          </div>
        ) : (
          <Field label="Type" error={e.type?.message}>
            {(c) => (
              <Select {...c} {...register('type')}>
                {SOURCE_TYPES.map((t) => (
                  <option key={t} value={t}>
                    {SOURCE_TYPE_LABEL[t]}
                  </option>
                ))}
              </Select>
            )}
          </Field>
        )}
        <Field label="Gas" error={e.gasCode?.message}>
          {(c) => (
            <Select {...c} {...register('gasCode', { onChange: () => setValue('cylinderTypeId', null) })}>
              {GAS_CODES_CATALOGUE.map((g) => (
                <option key={g} value={g}>
                  {gasName(g)}
                </option>
              ))}
            </Select>
          )}
        </Field>
      </div>

      {bulk ? (
        <fieldset className="grid gap-4 sm:grid-cols-2">
          <legend className="pb-2 text-lg font-bold">The tank</legend>
          <Field label="Capacity" hint="Liquid the tank holds when full." error={e.capacityKg?.message}>
            {(c) => <UnitInput {...c} {...register('capacityKg', { setValueAs: optionalNumber })} unit="kg" inputMode="decimal" />}
          </Field>
          <Field
            label="Normal evaporation rate"
            hint="From the tank’s data plate or the supplier: % of capacity per day."
            error={e.evaporationPercentPerDay?.message}
          >
            {(c) => <UnitInput {...c} {...register('evaporationPercentPerDay', { setValueAs: optionalNumber })} unit="%/day" inputMode="decimal" />}
          </Field>
          <Field
            label="Working pressure"
            hint="Tank pressure (gauge): litres of liquid are converted at the liquid’s density at this pressure. Empty: 7 bar g, the usual UK relief setting."
            error={e.operatingPressureBar?.message}
          >
            {(c) => <UnitInput {...c} {...register('operatingPressureBar', { setValueAs: optionalNumber })} unit="bar" inputMode="decimal" />}
          </Field>
          <Field label="Vaporiser rating" hint="Optional; used by the capacity check." error={e.vaporiserM3H?.message}>
            {(c) => <UnitInput {...c} {...register('vaporiserM3H', { setValueAs: optionalNumber })} unit="m³/h" inputMode="decimal" />}
          </Field>
          <Field label="Vaporiser derating" hint="Optional, 0–1: the share of the rating it gives in icy weather." error={e.vaporiserDerating?.message}>
            {(c) => <Input {...c} {...register('vaporiserDerating', { setValueAs: optionalNumber })} inputMode="decimal" />}
          </Field>
          <Field label="Low-level alarm" hint="Optional." error={e.minLevelAlarmPercent?.message}>
            {(c) => <UnitInput {...c} {...register('minLevelAlarmPercent', { setValueAs: optionalNumber })} unit="%" inputMode="decimal" />}
          </Field>
          <Field label="Reserve kept in the tank" hint="Optional: the forecast warns when contents reach it." error={e.reservePercent?.message}>
            {(c) => <UnitInput {...c} {...register('reservePercent', { setValueAs: optionalNumber })} unit="%" inputMode="decimal" />}
          </Field>
          <div className="flex flex-col gap-2 sm:col-span-2">
            <p className="text-sm font-bold">Calibration table (optional)</p>
            <p className="text-xs text-fg-muted">
              For a contents gauge that is not in % or kg (a differential-pressure gauge): each gauge reading with the kg it means, rising down the table.
            </p>
            <Field label="Gauge unit" error={e.calibrationUnit?.message} className="sm:w-64">
              {(c) => (
                <Input
                  {...c}
                  {...register('calibrationUnit', { setValueAs: (v) => (v === '' || v === null || v === undefined ? null : String(v)) })}
                  placeholder="e.g. inH2O, mbar"
                  maxLength={24}
                />
              )}
            </Field>
            {calibration.fields.length > 0 && (
              <ul className="flex flex-col gap-2">
                {calibration.fields.map((f, i) => (
                  <li key={f.id} className="flex items-start gap-2">
                    <Field label={`Reading ${i + 1}`} error={e.calibration?.[i]?.reading?.message} className="flex-1">
                      {(c) => (
                        <UnitInput
                          {...c}
                          {...register(`calibration.${i}.reading`, { valueAsNumber: true })}
                          unit={calibrationUnit || 'gauge'}
                          inputMode="decimal"
                        />
                      )}
                    </Field>
                    <Field label="Contents" error={e.calibration?.[i]?.kg?.message} className="flex-1">
                      {(c) => <UnitInput {...c} {...register(`calibration.${i}.kg`, { valueAsNumber: true })} unit="kg" inputMode="decimal" />}
                    </Field>
                    <Button variant="ghost" size="sm" className="mt-7" onClick={() => calibration.remove(i)} aria-label={`Remove calibration row ${i + 1}`}>
                      <Icon name="close" className="size-4" />
                    </Button>
                  </li>
                ))}
              </ul>
            )}
            {e.calibration?.message && <FieldError>{e.calibration.message}</FieldError>}
            <div>
              <Button variant="secondary" size="sm" onClick={() => calibration.append({ reading: BLANK, kg: BLANK })}>
                <Icon name="plus" className="size-4" />
                Add a calibration row
              </Button>
            </div>
          </div>
        </fieldset>
      ) : (
        <fieldset className="grid gap-4 sm:grid-cols-2">
          <legend className="pb-2 text-lg font-bold">Cylinders</legend>
          <Field
            label="Cylinder type"
            hint={
              gasTypes.length === 0
                ? `No cylinder types for ${gasName(String(gasCode))} in the catalogue yet: an administrator adds them under Cylinder types.`
                : undefined
            }
            error={e.cylinderTypeId?.message}
          >
            {(c) => (
              <Select {...c} {...register('cylinderTypeId', { setValueAs: optionalId })}>
                <option value="">Choose…</option>
                {gasTypes.map((t) => (
                  <option key={t.id} value={t.id}>
                    {t.name}
                  </option>
                ))}
              </Select>
            )}
          </Field>
          <Field label="Temperature of the cylinders" hint="Blank: the site’s store temperature." error={e.temperatureC?.message}>
            {(c) => <UnitInput {...c} {...register('temperatureC', { setValueAs: optionalNumber })} unit="°C" inputMode="decimal" />}
          </Field>
          {(type === 'manifold' || type === 'emergency_reserve') && (
            <Field
              label="Cylinders per bank"
              hint={type === 'emergency_reserve' ? 'Only if the reserve is a manifold read by its bank gauges.' : undefined}
              error={e.cylindersPerBank?.message}
            >
              {(c) => <Input {...c} {...register('cylindersPerBank', { setValueAs: optionalNumber })} inputMode="numeric" />}
            </Field>
          )}
          {type === 'manifold' && (
            <>
              <Field
                label="Changeover pressure"
                hint="Gauge pressure at which the manifold switches to the standby bank."
                error={e.changeoverGaugeBar?.message}
              >
                {(c) => <UnitInput {...c} {...register('changeoverGaugeBar', { setValueAs: optionalNumber })} unit="bar" inputMode="decimal" />}
              </Field>
              <Field label="Regulator capacity" hint="Optional; used by the capacity check." error={e.regulatorLMin?.message}>
                {(c) => <UnitInput {...c} {...register('regulatorLMin', { setValueAs: optionalNumber })} unit="L/min" inputMode="decimal" />}
              </Field>
            </>
          )}
          {type === 'emergency_reserve' && (
            <Controller
              control={control}
              name="backsUp"
              render={({ field }) => (
                <CheckboxGroup
                  className="sm:col-span-2"
                  legend="Backs up"
                  hint={
                    backUpOptions.length === 0 ? `No other ${gasName(String(gasCode))} source on this site yet.` : 'The sources this reserve takes over from.'
                  }
                  options={backUpOptions.map((s) => ({ value: s.id, label: s.name }))}
                  value={(field.value ?? []) as number[]}
                  onChange={field.onChange}
                  error={e.backsUp?.message}
                />
              )}
            />
          )}
        </fieldset>
      )}

      <fieldset className="grid gap-4 sm:grid-cols-2">
        <legend className="pb-2 text-lg font-bold">Supply and reorder</legend>
        <Field label="Supplier" error={e.supplierId?.message}>
          {(c) => (
            <Select {...c} {...register('supplierId', { setValueAs: optionalId })}>
              <option value="">None</option>
              {suppliers
                .filter((s) => s.active || s.id === initial?.supplierId)
                .map((s) => (
                  <option key={s.id} value={s.id}>
                    {s.name}
                  </option>
                ))}
            </Select>
          )}
        </Field>
        <Field
          label="Delivery lead time"
          hint={supplier ? `Blank: the supplier’s ${supplier.leadTimeHours} h.` : 'Blank: the supplier’s, or 48 h without one.'}
          error={e.leadTimeHours?.message}
        >
          {(c) => <UnitInput {...c} {...register('leadTimeHours', { setValueAs: optionalNumber })} unit="h" inputMode="numeric" />}
        </Field>
        <Field label="Reorder when" error={e.reorderMode?.message}>
          {(c) => (
            <Select {...c} {...register('reorderMode')}>
              {REORDER_MODES.map((m) => (
                <option key={m} value={m}>
                  {REORDER_MODE_LABEL[m]}
                </option>
              ))}
            </Select>
          )}
        </Field>
        {reorderMode !== 'none' && (
          <>
            <Field
              label="Reorder level"
              hint={
                reorderMode === 'percent'
                  ? bulk
                    ? 'Of the tank’s capacity.'
                    : 'Of the order-up-to stock.'
                  : reorderMode === 'days'
                    ? 'Days of stock left at the current use.'
                    : undefined
              }
              error={e.reorderLevel?.message}
            >
              {(c) => (
                <UnitInput
                  {...c}
                  {...register('reorderLevel', { setValueAs: optionalNumber })}
                  unit={reorderMode === 'days' ? 'days' : reorderMode === 'percent' ? '%' : amountUnit}
                  inputMode="decimal"
                />
              )}
            </Field>
            <Field label="Order up to" hint={bulk ? 'Contents after the delivery.' : 'Full cylinders after the delivery.'} error={e.orderUpTo?.message}>
              {(c) => <UnitInput {...c} {...register('orderUpTo', { setValueAs: optionalNumber })} unit={amountUnit} inputMode="decimal" />}
            </Field>
          </>
        )}
      </fieldset>

      <fieldset className="flex flex-col gap-2">
        <legend className="pb-2 text-lg font-bold">Forecast basis</legend>
        {FORECAST_BASES.map((b) => (
          <label key={b} className="flex min-h-11 cursor-pointer items-start gap-3 py-1">
            <input type="radio" value={b} {...register('forecastBasis')} className="mt-1 size-5 accent-primary" />
            <span>
              <span className="font-bold">{BASIS_LABEL[b]}</span>
              <span className="block text-sm text-fg-muted">{BASIS_HINT[b]}</span>
            </span>
          </label>
        ))}
        {e.forecastBasis?.message && <FieldError>{e.forecastBasis.message}</FieldError>}
      </fieldset>

      <Field label="Notes" error={e.notes?.message}>
        {(c) => <Textarea {...c} {...register('notes')} rows={2} maxLength={1000} />}
      </Field>
      <Checkbox label="In use (forecast and shown on Today)" {...register('active')} />
      <FormActions onCancel={onDone} busy={save.isPending} submitLabel={initial ? 'Save changes' : 'Add source'} />
    </form>
  );
}
