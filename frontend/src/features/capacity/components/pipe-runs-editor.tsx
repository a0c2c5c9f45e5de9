import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { DEFAULT_ALLOWED_DROP_FRACTION, DEFAULT_FITTINGS_ALLOWANCE_PERCENT, NOMINAL_DISTRIBUTION_PRESSURE_KPA } from '@common/capacity/pipe-run';
import { EN13348_TUBES, EN13348_TUBES_SOURCE } from '@common/capacity/pipe-hydraulics';
import { pipeRunSchema, type PipeRunFormValues } from '@common/schemas/capacity.schema';
import { applyServerErrors } from '@/lib/form-errors';
import { formatNumber } from '@/lib/format';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { FormActions } from '@/components/ui/dialog';
import { Field, Input, Select, UnitInput } from '@/components/ui/field';
import { Icon } from '@/components/ui/icons';
import { EmptyState } from '@/components/ui/states';
import { useDeletePipeRun, useSavePipeRun, type PipeRunRow, type ZoneRow } from '../api/capacity-api';

const FIELDS = ['name', 'lengthM', 'tube', 'fittingsAllowancePercent', 'linePressureKPa', 'allowedDropKPa', 'gasTemperatureC', 'sortOrder'] as const;
const optionalNumber = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));

/** The pipe runs of one zone: a list, and a form to add or change one. */
export function PipeRunsEditor({ siteId, zone, onDone }: { siteId: number; zone: ZoneRow; onDone: () => void }) {
  const [editing, setEditing] = useState<PipeRunRow | 'new' | null>(zone.pipeRuns.length === 0 ? 'new' : null);
  const remove = useDeletePipeRun(siteId);
  if (editing !== null) {
    return (
      <PipeRunForm
        siteId={siteId}
        zoneId={zone.id}
        initial={editing === 'new' ? null : editing}
        nextOrder={zone.pipeRuns.length}
        onDone={() => (zone.pipeRuns.length === 0 ? onDone() : setEditing(null))}
      />
    );
  }
  return (
    <div className="flex flex-col gap-3">
      {zone.pipeRuns.length === 0 ? (
        <EmptyState title="No pipe runs yet">
          Add the runs from the source to this zone's valve: each is checked for pressure drop at the zone's design flow.
        </EmptyState>
      ) : (
        <ul className="divide-y divide-line rounded-lg border border-line">
          {zone.pipeRuns.map((r) => (
            <li key={r.id} className="flex flex-wrap items-center justify-between gap-2 px-3 py-2">
              <div>
                <p className="font-bold">{r.name}</p>
                <p className="text-sm text-fg-muted">
                  {r.tube} mm · {formatNumber(r.lengthM, 1)} m + {formatNumber(r.fittingsAllowancePercent)} % fittings · {formatNumber(r.linePressureKPa)} kPa ·
                  allowed drop {r.allowedDropKPa === null ? `${DEFAULT_ALLOWED_DROP_FRACTION * 100} % (default)` : `${formatNumber(r.allowedDropKPa, 1)} kPa`}
                </p>
              </div>
              <div className="flex gap-1">
                <Button variant="ghost" size="sm" onClick={() => setEditing(r)} aria-label={`Edit ${r.name}`}>
                  <Icon name="pencil" className="size-4" />
                  Edit
                </Button>
                <Button
                  variant="ghost"
                  size="sm"
                  busy={remove.isPending && remove.variables === r.id}
                  onClick={() => remove.mutate(r.id, { onSuccess: () => toast.ok(`Removed ${r.name}.`) })}
                  aria-label={`Remove ${r.name}`}
                >
                  Remove
                </Button>
              </div>
            </li>
          ))}
        </ul>
      )}
      <div className="flex justify-between gap-2">
        <Button variant="secondary" onClick={() => setEditing('new')}>
          <Icon name="plus" />
          Add pipe run
        </Button>
        <Button onClick={onDone}>Done</Button>
      </div>
    </div>
  );
}

function PipeRunForm({
  siteId,
  zoneId,
  initial,
  nextOrder,
  onDone,
}: {
  siteId: number;
  zoneId: number;
  initial: PipeRunRow | null;
  nextOrder: number;
  onDone: () => void;
}) {
  const save = useSavePipeRun(siteId);
  const [banner, setBanner] = useState<string | null>(null);
  const defaults: PipeRunFormValues = initial
    ? { ...initial }
    : {
        name: '',
        lengthM: undefined as unknown as number,
        tube: '22x0.9',
        fittingsAllowancePercent: DEFAULT_FITTINGS_ALLOWANCE_PERCENT,
        linePressureKPa: NOMINAL_DISTRIBUTION_PRESSURE_KPA,
        allowedDropKPa: null,
        gasTemperatureC: null,
        sortOrder: nextOrder,
      };
  const { register, handleSubmit, setError, formState } = useForm({ resolver: zodResolver(pipeRunSchema), defaultValues: defaults });
  const onSubmit = handleSubmit((body) => {
    setBanner(null);
    save.mutate(
      { id: initial?.id, zoneId, body },
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
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {banner && (
        <Alert tone="critical" title="Not saved" role="alert">
          {banner}
        </Alert>
      )}
      <Field label="Name" error={formState.errors.name?.message} hint="e.g. “Riser B to Heron zone valve”.">
        {(c) => <Input {...c} {...register('name')} />}
      </Field>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Length" error={formState.errors.lengthM?.message}>
          {(c) => <UnitInput {...c} {...register('lengthM', { valueAsNumber: true })} unit="m" inputMode="decimal" />}
        </Field>
        <Field label="Tube (outside diameter × wall)" error={formState.errors.tube?.message} hint={EN13348_TUBES_SOURCE}>
          {(c) => (
            <Select {...c} {...register('tube')}>
              {EN13348_TUBES.map((t) => (
                <option key={t.id} value={t.id}>
                  {t.outsideDiameterMm} × {t.wallMm} mm (bore {formatNumber(t.innerDiameterMm, 1)} mm)
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field
          label="Fittings allowance"
          error={formState.errors.fittingsAllowancePercent?.message}
          hint={`Added to the length; default ${DEFAULT_FITTINGS_ALLOWANCE_PERCENT} % (common practice, from memory).`}
        >
          {(c) => <UnitInput {...c} {...register('fittingsAllowancePercent', { valueAsNumber: true })} unit="%" inputMode="decimal" />}
        </Field>
        <Field
          label="Line pressure at the start"
          error={formState.errors.linePressureKPa?.message}
          hint={`Gauge; ${NOMINAL_DISTRIBUTION_PRESSURE_KPA} kPa nominal (HTM 02-01).`}
        >
          {(c) => <UnitInput {...c} {...register('linePressureKPa', { valueAsNumber: true })} unit="kPa" inputMode="decimal" />}
        </Field>
        <Field
          label="Allowed pressure drop"
          error={formState.errors.allowedDropKPa?.message}
          hint={`Empty: ${DEFAULT_ALLOWED_DROP_FRACTION * 100} % of the line pressure (common practice, from memory). Use your design standard's figure.`}
        >
          {(c) => <UnitInput {...c} {...register('allowedDropKPa', { setValueAs: optionalNumber })} unit="kPa" inputMode="decimal" />}
        </Field>
        <Field label="Gas temperature in the pipe" error={formState.errors.gasTemperatureC?.message} hint="Empty: 20 °C.">
          {(c) => <UnitInput {...c} {...register('gasTemperatureC', { setValueAs: optionalNumber })} unit="°C" inputMode="decimal" />}
        </Field>
      </div>
      <FormActions onCancel={onDone} busy={save.isPending} />
    </form>
  );
}
