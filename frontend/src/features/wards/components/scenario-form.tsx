import { useState } from 'react';
import type { z } from 'zod';
import { useForm, useWatch } from 'react-hook-form';
import { DateTime } from 'luxon';
import { scenarioSchema } from '@common/schemas/supply.schema';
import { bodyResolver } from '@/lib/body-resolver';
import { applyServerErrors } from '@/lib/form-errors';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { FormActions } from '@/components/ui/dialog';
import { Field, Input, Select, Textarea, UnitInput } from '@/components/ui/field';
import { useDeleteScenario, useSaveScenario, type Scenario, type Ward } from '../api/wards-api';

const FIELDS = ['name', 'multiplier', 'extraPatients', 'extraFlowLMin', 'wardId', 'wardChange', 'fromLocal', 'untilLocal', 'note'] as const;
const optionalId = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));
const optionalText = (v: unknown) => (v === '' || v === null || v === undefined ? null : String(v));

/** Midnight starting tomorrow at the site: a scenario usually starts with a day. */
function startOfTomorrow(timeZone: string | undefined): string {
  return DateTime.now()
    .setZone(timeZone ?? 'local')
    .plus({ days: 1 })
    .startOf('day')
    .toFormat("yyyy-MM-dd'T'HH:mm");
}

/** The schema asks for the text a datetime-local input gives; a person only needs to fill it in. */
const localError = (message: string | undefined) => (message && /yyyy/.test(message) ? 'enter the date and time' : message);

/**
 * A what-if for the forecast: demand × a multiplier, extra patients at a flow, a ward that opens or
 * closes, from one local date-time (until another). Times are wall-clock times at the site.
 */
export function ScenarioForm({
  siteId,
  timeZone,
  wards,
  initial,
  defaultWardId = null,
  onDone,
  onSaved,
}: {
  siteId: number;
  timeZone?: string;
  wards: Ward[];
  initial: Scenario | null;
  defaultWardId?: number | null;
  onDone: () => void;
  onSaved?: () => void;
}) {
  const save = useSaveScenario(siteId, onSaved);
  const remove = useDeleteScenario(onSaved);
  const [banner, setBanner] = useState<string | null>(null);
  const [confirmDelete, setConfirmDelete] = useState(false);
  const { register, handleSubmit, setError, setValue, control, formState } = useForm({
    resolver: bodyResolver<z.input<typeof scenarioSchema>, typeof scenarioSchema>(scenarioSchema, (v) => v),
    defaultValues: initial
      ? {
          name: initial.name,
          multiplier: initial.multiplier,
          extraPatients: initial.extraPatients,
          extraFlowLMin: initial.extraFlowLMin,
          wardId: initial.wardId,
          wardChange: initial.wardChange,
          fromLocal: initial.fromLocal,
          untilLocal: initial.untilLocal,
          note: initial.note,
        }
      : {
          name: '',
          multiplier: 1,
          extraPatients: 0,
          extraFlowLMin: 0,
          wardId: defaultWardId,
          wardChange: null,
          fromLocal: startOfTomorrow(timeZone),
          untilLocal: null,
          note: '',
        },
  });
  const wardId = useWatch({ control, name: 'wardId' });
  const e = formState.errors;

  const onSubmit = handleSubmit((body) => {
    setBanner(null);
    save.mutate(
      { id: initial?.id, body },
      {
        onSuccess: (saved) => {
          toast.ok(`Saved scenario ${saved.name}.`);
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
        {(c) => <Input {...c} {...register('name')} maxLength={120} placeholder="e.g. Winter surge" />}
      </Field>
      <div className="grid gap-4 sm:grid-cols-3">
        <Field label="Demand multiplier" hint="1 = as modelled; 1.2 = 20 % more." error={e.multiplier?.message}>
          {(c) => <UnitInput {...c} {...register('multiplier', { valueAsNumber: true })} unit="×" inputMode="decimal" />}
        </Field>
        <Field label="Extra patients" hint="Oxygen patients beyond the therapy lines." error={e.extraPatients?.message}>
          {(c) => <Input {...c} {...register('extraPatients', { valueAsNumber: true })} inputMode="numeric" />}
        </Field>
        <Field label="Flow per extra patient" error={e.extraFlowLMin?.message}>
          {(c) => <UnitInput {...c} {...register('extraFlowLMin', { valueAsNumber: true })} unit="L/min" inputMode="decimal" />}
        </Field>
      </div>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Applies to" hint="A ward’s extra patients go to the sources that feed it; site-wide ones are shared." error={e.wardId?.message}>
          {(c) => (
            <Select {...c} {...register('wardId', { setValueAs: optionalId, onChange: (ev) => !ev.target.value && setValue('wardChange', null) })}>
              <option value="">The whole site</option>
              {wards.map((w) => (
                <option key={w.id} value={w.id}>
                  {w.name}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field label="The ward" error={e.wardChange?.message}>
          {(c) => (
            <Select {...c} {...register('wardChange', { setValueAs: optionalText })} disabled={!wardId}>
              <option value="">Stays as it is</option>
              <option value="close">Closes from the start</option>
              <option value="open">Opens from the start</option>
            </Select>
          )}
        </Field>
      </div>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="From" hint={timeZone ? `Site time (${timeZone}).` : 'Site time.'} error={localError(e.fromLocal?.message)}>
          {(c) => <Input {...c} {...register('fromLocal')} type="datetime-local" />}
        </Field>
        <Field label="Until" hint="Blank: to the end of the forecast." error={localError(e.untilLocal?.message)}>
          {(c) => <Input {...c} {...register('untilLocal', { setValueAs: optionalText })} type="datetime-local" />}
        </Field>
      </div>
      <Field label="Note" error={e.note?.message}>
        {(c) => <Textarea {...c} {...register('note')} rows={2} maxLength={500} />}
      </Field>
      {initial && (
        <div className="flex flex-wrap items-center gap-2">
          {confirmDelete ? (
            <>
              <span className="text-sm">Delete this scenario? Forecasts stop offering it.</span>
              <Button
                variant="danger"
                size="sm"
                busy={remove.isPending}
                onClick={() =>
                  remove.mutate(initial.id, {
                    onSuccess: () => {
                      toast.ok(`Deleted scenario ${initial.name}.`);
                      onDone();
                    },
                  })
                }
              >
                Delete
              </Button>
              <Button variant="secondary" size="sm" onClick={() => setConfirmDelete(false)}>
                Keep
              </Button>
            </>
          ) : (
            <Button variant="ghost" size="sm" onClick={() => setConfirmDelete(true)}>
              Delete scenario…
            </Button>
          )}
        </div>
      )}
      <FormActions onCancel={onDone} busy={save.isPending} submitLabel={initial ? 'Save changes' : 'Add scenario'} />
    </form>
  );
}
