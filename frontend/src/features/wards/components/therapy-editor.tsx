import { useState } from 'react';
import { Controller, useFieldArray, useForm, useWatch, type Control } from 'react-hook-form';
import type { z } from 'zod';
import { GAS_CODES_CATALOGUE } from '@common/schemas/admin.schema';
import { THERAPY_DEVICES, therapyLinesSchema } from '@common/schemas/supply.schema';
import { bodyResolver } from '@/lib/body-resolver';
import { applyServerErrors } from '@/lib/form-errors';
import { formatLitres, formatNumber } from '@/lib/format';
import { formatHours, formatWeekdays } from '@/lib/schedule-format';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Field, Input, Select, UnitInput } from '@/components/ui/field';
import { Icon } from '@/components/ui/icons';
import { EmptyState } from '@/components/ui/states';
import { useSaveTherapy, type DeviceFlow, type TherapyLine, type WardDetail } from '../api/wards-api';
import { lineLitresPerDay } from '../lib/therapy-math';
import { deviceLabel, gasName } from '../lib/ward-labels';
import { HoursPicker, WeekdaysPicker } from './schedule-picker';

/** An empty number field: shown blank, and reported by the schema as "must be a number" if left so. */
const BLANK = '' as unknown as number;

type LinesForm = z.input<typeof therapyLinesSchema>;
type LineValue = LinesForm['lines'][number];

const optionalNumber = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));
const DAY_SHIFT = [8, 9, 10, 11, 12, 13, 14, 15, 16, 17];
const WEEKDAYS_ONLY = [1, 2, 3, 4, 5];

function toFormLine(t: TherapyLine): LineValue {
  return {
    gasCode: t.gasCode as LineValue['gasCode'],
    device: t.device,
    patients: t.patients,
    flowLMin: t.flowLMin,
    hours: t.hours,
    weekdays: t.weekdays,
    label: t.label,
  };
}

/** The flow a line is planned at: its own, else the organisation's flow for the device. */
function plannedFlow(line: Pick<LineValue, 'device' | 'flowLMin'>, flows: DeviceFlow[]): number | null {
  if (line.flowLMin !== null && line.flowLMin !== undefined && Number.isFinite(line.flowLMin)) return line.flowLMin;
  return flows.find((f) => f.device === line.device)?.flowLMin ?? null;
}

/**
 * The ward's therapy lines: how many patients are on which device, at what flow, in which hours and on
 * which days. Ward leads and facilities managers keep them; they are the modelled demand.
 */
export function TherapyEditor({
  detail,
  deviceFlows,
  canEdit,
  onSaved,
}: {
  detail: WardDetail;
  deviceFlows: DeviceFlow[];
  canEdit: boolean;
  onSaved?: () => void;
}) {
  const leak = detail.ward.leakagePercent;
  if (!canEdit) {
    return (
      <Card>
        <CardHeader title="Therapy lines" description="Patients on each device; a ward lead or facilities manager keeps them." />
        {detail.therapy.length === 0 ? (
          <EmptyState title="No therapy lines" className="py-6" />
        ) : (
          <ul className="divide-y divide-line">
            {detail.therapy.map((t) => {
              const flow = plannedFlow(t, deviceFlows);
              return (
                <li key={t.id} className="px-4 py-3 sm:px-5">
                  <p className="font-bold">
                    {formatNumber(t.patients)} × {t.label || deviceLabel(t.device)} · {gasName(t.gasCode)}
                  </p>
                  <p className="text-sm text-fg-muted">
                    {formatNumber(flow, 1)} L/min each{t.flowLMin === null ? ' (device flow)' : ''} · {formatHours(t.hours)}, {formatWeekdays(t.weekdays)} · ≈{' '}
                    {formatLitres(flow === null ? null : lineLitresPerDay(t.patients, flow, t.hours, t.weekdays, leak))}/day
                  </p>
                </li>
              );
            })}
          </ul>
        )}
      </Card>
    );
  }
  return <TherapyForm key={detail.therapy.map((t) => t.id).join(',')} detail={detail} deviceFlows={deviceFlows} onSaved={onSaved} />;
}

function TherapyForm({ detail, deviceFlows, onSaved }: { detail: WardDetail; deviceFlows: DeviceFlow[]; onSaved?: () => void }) {
  const save = useSaveTherapy(detail.ward.id, onSaved);
  const [banner, setBanner] = useState<string | null>(null);
  const { register, handleSubmit, setError, control, formState, reset } = useForm({
    resolver: bodyResolver<z.input<typeof therapyLinesSchema>, typeof therapyLinesSchema>(therapyLinesSchema, (v) => v),
    defaultValues: { lines: detail.therapy.map(toFormLine) },
  });
  const lines = useFieldArray({ control, name: 'lines' });
  const values = useWatch({ control, name: 'lines' }) ?? [];
  const leak = detail.ward.leakagePercent;
  const e = formState.errors;
  const totals = new Map<string, number>();
  values.forEach((l) => {
    const flow = plannedFlow(l, deviceFlows);
    const patients = Number(l.patients);
    if (flow !== null && Number.isFinite(patients))
      totals.set(String(l.gasCode), (totals.get(String(l.gasCode)) ?? 0) + lineLitresPerDay(patients, flow, l.hours ?? null, l.weekdays ?? null, leak));
  });

  const onSubmit = handleSubmit((body) => {
    setBanner(null);
    save.mutate(body.lines, {
      onSuccess: (saved) => {
        toast.ok(`Therapy lines saved (${saved.length}). Forecasts of the ward’s sources now use them.`);
        reset({ lines: saved.map(toFormLine) });
      },
      onError: (error) => setBanner(applyServerErrors(error, setError, ['lines'])),
    });
  });

  return (
    <Card>
      <CardHeader
        title="Therapy lines"
        description={`Patients on each device, in the hours and days it runs. Leakage of ${formatNumber(leak, 1)} % is added on top.`}
      />
      <form onSubmit={onSubmit} noValidate>
        <CardBody className="flex flex-col gap-4">
          {banner && (
            <Alert tone="critical" title="Not saved" role="alert">
              {banner}
            </Alert>
          )}
          {lines.fields.length === 0 && <p className="text-fg-muted">No therapy lines: this ward adds no modelled demand.</p>}
          <ol className="flex flex-col gap-3">
            {lines.fields.map((f, i) => (
              <TherapyLineRow
                key={f.id}
                index={i}
                control={control}
                register={register}
                errors={e.lines?.[i]}
                deviceFlows={deviceFlows}
                leak={leak}
                onRemove={() => lines.remove(i)}
              />
            ))}
          </ol>
          {e.lines?.message && <p className="text-sm font-bold text-critical">{e.lines.message}</p>}
          <div>
            <Button
              variant="secondary"
              size="sm"
              onClick={() => lines.append({ gasCode: 'O2', device: 'nasal_cannula', patients: BLANK, flowLMin: null, hours: null, weekdays: null, label: '' })}
            >
              <Icon name="plus" className="size-4" />
              Add a therapy line
            </Button>
          </div>
          {totals.size > 0 && (
            <p className="text-sm">
              <span className="font-bold">Modelled use with these lines: </span>
              {[...totals].map(([gas, l]) => `${gasName(gas)} ≈ ${formatLitres(l)}/day`).join(' · ')}
            </p>
          )}
          <div className="flex flex-wrap items-center gap-2 border-t border-line pt-3">
            <Button type="submit" busy={save.isPending} disabled={!formState.isDirty}>
              Save therapy lines
            </Button>
            {formState.isDirty && (
              <Button variant="ghost" onClick={() => reset()}>
                Undo changes
              </Button>
            )}
          </div>
        </CardBody>
      </form>
    </Card>
  );
}

function TherapyLineRow({
  index: i,
  control,
  register,
  errors,
  deviceFlows,
  leak,
  onRemove,
}: {
  index: number;
  control: Control<LinesForm>;
  register: ReturnType<typeof useForm<LinesForm>>['register'];
  errors: { [K in keyof LineValue]?: { message?: string } } | undefined;
  deviceFlows: DeviceFlow[];
  leak: number;
  onRemove: () => void;
}) {
  const line = useWatch({ control, name: `lines.${i}` });
  const [custom, setCustom] = useState(false);
  const device = deviceFlows.find((d) => d.device === line?.device);
  const flow = line ? plannedFlow(line, deviceFlows) : null;
  const patients = Number(line?.patients);
  const perDay = flow !== null && Number.isFinite(patients) ? lineLitresPerDay(patients, flow, line?.hours ?? null, line?.weekdays ?? null, leak) : null;
  const needsFlow = line?.device === 'custom' || line?.device === 'theatre';
  return (
    <li className="@container rounded-lg border border-line bg-surface-sunken p-3">
      <div className="mb-2 flex items-center justify-between gap-2">
        <p className="font-bold">Line {i + 1}</p>
        <Button variant="ghost" size="sm" onClick={onRemove} aria-label={`Remove line ${i + 1}`}>
          <Icon name="close" className="size-4" />
          Remove
        </Button>
      </div>
      <div className="grid grid-cols-2 gap-3 @3xl:grid-cols-4">
        <Field label="Gas" error={errors?.gasCode?.message} className="col-span-2 @sm:col-span-1">
          {(c) => (
            <Select {...c} {...register(`lines.${i}.gasCode`)}>
              {GAS_CODES_CATALOGUE.map((g) => (
                <option key={g} value={g}>
                  {gasName(g)}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field label="Device" error={errors?.device?.message} className="col-span-2 @sm:col-span-1">
          {(c) => (
            <Select {...c} {...register(`lines.${i}.device`)}>
              {THERAPY_DEVICES.map((d) => (
                <option key={d} value={d}>
                  {deviceLabel(d)}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field label="Patients" error={errors?.patients?.message}>
          {(c) => <Input {...c} {...register(`lines.${i}.patients`, { valueAsNumber: true })} inputMode="decimal" />}
        </Field>
        <Field
          label="Flow per patient"
          hint={
            needsFlow
              ? 'Required for this device.'
              : device
                ? `Blank: ${formatNumber(device.flowLMin, 1)} L/min (${device.edited ? 'your organisation’s flow' : 'documented default'}).`
                : undefined
          }
          error={errors?.flowLMin?.message}
        >
          {(c) => (
            <UnitInput
              {...c}
              {...register(`lines.${i}.flowLMin`, { setValueAs: optionalNumber })}
              unit="L/min"
              inputMode="decimal"
              placeholder={device && !needsFlow ? formatNumber(device.flowLMin, 1) : undefined}
            />
          )}
        </Field>
        <Field label="Label" hint="Optional, e.g. “Night CPAP”." error={errors?.label?.message} className="col-span-2 @3xl:col-span-4">
          {(c) => <Input {...c} {...register(`lines.${i}.label`)} maxLength={120} />}
        </Field>
      </div>
      <div className="mt-3 flex flex-col gap-2">
        <p className="text-sm">
          <span className="font-bold">Runs </span>
          {formatHours(line?.hours)}, {formatWeekdays(line?.weekdays)}
          {perDay !== null && <span className="text-fg-muted"> · ≈ {formatLitres(perDay)}/day</span>}
        </p>
        <Controller
          control={control}
          name={`lines.${i}.hours`}
          render={({ field: hours }) => (
            <Controller
              control={control}
              name={`lines.${i}.weekdays`}
              render={({ field: days }) => (
                <>
                  <div className="flex flex-wrap gap-2">
                    <Button variant="secondary" size="sm" onClick={() => (hours.onChange(null), days.onChange(null))}>
                      All day, every day
                    </Button>
                    <Button variant="secondary" size="sm" onClick={() => (hours.onChange(DAY_SHIFT), days.onChange(WEEKDAYS_ONLY))}>
                      08–18 on weekdays
                    </Button>
                    <Button variant="ghost" size="sm" onClick={() => setCustom((v) => !v)} aria-expanded={custom}>
                      {custom ? 'Hide hours and days' : 'Choose hours and days…'}
                    </Button>
                  </div>
                  {custom && (
                    <div className="flex flex-col gap-3 rounded-lg border border-line bg-surface p-3">
                      <HoursPicker value={(hours.value as number[] | null) ?? null} onChange={hours.onChange} />
                      <WeekdaysPicker value={(days.value as number[] | null) ?? null} onChange={days.onChange} />
                    </div>
                  )}
                </>
              )}
            />
          )}
        />
        {(errors?.hours?.message || errors?.weekdays?.message) && (
          <p className="text-sm font-bold text-critical">{errors?.hours?.message ?? errors?.weekdays?.message}</p>
        )}
      </div>
    </li>
  );
}
