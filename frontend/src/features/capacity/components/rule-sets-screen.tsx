import { useMemo, useState, type FormEvent } from 'react';
import { useQuery } from '@tanstack/react-query';
import {
  CAPACITY_GAS_CODES,
  COUNT_BASES,
  DEPARTMENTS,
  UNVERIFIED_WARNING,
  departmentRuleSchema,
  ruleSourceSchema,
  type DepartmentRule,
  type DiversityRuleSet,
} from '@common/capacity/diversity-rules';
import { ApiError, errorMessage } from '@/lib/api-client';
import { formatNumber } from '@/lib/format';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button, ButtonLink } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Dialog, FormActions } from '@/components/ui/dialog';
import { Checkbox, Field, Input, Select } from '@/components/ui/field';
import { Icon } from '@/components/ui/icons';
import { PageHeader } from '@/components/ui/page-header';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { capacityQueries, useCreateRuleSet, useDeleteRuleSet, useUpdateRuleSet, type RuleSetRow } from '../api/capacity-api';
import { COUNT_LABELS, departmentLabel, gasLabel } from '../lib/capacity-format';

type Method = DepartmentRule['method'];
const METHOD_LABELS: Record<Method, string> = {
  first_plus_further: 'First unit + further units × diversity',
  use_factor: 'Units × flow × use factor',
  as2896_factor: 'Units × flow × F(n), AS 2896 style',
  binomial: 'Binomial: k of n in use at a confidence',
};

/** A rule in words and numbers: "10 + (n − 1) × 6 × 0.25". */
export function describeRule(rule: DepartmentRule): string {
  switch (rule.method) {
    case 'first_plus_further':
      return `${formatNumber(rule.first_unit_L_min, 2)} + (n − 1) × ${formatNumber(rule.further_unit_L_min, 2)} × ${formatNumber(rule.diversity, 3)} L/min`;
    case 'use_factor':
      return `n × ${formatNumber(rule.unit_L_min, 2)} × ${formatNumber(rule.use_factor, 3)} L/min`;
    case 'as2896_factor':
      return `n × ${formatNumber(rule.unit_L_min, 2)} × min(1, 1.3 / log10(10n)) L/min`;
    case 'binomial':
      return `k × ${formatNumber(rule.unit_L_min, 2)} L/min, k: P(X ≤ k) ≥ ${rule.confidence}, p = ${rule.use_probability}`;
  }
}

/**
 * The diversity rule sets: the shipped ones (read-only, each rule with its source and whether it was
 * seen in that source) and the organisation's own copies, which the biomedical engineer edits.
 */
export function RuleSetsScreen({ canEdit }: { canEdit: boolean }) {
  const sets = useQuery(capacityQueries.ruleSets());
  const [selected, setSelected] = useState<string>('default');
  const [copyOf, setCopyOf] = useState<RuleSetRow | null>(null);
  const current = sets.data?.find((s) => s.key === selected) ?? sets.data?.[0];
  return (
    <div className="flex flex-col gap-5">
      <PageHeader
        title="Diversity rule sets"
        description="Rules that turn terminal-unit counts into a diversified design flow. The shipped sets carry their sources; copy one to edit it for your organisation."
        actions={
          <ButtonLink to="/capacity" variant="secondary">
            <Icon name="chevronLeft" />
            Back to the check
          </ButtonLink>
        }
      />
      <Alert tone="watch" title="Oxygen rules of the shipped HTM 02-01 set are from memory">
        The vacuum (Table 21) and 50:50 N2O/O2 (§§4.31–4.32) rules were seen in the published text. The oxygen table is recalled, not verified: every oxygen
        figure computed with it says “{UNVERIFIED_WARNING}”. Check it against your copy of the standard before relying on it. The GB 50751-2012 set is quoted
        from a supplier page and is not verified against the standard either.
      </Alert>
      {sets.isPending ? (
        <Card>
          <LoadingState />
        </Card>
      ) : sets.isError ? (
        <Card>
          <ErrorState error={sets.error} onRetry={() => sets.refetch()} />
        </Card>
      ) : (
        <div className="grid gap-5 lg:grid-cols-[18rem_1fr]">
          <Card>
            <CardHeader title="Rule sets" />
            <ul className="flex flex-col p-2">
              {sets.data.map((s) => (
                <li key={s.key}>
                  <button
                    type="button"
                    onClick={() => setSelected(s.key)}
                    aria-current={current?.key === s.key ? 'true' : undefined}
                    className="flex w-full flex-col items-start rounded-lg px-3 py-2 text-left hover:bg-primary-soft aria-[current=true]:bg-primary-soft aria-[current=true]:font-bold"
                  >
                    <span>{s.name}</span>
                    <span className="text-xs text-fg-muted">
                      {s.builtin ? 'Shipped, read-only' : `Own · used by ${s.usedByZones ?? 0} zone${s.usedByZones === 1 ? '' : 's'}`}
                    </span>
                  </button>
                </li>
              ))}
            </ul>
          </Card>
          {current && (
            <RuleSetView
              key={`${current.key}-${current.updatedAt}`}
              set={current}
              basedOnName={sets.data.find((s) => s.key === current.basedOn)?.name ?? current.basedOn}
              canEdit={canEdit}
              onCopy={() => setCopyOf(current)}
              onDeleted={() => setSelected('default')}
            />
          )}
        </div>
      )}
      <Dialog open={copyOf !== null} onClose={() => setCopyOf(null)} title={`Copy “${copyOf?.name ?? ''}”`}>
        {copyOf && (
          <CopyForm
            base={copyOf}
            onDone={(created) => {
              setCopyOf(null);
              if (created) setSelected(created.key);
            }}
          />
        )}
      </Dialog>
    </div>
  );
}

function CopyForm({ base, onDone }: { base: RuleSetRow; onDone: (created: RuleSetRow | null) => void }) {
  const create = useCreateRuleSet();
  const [name, setName] = useState(`${base.name.replace(/\s*\(.*\)$/, '')} (our copy)`);
  const [error, setError] = useState<string | null>(null);
  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (!name.trim()) return setError('give the copy a name');
    create.mutate(
      { name: name.trim(), basedOn: base.builtin ? base.key : base.id },
      { onSuccess: (created) => (toast.ok(`Created ${created.name}.`), onDone(created)), onError: (err) => setError(errorMessage(err)) },
    );
  };
  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4">
      <Field label="Name of the copy" error={error ?? undefined}>
        {(c) => <Input {...c} value={name} onChange={(e) => setName(e.target.value)} />}
      </Field>
      <p className="text-sm text-fg-muted">The copy keeps every rule, its source and whether it was verified. Zones choose their rule set in the zone form.</p>
      <FormActions onCancel={() => onDone(null)} busy={create.isPending} submitLabel="Copy" />
    </form>
  );
}

interface RuleRef {
  gas: string;
  department: string;
}

function RuleSetView({
  set,
  basedOnName,
  canEdit,
  onCopy,
  onDeleted,
}: {
  set: RuleSetRow;
  basedOnName: string | null;
  canEdit: boolean;
  onCopy: () => void;
  onDeleted: () => void;
}) {
  const editable = canEdit && !set.builtin;
  const [draft, setDraft] = useState<DiversityRuleSet>(() => structuredClone(set.rules));
  const [name, setName] = useState(set.name);
  const [ruleDialog, setRuleDialog] = useState<RuleRef | 'new' | null>(null);
  const [sourceDialog, setSourceDialog] = useState(false);
  const [banner, setBanner] = useState<string | null>(null);
  const update = useUpdateRuleSet();
  const remove = useDeleteRuleSet();
  const dirty = useMemo(() => JSON.stringify(draft) !== JSON.stringify(set.rules) || name !== set.name, [draft, set.rules, name, set.name]);
  const gases = Object.entries(draft.gases).filter(([, g]) => g);

  const save = () => {
    if (set.id === null) return;
    setBanner(null);
    update.mutate(
      { id: set.id, body: { name, rules: draft } },
      {
        onSuccess: () => toast.ok(`Saved ${name}.`),
        onError: (err) =>
          setBanner(err instanceof ApiError && err.details?.length ? err.details.map((d) => `${d.path}: ${d.message}`).join('; ') : errorMessage(err)),
      },
    );
  };
  const removeRule = (ref: RuleRef) =>
    setDraft((d) => {
      const next = structuredClone(d);
      const g = next.gases[ref.gas as keyof typeof next.gases];
      if (g) delete g.departments[ref.department as keyof typeof g.departments];
      return next;
    });

  return (
    <Card className="min-w-0">
      <CardHeader
        title={set.name}
        description={
          set.builtin
            ? 'Shipped with Plenum. Copy it to change a rule.'
            : `${basedOnName ? `Copy of ${basedOnName}.` : 'Written by your organisation.'} Changes apply to every zone that uses this set.`
        }
        actions={
          <>
            {canEdit && (
              <Button variant="secondary" size="sm" onClick={onCopy}>
                Copy
              </Button>
            )}
            {editable && set.id !== null && (
              <Button
                variant="ghost"
                size="sm"
                disabled={(set.usedByZones ?? 0) > 0}
                title={(set.usedByZones ?? 0) > 0 ? 'Zones use this set' : undefined}
                busy={remove.isPending}
                onClick={() => remove.mutate(set.id!, { onSuccess: () => (toast.ok(`Deleted ${set.name}.`), onDeleted()) })}
              >
                Delete
              </Button>
            )}
          </>
        }
      />
      <CardBody className="flex flex-col gap-5">
        {banner && (
          <Alert tone="critical" title="Not saved" role="alert">
            {banner}
          </Alert>
        )}
        {editable && (
          <div className="flex flex-wrap items-end gap-3">
            <Field label="Name" className="min-w-64 flex-1">
              {(c) => <Input {...c} value={name} onChange={(e) => setName(e.target.value)} />}
            </Field>
            <Button variant="secondary" onClick={() => setRuleDialog('new')}>
              <Icon name="plus" />
              Add rule
            </Button>
            <Button variant="secondary" onClick={() => setSourceDialog(true)}>
              <Icon name="plus" />
              Add source
            </Button>
            <Button onClick={save} disabled={!dirty} busy={update.isPending}>
              Save rule set
            </Button>
          </div>
        )}
        {draft.description && <p className="text-sm text-fg-muted">{draft.description}</p>}
        {gases.map(([gas, rules]) => (
          <section key={gas} aria-labelledby={`rules-${gas}`}>
            <h3 id={`rules-${gas}`} className="mb-1 text-base">
              {gasLabel(gas)}
            </h3>
            {rules!.note && <p className="mb-2 text-xs text-fg-muted">{rules!.note}</p>}
            {/* scrolls sideways on a phone: focusable, so the keyboard can scroll it too */}
            <div className="overflow-x-auto" tabIndex={0} role="region" aria-labelledby={`rules-${gas}`}>
              <table className="w-full min-w-[44rem] text-sm">
                <thead>
                  <tr className="border-b border-line text-left text-xs text-fg-muted uppercase">
                    <th className="py-1 pr-3">Department</th>
                    <th className="py-1 pr-3">Rule</th>
                    <th className="py-1 pr-3">Counts</th>
                    <th className="py-1 pr-3">Source</th>
                    {editable && (
                      <th className="py-1">
                        <span className="sr-only">Actions</span>
                      </th>
                    )}
                  </tr>
                </thead>
                <tbody>
                  {Object.entries(rules!.departments).map(([dept, rule]) => {
                    const source = draft.sources.find((s) => s.id === rule!.source);
                    return (
                      <tr key={dept} className="border-b border-line/60 align-top">
                        <td className="py-2 pr-3 font-bold">{departmentLabel(dept)}</td>
                        <td className="py-2 pr-3">
                          <span className="tabular">{describeRule(rule!)}</span>
                          {rule!.note && <span className="block text-xs text-fg-muted">{rule!.note}</span>}
                        </td>
                        <td className="py-2 pr-3">{COUNT_LABELS[rule!.counts] ?? rule!.counts}</td>
                        <td className="py-2 pr-3">
                          {rule!.verified ? (
                            <Badge tone="ok">Checked against the standard’s table</Badge>
                          ) : (
                            <Badge tone="watch">{source?.unverified_warning ?? UNVERIFIED_WARNING}</Badge>
                          )}
                          <span className="block text-xs text-fg-muted">{source?.citation ?? rule!.source}</span>
                        </td>
                        {editable && (
                          <td className="py-2">
                            <div className="flex gap-1">
                              <Button
                                variant="ghost"
                                size="sm"
                                onClick={() => setRuleDialog({ gas, department: dept })}
                                aria-label={`Edit ${gasLabel(gas)} ${departmentLabel(dept)} rule`}
                              >
                                Edit
                              </Button>
                              <Button
                                variant="ghost"
                                size="sm"
                                onClick={() => removeRule({ gas, department: dept })}
                                aria-label={`Remove ${gasLabel(gas)} ${departmentLabel(dept)} rule`}
                              >
                                Remove
                              </Button>
                            </div>
                          </td>
                        )}
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </div>
            {rules!.multi_zone && (
              <p className="mt-1 text-sm">
                Several {rules!.multi_zone.departments.map(departmentLabel).join('/')} zones: largest + {rules!.multi_zone.fraction_of_others} × the others{' '}
                {!rules!.multi_zone.verified && <Badge tone="watch">{UNVERIFIED_WARNING}</Badge>}
              </p>
            )}
          </section>
        ))}
        {draft.missing && Object.keys(draft.missing).length > 0 && (
          <details className="text-sm">
            <summary className="cursor-pointer font-bold">Gases without a rule in this set</summary>
            <ul className="mt-1 list-disc pl-5">
              {Object.entries(draft.missing).map(([gas, why]) => (
                <li key={gas}>
                  <strong>{gasLabel(gas)}</strong>: {why}
                </li>
              ))}
            </ul>
          </details>
        )}
        <div>
          <h3 className="mb-1 text-base">Sources</h3>
          <ul className="flex flex-col gap-1 text-sm">
            {draft.sources.map((s) => (
              <li key={s.id}>
                {s.verified ? <Badge tone="ok">Seen</Badge> : <Badge tone="watch">From memory</Badge>} {s.citation}{' '}
                <span className="text-xs text-fg-muted">({s.id})</span>
              </li>
            ))}
          </ul>
        </div>
      </CardBody>
      <Dialog open={ruleDialog !== null} onClose={() => setRuleDialog(null)} title={ruleDialog === 'new' ? 'Add a rule' : 'Edit rule'}>
        {ruleDialog !== null && (
          <RuleForm
            draft={draft}
            at={ruleDialog === 'new' ? null : ruleDialog}
            onDone={(ref, rule) => {
              if (ref && rule) {
                setDraft((d) => {
                  const next = structuredClone(d);
                  const key = ref.gas as keyof typeof next.gases;
                  next.gases[key] = next.gases[key] ?? { departments: {} };
                  (next.gases[key]!.departments as Record<string, DepartmentRule>)[ref.department] = rule;
                  if (next.missing) delete next.missing[key];
                  return next;
                });
              }
              setRuleDialog(null);
            }}
          />
        )}
      </Dialog>
      <Dialog open={sourceDialog} onClose={() => setSourceDialog(false)} title="Add a source">
        {sourceDialog && (
          <SourceForm
            existing={draft.sources.map((s) => s.id)}
            onDone={(source) => {
              if (source) setDraft((d) => ({ ...d, sources: [...d.sources, source] }));
              setSourceDialog(false);
            }}
          />
        )}
      </Dialog>
    </Card>
  );
}

type RuleDraft = {
  gas: string;
  department: string;
  method: Method;
  first: string;
  further: string;
  diversity: string;
  unit: string;
  factor: string;
  p: string;
  confidence: string;
  counts: string;
  source: string;
  verified: boolean;
  note: string;
};

function toRuleDraft(draft: DiversityRuleSet, at: RuleRef | null): RuleDraft {
  const rule = at ? (draft.gases[at.gas as keyof typeof draft.gases]?.departments as Record<string, DepartmentRule> | undefined)?.[at.department] : undefined;
  const s = (n: number | undefined) => (n === undefined ? '' : String(n));
  return {
    gas: at?.gas ?? 'O2',
    department: at?.department ?? 'ward',
    method: rule?.method ?? 'first_plus_further',
    first: s(rule?.method === 'first_plus_further' ? rule.first_unit_L_min : undefined),
    further: s(rule?.method === 'first_plus_further' ? rule.further_unit_L_min : undefined),
    diversity: s(rule?.method === 'first_plus_further' ? rule.diversity : undefined),
    unit: s(rule && rule.method !== 'first_plus_further' ? rule.unit_L_min : undefined),
    factor: s(rule?.method === 'use_factor' ? rule.use_factor : undefined),
    p: s(rule?.method === 'binomial' ? rule.use_probability : undefined),
    confidence: s(rule?.method === 'binomial' ? rule.confidence : undefined),
    counts: rule?.counts ?? 'terminal_unit',
    source: rule?.source ?? draft.sources[0]?.id ?? '',
    verified: rule?.verified ?? false,
    note: rule?.note ?? '',
  };
}

/** zod's messages for people: what to enter, not what was received. */
function ruleIssueMessage(issue: { code: string; message: string; minimum?: unknown; maximum?: unknown; inclusive?: boolean }): string {
  if (issue.code === 'invalid_type') return 'enter a number';
  if (issue.code === 'too_big') return `at most ${String(issue.maximum)}`;
  if (issue.code === 'too_small') return issue.inclusive === false ? `above ${String(issue.minimum)}` : `at least ${String(issue.minimum)}`;
  return issue.message;
}

function RuleForm({ draft, at, onDone }: { draft: DiversityRuleSet; at: RuleRef | null; onDone: (ref: RuleRef | null, rule: DepartmentRule | null) => void }) {
  const [v, setV] = useState<RuleDraft>(() => toRuleDraft(draft, at));
  const [errors, setErrors] = useState<Record<string, string>>({});
  const set = (k: keyof RuleDraft) => (e: { target: { value: string } }) => setV((d) => ({ ...d, [k]: e.target.value }));
  const n = (x: string) => (x.trim() === '' ? Number.NaN : Number(x));
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const meta = { counts: v.counts, source: v.source, verified: v.verified, ...(v.note.trim() ? { note: v.note.trim() } : {}) };
    const candidate =
      v.method === 'first_plus_further'
        ? { method: v.method, first_unit_L_min: n(v.first), further_unit_L_min: n(v.further), diversity: n(v.diversity), ...meta }
        : v.method === 'use_factor'
          ? { method: v.method, unit_L_min: n(v.unit), use_factor: n(v.factor), ...meta }
          : v.method === 'as2896_factor'
            ? { method: v.method, unit_L_min: n(v.unit), ...meta }
            : { method: v.method, unit_L_min: n(v.unit), use_probability: n(v.p), confidence: n(v.confidence), ...meta };
    const parsed = departmentRuleSchema.safeParse(candidate);
    if (!parsed.success) {
      setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), ruleIssueMessage(i)])));
      return;
    }
    onDone({ gas: v.gas, department: v.department }, parsed.data);
  };
  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4">
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Gas">
          {(c) => (
            <Select {...c} value={v.gas} onChange={set('gas')} disabled={at !== null}>
              {CAPACITY_GAS_CODES.map((g) => (
                <option key={g} value={g}>
                  {gasLabel(g)}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field label="Department">
          {(c) => (
            <Select {...c} value={v.department} onChange={set('department')} disabled={at !== null}>
              {DEPARTMENTS.map((d) => (
                <option key={d} value={d}>
                  {departmentLabel(d)}
                </option>
              ))}
            </Select>
          )}
        </Field>
      </div>
      <Field label="Method">
        {(c) => (
          <Select {...c} value={v.method} onChange={set('method')}>
            {(Object.keys(METHOD_LABELS) as Method[]).map((m) => (
              <option key={m} value={m}>
                {METHOD_LABELS[m]}
              </option>
            ))}
          </Select>
        )}
      </Field>
      <div className="grid gap-4 sm:grid-cols-3">
        {v.method === 'first_plus_further' ? (
          <>
            <Field label="First unit, L/min" error={errors.first_unit_L_min}>
              {(c) => <Input {...c} value={v.first} onChange={set('first')} inputMode="decimal" />}
            </Field>
            <Field label="Each further unit, L/min" error={errors.further_unit_L_min}>
              {(c) => <Input {...c} value={v.further} onChange={set('further')} inputMode="decimal" />}
            </Field>
            <Field label="Diversity (0–1)" error={errors.diversity}>
              {(c) => <Input {...c} value={v.diversity} onChange={set('diversity')} inputMode="decimal" />}
            </Field>
          </>
        ) : (
          <Field label="Flow of one unit, L/min" error={errors.unit_L_min}>
            {(c) => <Input {...c} value={v.unit} onChange={set('unit')} inputMode="decimal" />}
          </Field>
        )}
        {v.method === 'use_factor' && (
          <Field label="Use factor (0–1)" error={errors.use_factor}>
            {(c) => <Input {...c} value={v.factor} onChange={set('factor')} inputMode="decimal" />}
          </Field>
        )}
        {v.method === 'binomial' && (
          <>
            <Field label="Use probability (0–1)" error={errors.use_probability}>
              {(c) => <Input {...c} value={v.p} onChange={set('p')} inputMode="decimal" />}
            </Field>
            <Field label="Confidence (0–1)" error={errors.confidence}>
              {(c) => <Input {...c} value={v.confidence} onChange={set('confidence')} inputMode="decimal" />}
            </Field>
          </>
        )}
      </div>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Counts" error={errors.counts}>
          {(c) => (
            <Select {...c} value={v.counts} onChange={set('counts')}>
              {COUNT_BASES.map((b) => (
                <option key={b} value={b}>
                  {COUNT_LABELS[b]}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field label="Source" error={errors.source} hint="Add a source to the set first if it is not listed.">
          {(c) => (
            <Select {...c} value={v.source} onChange={set('source')}>
              {draft.sources.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.citation.length > 70 ? `${s.citation.slice(0, 70)}…` : s.citation}
                </option>
              ))}
            </Select>
          )}
        </Field>
      </div>
      <Checkbox
        label="I have seen this figure in the cited source (verified)"
        checked={v.verified}
        onChange={(e) => setV((d) => ({ ...d, verified: e.target.checked }))}
      />
      <Field label="Note">{(c) => <Input {...c} value={v.note} onChange={set('note')} />}</Field>
      <p className="text-xs text-fg-muted">The rule changes the draft; save the rule set to apply it.</p>
      <FormActions onCancel={() => onDone(null, null)} submitLabel="Use this rule" />
    </form>
  );
}

function SourceForm({ existing, onDone }: { existing: string[]; onDone: (source: { id: string; citation: string; verified: boolean } | null) => void }) {
  const [id, setId] = useState('');
  const [citation, setCitation] = useState('');
  const [verified, setVerified] = useState(false);
  const [error, setError] = useState<Record<string, string>>({});
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = ruleSourceSchema.safeParse({ id: id.trim(), citation: citation.trim(), verified });
    const errs: Record<string, string> = parsed.success ? {} : Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), 'required']));
    if (existing.includes(id.trim())) errs.id = 'this id is taken';
    setError(errs);
    if (parsed.success && Object.keys(errs).length === 0) onDone(parsed.data);
  };
  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4">
      <Field label="Short id" hint="e.g. local-design-2026" error={error.id}>
        {(c) => <Input {...c} value={id} onChange={(e) => setId(e.target.value)} />}
      </Field>
      <Field label="Citation" hint="Standard, edition, clause or table." error={error.citation}>
        {(c) => <Input {...c} value={citation} onChange={(e) => setCitation(e.target.value)} />}
      </Field>
      <Checkbox label="Seen in the published text (verified)" checked={verified} onChange={(e) => setVerified(e.target.checked)} />
      <FormActions onCancel={() => onDone(null)} submitLabel="Add source" />
    </form>
  );
}
