import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { cylinderTypeSchema, GAS_CODES_CATALOGUE } from '@common/schemas/admin.schema';
import { cylinderTypeName, nominalContents } from '@common/catalogue/cylinder-type';
import { applyServerErrors } from '@/lib/form-errors';
import { formatKg, formatLitres } from '@/lib/format';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { FormActions } from '@/components/ui/dialog';
import { Checkbox, Field, Input, Select, UnitInput } from '@/components/ui/field';
import { useSaveCylinderType, type CylinderType, type Gas } from '../api/catalogue-api';

const FIELDS = [
  'gasCode',
  'waterCapacityL',
  'fillPressureBar',
  'tareKg',
  'maxFillingRatioKgPerL',
  'residualGaugeBar',
  'material',
  'valveNotes',
  'active',
] as const;
const LIQUEFIED = new Set(['N2O', 'CO2']);
const optionalNumber = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));

export function CylinderTypeForm({ initial, gases, onDone }: { initial: CylinderType | null; gases: Gas[]; onDone: () => void }) {
  const save = useSaveCylinderType();
  const [banner, setBanner] = useState<string | null>(null);
  const { register, handleSubmit, setError, control, formState } = useForm({
    resolver: zodResolver(cylinderTypeSchema),
    defaultValues: initial
      ? {
          gasCode: initial.gasCode as (typeof GAS_CODES_CATALOGUE)[number],
          waterCapacityL: String(initial.waterCapacityL),
          fillPressureBar: String(initial.fillPressureBar),
          tareKg: initial.tareKg,
          maxFillingRatioKgPerL: initial.maxFillingRatioKgPerL,
          residualGaugeBar: initial.residualGaugeBar ?? null,
          material: initial.material,
          valveNotes: initial.valveNotes,
          active: initial.active,
        }
      : {
          gasCode: 'O2' as const,
          waterCapacityL: '',
          fillPressureBar: '',
          tareKg: null,
          maxFillingRatioKgPerL: null,
          residualGaugeBar: null,
          material: '',
          valveNotes: '',
          active: true,
        },
  });
  const [gasCode, water, fill, ratio] = useWatch({ control, name: ['gasCode', 'waterCapacityL', 'fillPressureBar', 'maxFillingRatioKgPerL'] });
  const liquefied = LIQUEFIED.has(String(gasCode));
  const w = Number(water);
  const f = Number(fill);
  const preview =
    w > 0 && f > 0
      ? {
          name: cylinderTypeName(w, f),
          nominal: nominalContents({ gas: String(gasCode), waterCapacityL: w, fillPressureBar: f, maxFillingRatioKgPerL: ratio ? Number(ratio) : null }),
        }
      : null;

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
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {banner && (
        <Alert tone="critical" title="Not saved" role="alert">
          {banner}
        </Alert>
      )}
      <Field label="Gas" error={formState.errors.gasCode?.message}>
        {(c) => (
          <Select {...c} {...register('gasCode')}>
            {GAS_CODES_CATALOGUE.map((code) => (
              <option key={code} value={code}>
                {gases.find((g) => g.code === code)?.name ?? code}
              </option>
            ))}
          </Select>
        )}
      </Field>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Water capacity" error={formState.errors.waterCapacityL?.message}>
          {(c) => <UnitInput {...c} {...register('waterCapacityL')} unit="L" inputMode="decimal" />}
        </Field>
        <Field label={liquefied ? 'Test/service pressure' : 'Fill pressure (gauge)'} error={formState.errors.fillPressureBar?.message}>
          {(c) => <UnitInput {...c} {...register('fillPressureBar')} unit="bar" inputMode="decimal" />}
        </Field>
        <Field
          label="Tare weight"
          hint={liquefied ? 'Stamped on the cylinder: needed to weigh the contents.' : 'Optional for compressed gases.'}
          error={formState.errors.tareKg?.message}
        >
          {(c) => <UnitInput {...c} {...register('tareKg', { setValueAs: optionalNumber })} unit="kg" inputMode="decimal" />}
        </Field>
        {!liquefied && (
          <Field
            label="Changed at (residual)"
            hint="Gauge pressure at which a cylinder is changed; the gas left is not counted as stock. Empty: 10 % of the fill pressure (common practice; US EMS guidance keeps about 200 psi)."
            error={formState.errors.residualGaugeBar?.message}
          >
            {(c) => <UnitInput {...c} {...register('residualGaugeBar', { setValueAs: optionalNumber })} unit="bar" inputMode="decimal" />}
          </Field>
        )}
        {liquefied && (
          <Field label="Maximum filling ratio" hint="kg of gas per litre of water capacity, e.g. 0.75." error={formState.errors.maxFillingRatioKgPerL?.message}>
            {(c) => <UnitInput {...c} {...register('maxFillingRatioKgPerL', { setValueAs: optionalNumber })} unit="kg/L" inputMode="decimal" />}
          </Field>
        )}
      </div>
      <Field label="Material" error={formState.errors.material?.message}>
        {(c) => <Input {...c} {...register('material')} placeholder="steel, aluminium, composite" />}
      </Field>
      <Field label="Valve and handling notes" error={formState.errors.valveNotes?.message}>
        {(c) => <Input {...c} {...register('valveNotes')} />}
      </Field>
      <Checkbox label="Active (offered in the cylinder check and in orders)" {...register('active')} />
      {preview && (
        <div className="rounded-lg border border-line bg-surface-sunken px-4 py-3 text-sm" aria-live="polite">
          <p>
            Will be listed as <strong>{preview.name}</strong>
          </p>
          {preview.nominal ? (
            <p className="text-fg-muted">
              Full: {formatLitres(preview.nominal.freeGasL)} free gas (real gas)
              {preview.nominal.idealFreeGasL !== null && <> · {formatLitres(preview.nominal.idealFreeGasL)} by pV = nRT</>} · {formatKg(preview.nominal.massKg)}{' '}
              · {preview.nominal.basis}
            </p>
          ) : (
            <p className="text-fg-muted">
              {liquefied ? 'Give the filling ratio to see the nominal contents.' : 'The engine cannot compute these contents: check the figures.'}
            </p>
          )}
        </div>
      )}
      <FormActions onCancel={onDone} busy={save.isPending} />
    </form>
  );
}
