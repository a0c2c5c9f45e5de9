import { useState } from 'react';
import type { z } from 'zod';
import { useForm } from 'react-hook-form';
import { DEPARTMENTS, wardSchema } from '@common/schemas/supply.schema';
import { bodyResolver } from '@/lib/body-resolver';
import { applyServerErrors } from '@/lib/form-errors';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { FormActions } from '@/components/ui/dialog';
import { Checkbox, Field, Input, Select, UnitInput } from '@/components/ui/field';
import { useSaveWard, type Ward } from '../api/wards-api';
import { DEPARTMENT_LABEL } from '../lib/ward-labels';

/** An empty number field: shown blank, and reported by the schema as "must be a number" if left so. */
const BLANK = '' as unknown as number;

const FIELDS = ['name', 'department', 'beds', 'leakagePercent', 'active'] as const;

/** A ward's name, department, beds and the leakage allowance its demand carries. */
export function WardForm({ siteId, initial, onDone, onSaved }: { siteId: number; initial: Ward | null; onDone: () => void; onSaved?: () => void }) {
  const save = useSaveWard(siteId, onSaved);
  const [banner, setBanner] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm({
    resolver: bodyResolver<z.input<typeof wardSchema>, typeof wardSchema>(wardSchema, (v) => v),
    defaultValues: initial
      ? { name: initial.name, department: initial.department, beds: initial.beds, leakagePercent: initial.leakagePercent, active: initial.active }
      : { name: '', department: 'ward' as const, beds: BLANK, leakagePercent: 3, active: true },
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
      <Field label="Name" error={e.name?.message}>
        {(c) => <Input {...c} {...register('name')} maxLength={120} />}
      </Field>
      <div className="grid gap-4 sm:grid-cols-3">
        <Field label="Department" error={e.department?.message}>
          {(c) => (
            <Select {...c} {...register('department')}>
              {DEPARTMENTS.map((d) => (
                <option key={d} value={d}>
                  {DEPARTMENT_LABEL[d]}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field label="Beds" error={e.beds?.message}>
          {(c) => <Input {...c} {...register('beds', { valueAsNumber: true })} inputMode="numeric" />}
        </Field>
        <Field label="Leakage allowance" hint="Added to every therapy line; from the pipeline’s pressure-decay test." error={e.leakagePercent?.message}>
          {(c) => <UnitInput {...c} {...register('leakagePercent', { valueAsNumber: true })} unit="%" inputMode="decimal" />}
        </Field>
      </div>
      <Checkbox label="Open (its therapy lines count in the forecast)" {...register('active')} />
      <FormActions onCancel={onDone} busy={save.isPending} submitLabel={initial ? 'Save changes' : 'Add ward'} />
    </form>
  );
}
