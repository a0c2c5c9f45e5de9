import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { CAPACITY_GAS_CODES, DEPARTMENTS } from '@common/capacity/diversity-rules';
import { computeSimultaneousOutlets } from '@common/capacity/simultaneous-use';
import { zoneSchema, type ZoneFormValues } from '@common/schemas/capacity.schema';
import { applyServerErrors } from '@/lib/form-errors';
import { formatNumber } from '@/lib/format';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { FormActions } from '@/components/ui/dialog';
import { Field, Input, Select, Textarea, UnitInput } from '@/components/ui/field';
import { useDeleteZone, useSaveZone, type CapacityResponse, type RuleSetRow, type ZoneRow } from '../api/capacity-api';
import { departmentLabel, gasLabel, SOURCE_TYPE_LABELS } from '../lib/capacity-format';

const FIELDS = [
  'name',
  'gasCode',
  'department',
  'terminalUnits',
  'sourceId',
  'ruleSetId',
  'builtinRuleSet',
  'diversityMethod',
  'unitFlowLMin',
  'useProbability',
  'confidence',
  'notes',
] as const;
const optionalNumber = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));

/** Creates or edits a pipeline zone: gas, department, terminal units, source and how its flow is diversified. */
export function ZoneForm({
  siteId,
  initial,
  sources,
  ruleSets,
  onDone,
}: {
  siteId: number;
  initial: ZoneRow | null;
  sources: CapacityResponse['sources'];
  ruleSets: RuleSetRow[];
  onDone: () => void;
}) {
  const save = useSaveZone(siteId);
  const remove = useDeleteZone(siteId);
  const [banner, setBanner] = useState<string | null>(null);
  const [confirmDelete, setConfirmDelete] = useState(false);
  const defaults: ZoneFormValues = initial
    ? {
        name: initial.name,
        gasCode: initial.gasCode,
        department: initial.department,
        terminalUnits: initial.terminalUnits,
        sourceId: initial.sourceId,
        ruleSetId: initial.ruleSetId,
        builtinRuleSet: initial.builtinRuleSet,
        diversityMethod: initial.diversityMethod,
        unitFlowLMin: initial.unitFlowLMin,
        useProbability: initial.useProbability,
        confidence: initial.confidence,
        notes: initial.notes,
      }
    : {
        name: '',
        gasCode: 'O2',
        department: 'ward',
        terminalUnits: undefined as unknown as number,
        sourceId: null,
        ruleSetId: null,
        builtinRuleSet: 'default',
        diversityMethod: 'rule_set',
        unitFlowLMin: null,
        useProbability: null,
        confidence: 0.99,
        notes: '',
      };
  const { register, handleSubmit, setError, setValue, control, formState } = useForm({ resolver: zodResolver(zoneSchema), defaultValues: defaults });
  const [gasCode, method, ruleSetId, builtin, units, unitFlow, p, conf] = useWatch({
    control,
    name: ['gasCode', 'diversityMethod', 'ruleSetId', 'builtinRuleSet', 'terminalUnits', 'unitFlowLMin', 'useProbability', 'confidence'],
  });
  const gasSources = sources.filter((s) => s.gasCode === gasCode && s.type !== 'emergency_reserve');
  const ruleChoice = ruleSetId ? `org:${ruleSetId}` : (builtin ?? 'default');

  let binomialPreview: string | null = null;
  if (method === 'binomial' && Number(units) >= 1 && Number.isInteger(Number(units)) && unitFlow && p !== null && p !== undefined && conf) {
    try {
      const k = computeSimultaneousOutlets(Number(units), Number(p), Number(conf));
      binomialPreview = `${k.outletsInUse} of ${units} in use at once (P = ${formatNumber(k.cumulativeProbability, 4)}) → ${formatNumber(k.outletsInUse * Number(unitFlow), 1)} L/min`;
    } catch {
      binomialPreview = null;
    }
  }

  const onSubmit = handleSubmit((body) => {
    setBanner(null);
    save.mutate(
      { id: initial?.id, body },
      {
        onSuccess: (saved) => {
          toast.ok(`Saved zone ${saved.name}.`);
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
      <Field label="Zone name" error={formState.errors.name?.message} hint="As on the zone valve box, e.g. “Heron Ward oxygen”.">
        {(c) => <Input {...c} {...register('name')} />}
      </Field>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Gas" error={formState.errors.gasCode?.message}>
          {(c) => (
            <Select
              {...c}
              {...register('gasCode', {
                onChange: (e) => {
                  if (e.target.value === 'VAC') setValue('sourceId', null);
                },
              })}
            >
              {CAPACITY_GAS_CODES.map((g) => (
                <option key={g} value={g}>
                  {gasLabel(g)}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field label="Department" error={formState.errors.department?.message}>
          {(c) => (
            <Select {...c} {...register('department')}>
              {DEPARTMENTS.map((d) => (
                <option key={d} value={d}>
                  {departmentLabel(d)}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field
          label="Terminal units"
          error={formState.errors.terminalUnits?.message}
          hint="Or beds, rooms, trolley spaces: whatever the rule counts (shown on the check)."
        >
          {(c) => <Input {...c} {...register('terminalUnits', { valueAsNumber: true })} inputMode="numeric" className="tabular" />}
        </Field>
        <Field
          label="Supply source"
          error={formState.errors.sourceId?.message}
          hint={gasCode === 'VAC' ? 'Vacuum zones are served by the vacuum plant.' : 'The primary source of this gas; its reserve is found from it.'}
        >
          {(c) => (
            <Select {...c} {...register('sourceId', { setValueAs: optionalNumber })} disabled={gasCode === 'VAC'}>
              <option value="">None linked</option>
              {gasSources.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name} ({SOURCE_TYPE_LABELS[s.type] ?? s.type})
                </option>
              ))}
            </Select>
          )}
        </Field>
      </div>
      <Field label="Diversity" error={formState.errors.diversityMethod?.message}>
        {(c) => (
          <Select {...c} {...register('diversityMethod')}>
            <option value="rule_set">Department rule of a rule set</option>
            <option value="binomial">Binomial method (small zones)</option>
          </Select>
        )}
      </Field>
      {method === 'binomial' ? (
        <fieldset className="grid gap-4 rounded-lg border border-line p-3 sm:grid-cols-3">
          <legend className="px-1 text-sm font-bold">Binomial method: k of n units in use</legend>
          <Field label="Flow of one unit" error={formState.errors.unitFlowLMin?.message}>
            {(c) => <UnitInput {...c} {...register('unitFlowLMin', { setValueAs: optionalNumber })} unit="L/min" inputMode="decimal" />}
          </Field>
          <Field label="Chance one unit is in use" error={formState.errors.useProbability?.message} hint="0–1, from your own audit.">
            {(c) => <Input {...c} {...register('useProbability', { setValueAs: optionalNumber })} inputMode="decimal" className="tabular" />}
          </Field>
          <Field label="Confidence" error={formState.errors.confidence?.message} hint="e.g. 0.99">
            {(c) => <Input {...c} {...register('confidence', { setValueAs: optionalNumber })} inputMode="decimal" className="tabular" />}
          </Field>
          {binomialPreview && (
            <p className="text-sm sm:col-span-3" aria-live="polite">
              {binomialPreview}
            </p>
          )}
        </fieldset>
      ) : (
        <Field label="Rule set" error={formState.errors.ruleSetId?.message ?? formState.errors.builtinRuleSet?.message}>
          {(c) => (
            <Select
              {...c}
              value={ruleChoice}
              onChange={(e) => {
                const v = e.target.value;
                if (v.startsWith('org:')) {
                  setValue('ruleSetId', Number(v.slice(4)), { shouldDirty: true });
                } else {
                  setValue('ruleSetId', null, { shouldDirty: true });
                  setValue('builtinRuleSet', v, { shouldDirty: true });
                }
              }}
            >
              {ruleSets.map((r) => (
                <option key={r.key} value={r.key}>
                  {r.builtin ? `${r.name} (shipped)` : r.name}
                </option>
              ))}
            </Select>
          )}
        </Field>
      )}
      <Field label="Notes" error={formState.errors.notes?.message}>
        {(c) => <Textarea {...c} {...register('notes')} rows={2} />}
      </Field>
      {initial && (
        <div className="flex flex-wrap items-center gap-2">
          {confirmDelete ? (
            <>
              <span className="text-sm">Delete this zone and its pipe runs?</span>
              <Button
                variant="danger"
                size="sm"
                busy={remove.isPending}
                onClick={() =>
                  remove.mutate(initial.id, {
                    onSuccess: () => {
                      toast.ok(`Deleted zone ${initial.name}.`);
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
              Delete zone…
            </Button>
          )}
        </div>
      )}
      <FormActions onCancel={onDone} busy={save.isPending} />
    </form>
  );
}
