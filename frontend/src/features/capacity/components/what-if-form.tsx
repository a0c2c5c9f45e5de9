import { useState, type FormEvent } from 'react';
import { capacityQuerySchema } from '@common/schemas/capacity.schema';
import { Button } from '@/components/ui/button';
import { Field, UnitInput, Input } from '@/components/ui/field';
import type { CapacityWhatIf } from '../api/capacity-api';

type Draft = { flowPerPatientLMin: string; vaporiserDerating: string; peakHoursPerDay: string };
const toDraft = (w: CapacityWhatIf): Draft => ({
  flowPerPatientLMin: w.flowPerPatientLMin === undefined ? '40' : String(w.flowPerPatientLMin),
  vaporiserDerating: w.vaporiserDerating === undefined ? '' : String(w.vaporiserDerating),
  peakHoursPerDay: w.peakHoursPerDay === undefined ? '10' : String(w.peakHoursPerDay),
});

/** The check's what-if inputs, each with its documented default; applied to the page address. */
export function WhatIfForm({ value, onApply }: { value: CapacityWhatIf; onApply: (next: CapacityWhatIf) => void }) {
  const [draft, setDraft] = useState<Draft>(() => toDraft(value));
  const [errors, setErrors] = useState<Partial<Record<keyof Draft, string>>>({});
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = capacityQuerySchema.safeParse({
      flowPerPatientLMin: draft.flowPerPatientLMin,
      peakHoursPerDay: draft.peakHoursPerDay,
      ...(draft.vaporiserDerating.trim() ? { vaporiserDerating: draft.vaporiserDerating } : {}),
    });
    if (!parsed.success) {
      setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
      return;
    }
    setErrors({});
    onApply(parsed.data);
  };
  const set = (k: keyof Draft) => (e: { target: { value: string } }) => setDraft((d) => ({ ...d, [k]: e.target.value }));
  return (
    <form onSubmit={submit} noValidate className="grid gap-4 sm:grid-cols-[1fr_1fr_1fr_auto] sm:items-end">
      <Field label="Flow of one surge patient" hint="Default 40 L/min: high-flow nasal oxygen." error={errors.flowPerPatientLMin}>
        {(c) => <UnitInput {...c} value={draft.flowPerPatientLMin} onChange={set('flowPerPatientLMin')} unit="L/min" inputMode="decimal" />}
      </Field>
      <Field label="Vaporiser derating (what-if)" hint="Empty: each tank's own, else 0.7. Try 0.5 for a frost check." error={errors.vaporiserDerating}>
        {(c) => <Input {...c} value={draft.vaporiserDerating} onChange={set('vaporiserDerating')} inputMode="decimal" placeholder="0.7" className="tabular" />}
      </Field>
      <Field label="Peak hours a day" hint="For manifold sizing; default 10 (08:00–18:00)." error={errors.peakHoursPerDay}>
        {(c) => <UnitInput {...c} value={draft.peakHoursPerDay} onChange={set('peakHoursPerDay')} unit="h" inputMode="decimal" />}
      </Field>
      <Button type="submit" variant="secondary">
        Recompute
      </Button>
    </form>
  );
}
