import type { EntityManager } from 'typeorm';
import { copyRuleSet } from '@common/capacity/diversity-rules';
import { PipeRun, PipelineZone, RuleSet } from '../entities/capacity.entity';
import { SupplySource } from '../entities/supply.entity';
import type { FoundationIds } from './demo-foundation';

interface DemoRun {
  name: string;
  tube: string;
  lengthM: number;
}

interface DemoZone {
  name: string;
  gasCode: string;
  department: string;
  terminalUnits: number;
  /** the supply source by its demo name; null for vacuum */
  source: string | null;
  binomial?: { unitFlowLMin: number; useProbability: number; confidence: number };
  ownRules?: boolean;
  notes?: string;
  runs?: DemoRun[];
}

const VIE = 'Main VIE — liquid oxygen';

/** Pipeline zones of the demo hospital: invented, sized like a district general hospital. */
const HOSPITAL_ZONES: DemoZone[] = [
  {
    name: 'Heron Ward oxygen',
    gasCode: 'O2',
    department: 'ward',
    terminalUnits: 30,
    source: VIE,
    runs: [{ name: 'Riser B to Heron zone valve', tube: '28x0.9', lengthM: 60 }],
  },
  {
    name: 'Kestrel Ward oxygen',
    gasCode: 'O2',
    department: 'ward',
    terminalUnits: 28,
    source: VIE,
    notes: 'Respiratory ward: high-flow patients go here first.',
    runs: [{ name: 'Kestrel branch (15 mm, original 1970s run)', tube: '15x0.7', lengthM: 150 }],
  },
  {
    name: 'Linnet Ward oxygen',
    gasCode: 'O2',
    department: 'ward',
    terminalUnits: 28,
    source: VIE,
    runs: [{ name: 'Riser B to Linnet zone valve', tube: '22x0.9', lengthM: 140 }],
  },
  { name: 'Merlin Ward oxygen', gasCode: 'O2', department: 'ward', terminalUnits: 30, source: VIE },
  { name: 'Osprey Ward oxygen', gasCode: 'O2', department: 'ward', terminalUnits: 28, source: VIE },
  { name: 'Plover Ward oxygen', gasCode: 'O2', department: 'ward', terminalUnits: 24, source: VIE },
  { name: 'Wren Ward oxygen', gasCode: 'O2', department: 'ward', terminalUnits: 20, source: VIE },
  {
    name: 'Critical care oxygen',
    gasCode: 'O2',
    department: 'critical_care',
    terminalUnits: 12,
    source: VIE,
    runs: [{ name: 'Plant room to critical care', tube: '35x1.2', lengthM: 80 }],
  },
  {
    name: 'Emergency resuscitation oxygen',
    gasCode: 'O2',
    department: 'emergency_resuscitation',
    terminalUnits: 4,
    source: VIE,
    runs: [{ name: 'Riser A to resuscitation room', tube: '28x0.9', lengthM: 45 }],
  },
  {
    name: 'Theatres 1–6 oxygen',
    gasCode: 'O2',
    department: 'theatre',
    terminalUnits: 6,
    source: VIE,
    runs: [{ name: 'Theatre main', tube: '42x1.2', lengthM: 90 }],
  },
  {
    name: 'Recovery oxygen',
    gasCode: 'O2',
    department: 'recovery',
    terminalUnits: 12,
    source: VIE,
    runs: [{ name: 'Theatre main to recovery', tube: '22x0.9', lengthM: 40 }],
  },
  {
    name: 'Maternity delivery rooms oxygen',
    gasCode: 'O2',
    department: 'delivery_room',
    terminalUnits: 10,
    source: VIE,
    binomial: { unitFlowLMin: 10, useProbability: 0.3, confidence: 0.99 },
    notes: 'No documented oxygen rule for delivery rooms: binomial method, use probability from the unit’s own audit.',
  },
  { name: 'Maternity 50:50 delivery rooms', gasCode: 'N2O_O2_50', department: 'delivery_room', terminalUnits: 10, source: 'Maternity 50:50 store' },
  { name: 'Heron Ward vacuum', gasCode: 'VAC', department: 'ward', terminalUnits: 30, source: null },
  { name: 'Emergency resuscitation vacuum', gasCode: 'VAC', department: 'emergency_resuscitation', terminalUnits: 4, source: null },
];

const CLINIC_ZONES: DemoZone[] = [
  {
    name: 'Day ward oxygen',
    gasCode: 'O2',
    department: 'ward',
    terminalUnits: 16,
    source: 'Clinic oxygen manifold',
    runs: [{ name: 'Manifold room to day ward', tube: '22x0.9', lengthM: 35 }],
  },
  {
    name: 'Procedure rooms oxygen',
    gasCode: 'O2',
    department: 'treatment_room',
    terminalUnits: 4,
    source: 'Clinic oxygen manifold',
    binomial: { unitFlowLMin: 10, useProbability: 0.5, confidence: 0.99 },
    notes: 'Sedation rooms: binomial method.',
  },
];

/**
 * Demo pipeline zones, pipe runs and one organisation rule set (a copy of the shipped HTM 02-01 set,
 * not yet used by a zone) for the demo hospital and clinic. Call after the supply seed: zones find their sources by name.
 */
export async function seedCapacity(m: EntityManager, ids: FoundationIds): Promise<void> {
  const rules = await m
    .getRepository(RuleSet)
    .save(
      m.getRepository(RuleSet).create({ organisationId: ids.organisationId, name: 'Alderhythe rules (copy of HTM 02-01)', basedOn: 'default', json: '{}' }),
    );
  const json = { ...copyRuleSet('default', `org-${rules.id}`), name: rules.name };
  await m.getRepository(RuleSet).update({ id: rules.id }, { json: JSON.stringify(json) });

  for (const [siteId, zones] of [
    [ids.hospitalId, HOSPITAL_ZONES],
    [ids.clinicId, CLINIC_ZONES],
  ] as const) {
    const sources = await m.getRepository(SupplySource).find({ where: { siteId } });
    for (const z of zones) {
      const sourceId = z.source ? (sources.find((s) => s.name === z.source)?.id ?? null) : null;
      const zone = await m.getRepository(PipelineZone).save(
        m.getRepository(PipelineZone).create({
          siteId,
          name: z.name,
          gasCode: z.gasCode,
          department: z.department,
          terminalUnits: z.terminalUnits,
          sourceId,
          ruleSetId: z.ownRules ? rules.id : null,
          builtinRuleSet: 'default',
          diversityMethod: z.binomial ? 'binomial' : 'rule_set',
          unitFlowLMin: z.binomial?.unitFlowLMin ?? null,
          useProbability: z.binomial?.useProbability ?? null,
          confidence: z.binomial?.confidence ?? null,
          notes: z.notes ?? '',
        }),
      );
      for (const [i, r] of (z.runs ?? []).entries()) {
        await m.getRepository(PipeRun).insert({
          zoneId: zone.id,
          name: r.name,
          tube: r.tube,
          lengthM: r.lengthM,
          fittingsAllowancePercent: 20,
          linePressureKPa: 400,
          allowedDropKPa: null,
          gasTemperatureC: null,
          sortOrder: i,
        });
      }
    }
  }
}
