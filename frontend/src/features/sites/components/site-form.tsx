import { useMemo, useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { siteSchema } from '@common/schemas/admin.schema';
import { applyServerErrors } from '@/lib/form-errors';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { FormActions } from '@/components/ui/dialog';
import { Field, Input, Select, Textarea, UnitInput } from '@/components/ui/field';
import { useSaveSite, type Site } from '../api/sites-api';

const FIELDS = [
  'name',
  'kind',
  'address',
  'timeZone',
  'referenceCode',
  'unitSystem',
  'altitudeM',
  'atmosphericBar',
  'currency',
  'cylinderColours',
  'storeTemperatureC',
  'beds',
] as const;
const optionalNumber = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));

export const REFERENCE_LABELS: Record<Site['referenceCode'], string> = {
  '15C': '15 °C and 1.01325 bar (UK and EU cylinder basis)',
  '21C': '70 °F (21.1 °C) and 1 atm (US basis)',
  '0C': '0 °C and 1.01325 bar (normal cubic metres)',
};
export const COLOUR_LABELS: Record<Site['cylinderColours'], string> = { ISO32: 'ISO 32 (Europe and most of the world)', CGA_C9: 'CGA C-9 (United States)' };

function timeZones(): string[] {
  try {
    return (Intl as unknown as { supportedValuesOf(k: string): string[] }).supportedValuesOf('timeZone');
  } catch {
    return [];
  }
}

export function SiteForm({ initial, onDone, onSaved }: { initial: Site | null; onDone: () => void; onSaved?: () => void }) {
  const save = useSaveSite(onSaved);
  const [banner, setBanner] = useState<string | null>(null);
  const zones = useMemo(timeZones, []);
  const { register, handleSubmit, setError, formState } = useForm({
    resolver: zodResolver(siteSchema),
    defaultValues: initial
      ? {
          name: initial.name,
          kind: initial.kind,
          address: initial.address,
          timeZone: initial.timeZone,
          referenceCode: initial.referenceCode,
          unitSystem: initial.unitSystem,
          altitudeM: String(initial.altitudeM),
          atmosphericBar: null,
          currency: initial.currency,
          cylinderColours: initial.cylinderColours,
          storeTemperatureC: String(initial.storeTemperatureC),
          beds: String(initial.beds),
        }
      : {
          name: '',
          kind: 'hospital' as const,
          address: '',
          timeZone: Intl.DateTimeFormat().resolvedOptions().timeZone,
          referenceCode: '15C' as const,
          unitSystem: 'metric' as const,
          altitudeM: '0',
          atmosphericBar: null,
          currency: 'GBP',
          cylinderColours: 'ISO32' as const,
          storeTemperatureC: '15',
          beds: '0',
        },
  });
  const e = formState.errors;

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
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Name" error={e.name?.message} className="sm:col-span-2">
          {(c) => <Input {...c} {...register('name')} />}
        </Field>
        <Field label="Kind" error={e.kind?.message}>
          {(c) => (
            <Select {...c} {...register('kind')}>
              <option value="hospital">Hospital</option>
              <option value="clinic">Clinic</option>
              <option value="other">Other</option>
            </Select>
          )}
        </Field>
        <Field label="Beds" error={e.beds?.message}>
          {(c) => <Input {...c} {...register('beds')} inputMode="numeric" />}
        </Field>
        <Field label="Address" error={e.address?.message} className="sm:col-span-2">
          {(c) => <Textarea {...c} {...register('address')} rows={2} />}
        </Field>
        <Field label="Time zone" hint="An IANA name, e.g. Europe/London." error={e.timeZone?.message}>
          {(c) => (
            <>
              <Input {...c} {...register('timeZone')} list="time-zones" autoCapitalize="none" spellCheck={false} />
              <datalist id="time-zones">
                {zones.map((z) => (
                  <option key={z} value={z} />
                ))}
              </datalist>
            </>
          )}
        </Field>
        <Field label="Currency" hint="Three letters, ISO 4217." error={e.currency?.message}>
          {(c) => <Input {...c} {...register('currency')} maxLength={3} autoCapitalize="characters" className="uppercase" />}
        </Field>
        <Field label="Free gas stated at" error={e.referenceCode?.message} className="sm:col-span-2">
          {(c) => (
            <Select {...c} {...register('referenceCode')}>
              {Object.entries(REFERENCE_LABELS).map(([k, v]) => (
                <option key={k} value={k}>
                  {v}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field label="Units" error={e.unitSystem?.message}>
          {(c) => (
            <Select {...c} {...register('unitSystem')}>
              <option value="metric">Metric (bar, °C, kg)</option>
              <option value="us">US (psi, °F, lb)</option>
            </Select>
          )}
        </Field>
        <Field label="Cylinder colours" error={e.cylinderColours?.message}>
          {(c) => (
            <Select {...c} {...register('cylinderColours')}>
              {Object.entries(COLOUR_LABELS).map(([k, v]) => (
                <option key={k} value={k}>
                  {v}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field label="Altitude" error={e.altitudeM?.message}>
          {(c) => <UnitInput {...c} {...register('altitudeM')} unit="m" inputMode="decimal" />}
        </Field>
        <Field
          label="Atmospheric pressure"
          hint={
            initial
              ? `Now ${initial.atmosphericBar.toFixed(4)} bar. Leave empty to compute it from the altitude.`
              : 'Leave empty to compute it from the altitude.'
          }
          error={e.atmosphericBar?.message}
        >
          {(c) => <UnitInput {...c} {...register('atmosphericBar', { setValueAs: optionalNumber })} unit="bar" inputMode="decimal" />}
        </Field>
        <Field
          label="Cylinder store temperature"
          hint="The usual temperature of the store: the cylinder check starts from it."
          error={e.storeTemperatureC?.message}
        >
          {(c) => <UnitInput {...c} {...register('storeTemperatureC')} unit="°C" inputMode="decimal" />}
        </Field>
      </div>
      <FormActions onCancel={onDone} busy={save.isPending} />
    </form>
  );
}
