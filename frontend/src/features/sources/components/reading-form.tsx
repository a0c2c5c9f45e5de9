import { useState } from 'react';
import { useFieldArray, useForm, useWatch } from 'react-hook-form';
import { readingInputSchema, READING_METHODS } from '@common/schemas/supply.schema';
import { DEFAULT_TANK_OPERATING_GAUGE_BAR, loxDensityAtTankPressureKgPerL, loxLitresToKg } from '@common/gas/liquid-oxygen';
import { isLiquefiedGas } from '@common/gas/gases';
import { bodyResolver } from '@/lib/body-resolver';
import { applyServerErrors } from '@/lib/form-errors';
import { formatKg, formatLitres } from '@/lib/format';
import { toast } from '@/lib/toast';
import { cn } from '@/lib/cn';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field, FieldError, Input, Select, Textarea, UnitInput } from '@/components/ui/field';
import { Icon } from '@/components/ui/icons';
import { useAddReading, type ReadingKind, type SourceDetail } from '../api/sources-api';
import { READING_METHOD_LABEL } from '../lib/source-labels';
import { localInputToIso, toLocalInput } from '../lib/site-time';

/** An empty number field: shown blank, and reported by the schema as "must be a number" if left so. */
const BLANK = '' as unknown as number;

interface ReadingFormValues {
  kind: ReadingKind;
  value: number;
  dutyBar: number;
  standbyBar: number;
  spareFull: number;
  full: number;
  inUseGauges: { bar: number }[];
  empty: number;
  takenAt: string;
  method: (typeof READING_METHODS)[number];
  note: string;
}

const FIELDS = [
  'kind',
  'value',
  'dutyBar',
  'standbyBar',
  'spareFull',
  'full',
  'inUseGauges',
  'inUseGaugeBar',
  'inUseNetKg',
  'empty',
  'takenAt',
  'method',
  'note',
] as const;

const KIND_LABEL: Record<ReadingKind, string> = {
  level_percent: 'Level %',
  kg: 'Mass (kg)',
  litres_liquid: 'Litres of liquid',
  calibration: 'Calibrated gauge',
  bank_gauges: 'Bank gauges',
  store_count: 'Cylinder count',
};

/** The ways a source of this type is read (the server accepts the same). */
function kindsFor(source: SourceDetail['source']): ReadingKind[] {
  switch (source.type) {
    case 'bulk_liquid':
      return [
        'level_percent',
        'kg',
        ...(source.gasCode === 'O2' ? (['litres_liquid'] as const) : []),
        ...(source.calibration?.length ? (['calibration'] as const) : []),
      ];
    case 'manifold':
      return ['bank_gauges'];
    case 'emergency_reserve':
      return ['store_count', 'bank_gauges'];
    default:
      return ['store_count'];
  }
}

/** `weighed`: CO2 and N2O, whose part-used cylinders are weighed (net kg), since their gauge shows only the vapour pressure. */
function toBody(v: ReadingFormValues, timeZone: string, weighed: boolean) {
  const common = { takenAt: localInputToIso(v.takenAt, timeZone) ?? '', method: v.method, note: v.note };
  if (v.kind === 'bank_gauges') return { kind: v.kind, dutyBar: v.dutyBar, standbyBar: v.standbyBar, spareFull: v.spareFull, ...common };
  if (v.kind === 'store_count') {
    const rows = v.inUseGauges.map((g) => g.bar);
    return { kind: v.kind, full: v.full, ...(weighed ? { inUseNetKg: rows } : { inUseGaugeBar: rows }), empty: v.empty, ...common };
  }
  return { kind: v.kind, value: v.value, ...common };
}

/** The server and the schema say "inUseGaugeBar.2" (or "inUseNetKg.2"); the person typed into the third row. */
function renamePath(path: string): string {
  const m = /^(?:inUseGaugeBar|inUseNetKg)\.(\d+)$/.exec(path);
  return m ? `inUseGauges.${m[1]}.bar` : path;
}

/**
 * Enter a reading of a source, in the form its gauges give it: level, mass or litres of a bulk tank;
 * both bank gauges and the spare full cylinders of a manifold; the count of a cylinder store.
 */
export function ReadingForm({ detail, onSaved }: { detail: SourceDetail; onSaved?: () => void }) {
  const { source, site } = detail;
  const tz = site.timeZone;
  const kinds = kindsFor(source);
  const weighed = isLiquefiedGas(source.gasCode);
  const add = useAddReading(source.id, onSaved);
  const [banner, setBanner] = useState<string | null>(null);
  const fresh = (kind: ReadingKind): ReadingFormValues => ({
    kind,
    value: BLANK,
    dutyBar: BLANK,
    standbyBar: BLANK,
    spareFull: 0,
    full: BLANK,
    inUseGauges: [],
    empty: 0,
    takenAt: toLocalInput(new Date(), tz),
    method: 'manual',
    note: '',
  });
  const { register, handleSubmit, setError, control, formState, reset, setValue } = useForm<
    ReadingFormValues,
    unknown,
    ReturnType<typeof readingInputSchema.parse>
  >({
    resolver: bodyResolver<ReadingFormValues, typeof readingInputSchema>(
      readingInputSchema,
      (v) => toBody(v, tz, weighed),
      (p) => (p === 'takenAt' ? 'takenAt' : renamePath(p)),
    ),
    defaultValues: fresh(kinds[0]),
  });
  const gauges = useFieldArray({ control, name: 'inUseGauges' });
  const [kind, value] = useWatch({ control, name: ['kind', 'value'] });
  const e = formState.errors;

  const onSubmit = handleSubmit((body) => {
    setBanner(null);
    add.mutate(body, {
      onSuccess: (saved) => {
        toast.ok(`Reading saved: ${detail.outlook.unit === 'kg' ? formatKg(saved.contents) : formatLitres(saved.contents)}.`);
        reset(fresh(kind));
      },
      onError: (error) => setBanner(applyServerErrors(error, (name, err) => setError(renamePath(String(name)) as never, err), FIELDS)),
    });
  });

  // what a bulk reading means in kg, before it is saved: a slip of a digit shows here
  let preview: string | null = null;
  if (source.type === 'bulk_liquid' && Number.isFinite(value) && value >= 0) {
    if (kind === 'level_percent' && source.capacityKg) preview = `≈ ${formatKg((source.capacityKg * value) / 100)} of ${formatKg(source.capacityKg)}`;
    if (kind === 'litres_liquid') {
      const pressure = source.operatingPressureBar ?? DEFAULT_TANK_OPERATING_GAUGE_BAR;
      const density = loxDensityAtTankPressureKgPerL(pressure);
      preview = `≈ ${formatKg(loxLitresToKg(value, density))} of liquid oxygen at ${density.toFixed(3)} kg/L (saturated liquid at ${pressure} bar g${source.operatingPressureBar == null ? ', the default working pressure' : ''})`;
    }
  }
  const takenAtError = e.takenAt
    ? /ISO|offset/i.test(e.takenAt.message ?? '')
      ? 'enter the date and time the reading was taken, at the site'
      : e.takenAt.message
    : undefined;

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Enter a reading">
      {banner && (
        <Alert tone="critical" title="Reading not saved" role="alert">
          {banner}
        </Alert>
      )}
      {kinds.length > 1 && (
        <fieldset>
          <legend className="pb-1 text-sm font-bold">How it was read</legend>
          <div className="flex flex-wrap gap-2">
            {kinds.map((k) => (
              <label
                key={k}
                className={cn(
                  'inline-flex min-h-11 cursor-pointer items-center gap-2 rounded-lg border px-3 text-sm font-bold',
                  kind === k ? 'border-primary bg-primary-soft text-primary' : 'border-line-strong bg-surface text-fg',
                )}
              >
                <input type="radio" value={k} {...register('kind')} className="size-4 accent-primary" />
                {KIND_LABEL[k]}
              </label>
            ))}
          </div>
        </fieldset>
      )}

      {(kind === 'level_percent' || kind === 'kg' || kind === 'litres_liquid' || kind === 'calibration') && (
        <Field
          label={kind === 'level_percent' ? 'Level' : kind === 'kg' ? 'Contents' : kind === 'litres_liquid' ? 'Liquid in the tank' : 'Gauge reading'}
          hint={preview ?? (kind === 'calibration' ? 'Converted with the tank’s calibration table.' : undefined)}
          error={e.value?.message}
        >
          {(c) => (
            <UnitInput
              {...c}
              {...register('value', { valueAsNumber: true })}
              unit={kind === 'level_percent' ? '%' : kind === 'kg' ? 'kg' : kind === 'litres_liquid' ? 'L' : (source.calibrationUnit ?? '')}
              inputMode="decimal"
              autoComplete="off"
            />
          )}
        </Field>
      )}

      {kind === 'bank_gauges' && (
        <div className="grid gap-4 sm:grid-cols-3">
          <Field label="Duty bank gauge" error={e.dutyBar?.message}>
            {(c) => <UnitInput {...c} {...register('dutyBar', { valueAsNumber: true })} unit="bar" inputMode="decimal" autoComplete="off" />}
          </Field>
          <Field label="Standby bank gauge" error={e.standbyBar?.message}>
            {(c) => <UnitInput {...c} {...register('standbyBar', { valueAsNumber: true })} unit="bar" inputMode="decimal" autoComplete="off" />}
          </Field>
          <Field label="Spare full cylinders" hint="Full, in the store, for this manifold." error={e.spareFull?.message}>
            {(c) => <Input {...c} {...register('spareFull', { valueAsNumber: true })} inputMode="numeric" autoComplete="off" />}
          </Field>
        </div>
      )}

      {kind === 'store_count' && (
        <>
          <div className="grid gap-4 sm:grid-cols-2">
            <Field label="Full cylinders" error={e.full?.message}>
              {(c) => <Input {...c} {...register('full', { valueAsNumber: true })} inputMode="numeric" autoComplete="off" />}
            </Field>
            <Field label="Empty cylinders" hint="Waiting for collection: they hold no usable gas." error={e.empty?.message}>
              {(c) => <Input {...c} {...register('empty', { valueAsNumber: true })} inputMode="numeric" autoComplete="off" />}
            </Field>
          </div>
          <fieldset className="flex flex-col gap-2">
            <legend className="pb-1 text-sm font-bold">{weighed ? 'Cylinders in use: weigh each (gross − tare)' : 'Cylinders in use: one gauge each'}</legend>
            {weighed && (
              <p className="text-sm text-fg-muted">
                A liquefied gas’s gauge shows the vapour pressure, not the contents, while any liquid is left: weigh the cylinder and enter gross − tare.
              </p>
            )}
            {gauges.fields.length === 0 && <p className="text-sm text-fg-muted">None in use. Add one row per part-used cylinder.</p>}
            <ul className="grid gap-2 sm:grid-cols-2">
              {gauges.fields.map((f, i) => (
                <li key={f.id} className="flex items-start gap-2">
                  <Field
                    label={weighed ? `Cylinder ${i + 1} net weight` : `Cylinder ${i + 1} gauge`}
                    error={e.inUseGauges?.[i]?.bar?.message}
                    className="flex-1"
                  >
                    {(c) => (
                      <UnitInput
                        {...c}
                        {...register(`inUseGauges.${i}.bar`, { valueAsNumber: true })}
                        unit={weighed ? 'kg' : 'bar'}
                        inputMode="decimal"
                        autoComplete="off"
                      />
                    )}
                  </Field>
                  <Button variant="ghost" size="sm" className="mt-7" onClick={() => gauges.remove(i)} aria-label={`Remove cylinder ${i + 1}`}>
                    <Icon name="close" className="size-4" />
                  </Button>
                </li>
              ))}
            </ul>
            {e.inUseGauges?.message && <FieldError>{e.inUseGauges.message}</FieldError>}
            <div>
              <Button variant="secondary" size="sm" onClick={() => gauges.append({ bar: BLANK }, { shouldFocus: true })}>
                <Icon name="plus" className="size-4" />
                Add a cylinder in use
              </Button>
            </div>
          </fieldset>
        </>
      )}

      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Taken at" hint={`Site time (${tz}).`} error={takenAtError}>
          {(c) => (
            <div className="flex gap-2">
              <Input {...c} {...register('takenAt')} type="datetime-local" max={toLocalInput(new Date(), tz)} className="min-w-0 flex-1" />
              <Button
                variant="secondary"
                size="sm"
                className="shrink-0 self-stretch"
                onClick={() => setValue('takenAt', toLocalInput(new Date(), tz), { shouldValidate: formState.isSubmitted })}
              >
                Now
              </Button>
            </div>
          )}
        </Field>
        <Field label="Method" error={e.method?.message}>
          {(c) => (
            <Select {...c} {...register('method')}>
              {READING_METHODS.map((m) => (
                <option key={m} value={m}>
                  {READING_METHOD_LABEL[m]}
                </option>
              ))}
            </Select>
          )}
        </Field>
      </div>
      <Field label="Note" hint="Optional: store temperature, a gauge that sticks, who checked." error={e.note?.message}>
        {(c) => <Textarea {...c} {...register('note')} rows={2} maxLength={500} />}
      </Field>
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" busy={add.isPending}>
          <Icon name="check" />
          Save reading
        </Button>
        <p className="text-sm text-fg-muted">The forecast of this source starts again from the newest reading.</p>
      </div>
      {source.type !== 'bulk_liquid' && (
        <p className="text-xs text-fg-muted">
          Gauges in bar (gauge pressure). Contents are worked out with the real-gas equation of state at the source’s temperature.
        </p>
      )}
      {kind === 'level_percent' && source.capacityKg === null && (
        <p className="text-xs text-warn">This tank has no capacity set: a level cannot be turned into kg.</p>
      )}
    </form>
  );
}
