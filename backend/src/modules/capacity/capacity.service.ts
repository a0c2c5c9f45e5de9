import { lookup } from '@common/api/lookup';
import { createHash } from 'node:crypto';
import { In, type EntityManager } from 'typeorm';
import { copyRuleSet } from '@common/capacity/diversity-rules';
import { DEFAULT_RULE_SETS, diversityRuleSetSchema, type CapacityGasCode, type Department, type DiversityRuleSet } from '@common/capacity/diversity-rules';
import { compressedContents } from '@common/gas/contents';
import { isGasCode, isLiquefiedGas } from '@common/gas/gases';
import { freeGasLitresPerKg, type ReferenceCode } from '@common/gas/reference-conditions';
import { cylinderTypeName } from '@common/catalogue/cylinder-type';
import { meanDailyDemandL } from '@common/forecast/demand-model';
import type {
  CapacityQuery,
  CapacityReport,
  CapacityResponse,
  PipeRunInput,
  RuleSetCreateInput,
  RuleSetRow,
  RuleSetUpdateInput,
  SignoffInput,
  SignoffRow,
  ZoneInput,
  ZoneRow,
} from '@common/schemas/capacity.schema';
import { InvalidInputError } from '@common/api/errors';
import { db } from '../../db/db';
import { CapacitySignoff, PipeRun, PipelineZone, RuleSet } from '../../db/entities/capacity.entity';
import { CylinderType } from '../../db/entities/catalogue.entity';
import { SupplySource } from '../../db/entities/supply.entity';
import type { Site } from '../../db/entities/site.entity';
import type { Actor } from '../../http/context';
import { AppError, badRequest, conflict, notFound } from '../../errors/app-error';
import { recordAudit, whoOf } from '../audit/audit.service';
import { getSiteFor } from '../sites/sites.service';
import { loadSiteModels, type SiteModel } from '../forecast/site-model';
import { measuredLPerDay, modelledLines } from '../forecast/forecast.service';
import { assessSiteCapacity, type SourceData, type ZoneData } from './site-capacity';

// ---------- presenters ----------

export function presentPipeRun(r: PipeRun) {
  return {
    id: r.id,
    zoneId: r.zoneId,
    name: r.name,
    lengthM: r.lengthM,
    tube: r.tube,
    fittingsAllowancePercent: r.fittingsAllowancePercent,
    linePressureKPa: r.linePressureKPa,
    allowedDropKPa: r.allowedDropKPa,
    gasTemperatureC: r.gasTemperatureC,
    sortOrder: r.sortOrder,
  };
}

export function presentZone(z: PipelineZone, runs: PipeRun[]): ZoneRow {
  return {
    id: z.id,
    siteId: z.siteId,
    name: z.name,
    gasCode: z.gasCode as ZoneRow['gasCode'],
    department: z.department as ZoneRow['department'],
    terminalUnits: z.terminalUnits,
    sourceId: z.sourceId,
    ruleSetId: z.ruleSetId,
    builtinRuleSet: z.builtinRuleSet,
    diversityMethod: z.diversityMethod as ZoneRow['diversityMethod'],
    unitFlowLMin: z.unitFlowLMin,
    useProbability: z.useProbability,
    confidence: z.confidence,
    notes: z.notes,
    pipeRuns: runs
      .filter((r) => r.zoneId === z.id)
      .sort((a, b) => a.sortOrder - b.sortOrder || a.id - b.id)
      .map(presentPipeRun),
    updatedAt: z.updatedAt.toISOString(),
  };
}

export function presentRuleSet(r: RuleSet, usedByZones = 0): RuleSetRow {
  return {
    id: r.id,
    key: `org:${r.id}`,
    name: r.name,
    builtin: false,
    basedOn: r.basedOn,
    rules: JSON.parse(r.json) as DiversityRuleSet,
    usedByZones,
    updatedAt: r.updatedAt.toISOString(),
  };
}

function presentBuiltin(key: string): RuleSetRow {
  const set = DEFAULT_RULE_SETS[key];
  return { id: null, key, name: set.name, builtin: true, basedOn: null, rules: set, usedByZones: null, updatedAt: null };
}

function presentSignoff(s: CapacitySignoff, withReport: boolean): SignoffRow & { report?: unknown } {
  return {
    id: s.id,
    siteId: s.siteId,
    engineerName: s.engineerName,
    userId: s.userId,
    signedAt: s.signedAt.toISOString(),
    inputsHash: s.inputsHash,
    note: s.note,
    ...(withReport ? { report: JSON.parse(s.summaryJson) as unknown } : {}),
  };
}

// ---------- scoped look-ups (404 for anything outside the actor's sites) ----------

/** A zone on one of the actor's sites, or 404. */
export async function zoneFor(actor: Actor, id: number, m: EntityManager = db().manager): Promise<PipelineZone> {
  const z = await m
    .getRepository(PipelineZone)
    .createQueryBuilder('z')
    .innerJoin('site', 's', 's.id = z.site_id')
    .where('z.id = :id AND s.organisation_id = :org', { id, org: actor.user.organisationId })
    .getOne();
  if (!z || !actor.user.siteIds.includes(z.siteId)) throw notFound('Pipeline zone');
  return z;
}

export async function pipeRunFor(actor: Actor, id: number, m: EntityManager = db().manager): Promise<{ run: PipeRun; zone: PipelineZone }> {
  const run = await m.getRepository(PipeRun).findOneBy({ id });
  if (!run) throw notFound('Pipe run');
  const zone = await zoneFor(actor, run.zoneId, m).catch(() => {
    throw notFound('Pipe run');
  });
  return { run, zone };
}

async function ruleSetFor(actor: Actor, id: number, m: EntityManager = db().manager): Promise<RuleSet> {
  const r = await m.getRepository(RuleSet).findOneBy({ id, organisationId: actor.user.organisationId });
  if (!r) throw notFound('Rule set');
  return r;
}

async function signoffFor(actor: Actor, id: number): Promise<CapacitySignoff> {
  const s = await db().getRepository(CapacitySignoff).findOneBy({ id });
  if (!s || !actor.user.siteIds.includes(s.siteId)) throw notFound('Sign-off');
  await getSiteFor(actor, s.siteId).catch(() => {
    throw notFound('Sign-off');
  });
  return s;
}

// ---------- zones ----------

/** The zone's source must be a primary source of the same site and gas; its rule set the organisation's. */
async function checkZoneRefs(m: EntityManager, actor: Actor, siteId: number, input: ZoneInput, zoneId?: number) {
  if (input.sourceId !== null) {
    const s = await m.getRepository(SupplySource).findOneBy({ id: input.sourceId, siteId });
    if (!s) throw badRequest('Unknown supply source', [{ path: 'sourceId', message: 'choose a supply source of this site' }]);
    if (s.gasCode !== input.gasCode)
      throw badRequest('The source holds another gas', [{ path: 'sourceId', message: `this source supplies ${s.gasCode}, the zone ${input.gasCode}` }]);
    if (s.type === 'emergency_reserve')
      throw badRequest('A reserve backs up a source; it is not the source of a zone', [
        { path: 'sourceId', message: 'choose the primary source (manifold or bulk tank); the reserve is found from it' },
      ]);
  }
  if (input.ruleSetId !== null && !(await m.getRepository(RuleSet).findOneBy({ id: input.ruleSetId, organisationId: actor.user.organisationId }))) {
    throw badRequest('Unknown rule set', [{ path: 'ruleSetId', message: "choose one of your organisation's rule sets" }]);
  }
  if (input.gasCode === 'VAC' && zoneId !== undefined && (await m.getRepository(PipeRun).countBy({ zoneId })) > 0) {
    throw badRequest('A vacuum zone has no pressure pipe runs', [{ path: 'gasCode', message: 'remove the pipe runs of this zone first' }]);
  }
}

function zoneRow(input: ZoneInput) {
  const binomial = input.diversityMethod === 'binomial';
  return {
    name: input.name,
    gasCode: input.gasCode,
    department: input.department,
    terminalUnits: input.terminalUnits,
    sourceId: input.sourceId,
    ruleSetId: input.ruleSetId,
    builtinRuleSet: input.builtinRuleSet,
    diversityMethod: input.diversityMethod,
    unitFlowLMin: binomial ? input.unitFlowLMin : null,
    useProbability: binomial ? input.useProbability : null,
    confidence: binomial ? input.confidence : null,
    notes: input.notes,
  };
}

async function zoneWithRuns(m: EntityManager, id: number) {
  const zone = await m.getRepository(PipelineZone).findOneByOrFail({ id });
  const runs = await m.getRepository(PipeRun).find({ where: { zoneId: id } });
  return presentZone(zone, runs);
}

export async function listZones(actor: Actor, siteId: number) {
  await getSiteFor(actor, siteId);
  const zones = await db()
    .getRepository(PipelineZone)
    .find({ where: { siteId }, order: { gasCode: 'ASC', name: 'ASC' } });
  const runs = zones.length
    ? await db()
        .getRepository(PipeRun)
        .find({ where: { zoneId: In(zones.map((z) => z.id)) } })
    : [];
  return zones.map((z) => presentZone(z, runs));
}

export async function getZone(actor: Actor, id: number) {
  const zone = await zoneFor(actor, id);
  return zoneWithRuns(db().manager, zone.id);
}

export async function createZone(actor: Actor, siteId: number, input: ZoneInput) {
  await getSiteFor(actor, siteId);
  return db().transaction(async (m) => {
    await checkZoneRefs(m, actor, siteId, input);
    const repo = m.getRepository(PipelineZone);
    if (await repo.findOneBy({ siteId, name: input.name })) throw conflict(`A zone called "${input.name}" exists on this site`, 'duplicate');
    const saved = await repo.save(repo.create({ ...zoneRow(input), siteId }));
    const row = await zoneWithRuns(m, saved.id);
    await recordAudit(m, whoOf(actor), { action: 'create', entity: 'pipeline_zone', entityId: String(saved.id), after: row });
    return row;
  });
}

export async function updateZone(actor: Actor, id: number, input: ZoneInput) {
  return db().transaction(async (m) => {
    const zone = await zoneFor(actor, id, m);
    const before = await zoneWithRuns(m, id);
    await checkZoneRefs(m, actor, zone.siteId, input, id);
    const clash = await m.getRepository(PipelineZone).findOneBy({ siteId: zone.siteId, name: input.name });
    if (clash && clash.id !== id) throw conflict(`A zone called "${input.name}" exists on this site`, 'duplicate');
    await m.getRepository(PipelineZone).update({ id }, zoneRow(input));
    const after = await zoneWithRuns(m, id);
    await recordAudit(m, whoOf(actor), { action: 'update', entity: 'pipeline_zone', entityId: String(id), before, after });
    return after;
  });
}

export async function deleteZone(actor: Actor, id: number) {
  return db().transaction(async (m) => {
    await zoneFor(actor, id, m);
    const before = await zoneWithRuns(m, id);
    await m.getRepository(PipelineZone).delete({ id });
    await recordAudit(m, whoOf(actor), { action: 'delete', entity: 'pipeline_zone', entityId: String(id), before });
    return { deleted: true, id };
  });
}

// ---------- pipe runs ----------

function pipeRunRow(input: PipeRunInput) {
  return { ...input };
}

export async function getPipeRun(actor: Actor, id: number) {
  return presentPipeRun((await pipeRunFor(actor, id)).run);
}

export async function createPipeRun(actor: Actor, zoneId: number, input: PipeRunInput) {
  return db().transaction(async (m) => {
    const zone = await zoneFor(actor, zoneId, m);
    if (zone.gasCode === 'VAC')
      throw badRequest('Vacuum pipework runs below atmospheric pressure; the pressure-drop check does not apply', [
        { path: 'zone', message: 'pipe runs belong to positive-pressure gas zones' },
      ]);
    const repo = m.getRepository(PipeRun);
    if (await repo.findOneBy({ zoneId, name: input.name })) throw conflict(`A pipe run called "${input.name}" exists in this zone`, 'duplicate');
    const saved = await repo.save(repo.create({ ...pipeRunRow(input), zoneId }));
    const row = presentPipeRun(saved);
    await recordAudit(m, whoOf(actor), { action: 'create', entity: 'pipe_run', entityId: String(saved.id), after: row });
    return row;
  });
}

export async function updatePipeRun(actor: Actor, id: number, input: PipeRunInput) {
  return db().transaction(async (m) => {
    const { run } = await pipeRunFor(actor, id, m);
    const clash = await m.getRepository(PipeRun).findOneBy({ zoneId: run.zoneId, name: input.name });
    if (clash && clash.id !== id) throw conflict(`A pipe run called "${input.name}" exists in this zone`, 'duplicate');
    await m.getRepository(PipeRun).update({ id }, pipeRunRow(input));
    const after = presentPipeRun(await m.getRepository(PipeRun).findOneByOrFail({ id }));
    await recordAudit(m, whoOf(actor), { action: 'update', entity: 'pipe_run', entityId: String(id), before: presentPipeRun(run), after });
    return after;
  });
}

export async function deletePipeRun(actor: Actor, id: number) {
  return db().transaction(async (m) => {
    const { run } = await pipeRunFor(actor, id, m);
    await m.getRepository(PipeRun).delete({ id });
    await recordAudit(m, whoOf(actor), { action: 'delete', entity: 'pipe_run', entityId: String(id), before: presentPipeRun(run) });
    return { deleted: true, id };
  });
}

// ---------- rule sets ----------

async function usage(m: EntityManager, ids: number[]): Promise<Map<number, number>> {
  if (ids.length === 0) return new Map();
  const rows: { id: number; n: string }[] = await m.query(
    `SELECT rule_set_id AS id, COUNT(*) AS n FROM pipeline_zone WHERE rule_set_id IN (${ids.map(() => '?').join(',')}) GROUP BY rule_set_id`,
    ids,
  );
  return new Map(rows.map((r) => [Number(r.id), Number(r.n)]));
}

/** The shipped rule sets (read-only, to copy) and the organisation's own. */
export async function listRuleSets(actor: Actor) {
  const own = await db()
    .getRepository(RuleSet)
    .find({ where: { organisationId: actor.user.organisationId }, order: { name: 'ASC' } });
  const used = await usage(
    db().manager,
    own.map((r) => r.id),
  );
  return [...Object.keys(DEFAULT_RULE_SETS).map(presentBuiltin), ...own.map((r) => presentRuleSet(r, used.get(r.id) ?? 0))];
}

export async function getRuleSet(actor: Actor, id: number) {
  const r = await ruleSetFor(actor, id);
  return presentRuleSet(r, (await usage(db().manager, [id])).get(id) ?? 0);
}

/** The stored form: the engine's shape with our own id, re-validated (refinements included). */
function storedRules(rules: DiversityRuleSet, id: number, name: string): string {
  const parsed = diversityRuleSetSchema.safeParse({ ...rules, id: `org-${id}`, name });
  if (!parsed.success) {
    throw badRequest(
      'The rule set is not valid',
      parsed.error.issues.map((i) => ({ path: ['rules', ...i.path.map(String)].join('.'), message: i.message })),
    );
  }
  return JSON.stringify(parsed.data);
}

export async function createRuleSet(actor: Actor, input: RuleSetCreateInput) {
  return db().transaction(async (m) => {
    const repo = m.getRepository(RuleSet);
    if (await repo.findOneBy({ organisationId: actor.user.organisationId, name: input.name }))
      throw conflict(`A rule set called "${input.name}" exists already`, 'duplicate');
    let rules: DiversityRuleSet;
    let basedOn: string | null = null;
    if (typeof input.basedOn === 'number') {
      const base = await m.getRepository(RuleSet).findOneBy({ id: input.basedOn, organisationId: actor.user.organisationId });
      if (!base) throw badRequest('Unknown rule set to copy', [{ path: 'basedOn', message: "choose a shipped set or one of your organisation's" }]);
      rules = input.rules ?? (JSON.parse(base.json) as DiversityRuleSet);
      basedOn = `org:${base.id}`;
    } else if (typeof input.basedOn === 'string') {
      rules = input.rules ?? copyRuleSet(input.basedOn, 'copy');
      basedOn = input.basedOn;
    } else {
      rules = input.rules!;
    }
    const saved = await repo.save(repo.create({ organisationId: actor.user.organisationId, name: input.name, basedOn, json: '{}' }));
    await repo.update({ id: saved.id }, { json: storedRules(rules, saved.id, input.name) });
    const row = presentRuleSet(await repo.findOneByOrFail({ id: saved.id }), 0);
    await recordAudit(m, whoOf(actor), { action: 'create', entity: 'rule_set', entityId: String(saved.id), after: row });
    return row;
  });
}

export async function updateRuleSet(actor: Actor, id: number, input: RuleSetUpdateInput) {
  return db().transaction(async (m) => {
    const before = await ruleSetFor(actor, id, m);
    const repo = m.getRepository(RuleSet);
    const clash = await repo.findOneBy({ organisationId: actor.user.organisationId, name: input.name });
    if (clash && clash.id !== id) throw conflict(`A rule set called "${input.name}" exists already`, 'duplicate');
    await repo.update({ id }, { name: input.name, json: storedRules(input.rules, id, input.name) });
    const n = (await usage(m, [id])).get(id) ?? 0;
    const after = presentRuleSet(await repo.findOneByOrFail({ id }), n);
    await recordAudit(m, whoOf(actor), { action: 'update', entity: 'rule_set', entityId: String(id), before: presentRuleSet(before, n), after });
    return after;
  });
}

export async function deleteRuleSet(actor: Actor, id: number) {
  return db().transaction(async (m) => {
    const before = await ruleSetFor(actor, id, m);
    const n = (await usage(m, [id])).get(id) ?? 0;
    if (n > 0) throw conflict(`${n} zone${n > 1 ? 's use' : ' uses'} this rule set: choose another set for ${n > 1 ? 'them' : 'it'} first`, 'in_use');
    await m.getRepository(RuleSet).delete({ id });
    await recordAudit(m, whoOf(actor), { action: 'delete', entity: 'rule_set', entityId: String(id), before: presentRuleSet(before, 0) });
    return { deleted: true, id };
  });
}

// ---------- the capacity check ----------

/** Nominal free gas of one full cylinder at the site's reference conditions (gas engine), or null. */
export function cylinderFreeGasL(c: CylinderType, reference: ReferenceCode, atmosphericBar: number): number | null {
  if (!isGasCode(c.gasCode)) return null;
  try {
    if (isLiquefiedGas(c.gasCode))
      return c.maxFillingRatioKgPerL ? c.maxFillingRatioKgPerL * c.waterCapacityL * freeGasLitresPerKg(c.gasCode, reference) : null;
    return compressedContents({ gas: c.gasCode, waterCapacityL: c.waterCapacityL, gaugeBar: c.fillPressureBar, temperatureC: 15, atmosphericBar, reference })
      .freeGasL;
  } catch (e) {
    if (e instanceof InvalidInputError) return null;
    throw e;
  }
}

/** Mean forecast flow on a source, L/min, by the source's forecast basis (model, measured or scaled). */
function forecastFlowOf(model: SiteModel | undefined, s: SupplySource, reference: ReferenceCode): number | null {
  if (!model) return null;
  try {
    const lines = modelledLines(model, s);
    const modelled = lines.length ? meanDailyDemandL(lines) : null;
    const measured = measuredLPerDay(model, s, reference);
    let perDay = modelled;
    if (s.forecastBasis === 'measured' && measured !== null) perDay = measured;
    else if (s.forecastBasis === 'scaled' && modelled !== null) perDay = modelled * s.modelCorrectionFactor;
    return perDay === null ? null : perDay / 1440;
  } catch (e) {
    if (e instanceof InvalidInputError) return null;
    throw e;
  }
}

interface Loaded {
  site: Site;
  zones: PipelineZone[];
  runs: PipeRun[];
  sources: SupplySource[];
  input: Parameters<typeof assessSiteCapacity>[0];
}

async function loadCapacityInput(actor: Actor, site: Site, options: CapacityQuery): Promise<Loaded> {
  const ds = db();
  const zones = await ds.getRepository(PipelineZone).find({ where: { siteId: site.id }, order: { gasCode: 'ASC', name: 'ASC' } });
  const runs = zones.length
    ? await ds.getRepository(PipeRun).find({ where: { zoneId: In(zones.map((z) => z.id)) }, order: { sortOrder: 'ASC', id: 'ASC' } })
    : [];
  const sources = await ds.getRepository(SupplySource).find({ where: { siteId: site.id, active: true }, order: { name: 'ASC' } });
  const ruleSetIds = [...new Set(zones.map((z) => z.ruleSetId).filter((x): x is number => x !== null))];
  const ownSets = ruleSetIds.length ? await ds.getRepository(RuleSet).find({ where: { id: In(ruleSetIds), organisationId: actor.user.organisationId } }) : [];
  const cylIds = [...new Set(sources.map((s) => s.cylinderTypeId).filter((x): x is number => x !== null))];
  const cyls = cylIds.length ? await ds.getRepository(CylinderType).find({ where: { id: In(cylIds) } }) : [];
  const [model] = sources.length ? await loadSiteModels([site.id], actor.user.organisationId) : [];
  const reference = site.referenceCode as ReferenceCode;

  const zoneData: ZoneData[] = zones.map((z) => {
    const own = z.ruleSetId !== null ? ownSets.find((r) => r.id === z.ruleSetId) : undefined;
    const builtin = lookup(DEFAULT_RULE_SETS, z.builtinRuleSet) ?? DEFAULT_RULE_SETS.default;
    const ruleSet = own ? (JSON.parse(own.json) as DiversityRuleSet) : builtin;
    return {
      id: z.id,
      name: z.name,
      gasCode: z.gasCode as CapacityGasCode,
      department: z.department as Department,
      terminalUnits: z.terminalUnits,
      sourceId: z.sourceId,
      ruleSet,
      ruleSetLabel: own ? { key: `org:${own.id}`, name: own.name, builtin: false } : { key: builtin.id, name: builtin.name, builtin: true },
      diversityMethod: z.diversityMethod === 'binomial' ? 'binomial' : 'rule_set',
      unitFlowLMin: z.unitFlowLMin,
      useProbability: z.useProbability,
      confidence: z.confidence,
      pipeRuns: runs
        .filter((r) => r.zoneId === z.id)
        .map((r) => ({
          id: r.id,
          name: r.name,
          lengthM: r.lengthM,
          tube: r.tube,
          fittingsAllowancePercent: r.fittingsAllowancePercent,
          linePressureKPa: r.linePressureKPa,
          allowedDropKPa: r.allowedDropKPa,
          gasTemperatureC: r.gasTemperatureC,
        })),
    };
  });
  const sourceData: SourceData[] = sources.map((s) => {
    const cyl = s.cylinderTypeId ? cyls.find((c) => c.id === s.cylinderTypeId) : undefined;
    const free = cyl ? cylinderFreeGasL(cyl, reference, site.atmosphericBar) : null;
    return {
      id: s.id,
      name: s.name,
      type: s.type,
      gasCode: s.gasCode,
      regulatorLMin: s.regulatorLMin,
      vaporiserM3H: s.vaporiserM3H,
      vaporiserDerating: s.vaporiserDerating,
      cylindersPerBank: s.cylindersPerBank,
      cylinder: cyl && free !== null ? { name: cylinderTypeName(cyl.waterCapacityL, cyl.fillPressureBar), freeGasL: free } : null,
      backsUp: s.backsUpJson ? (JSON.parse(s.backsUpJson) as number[]) : [],
      forecastFlowLMin: forecastFlowOf(model, s, reference),
      forecastBasis: s.forecastBasis,
    };
  });
  return {
    site,
    zones,
    runs,
    sources,
    input: {
      site: { referenceCode: reference, atmosphericBar: site.atmosphericBar },
      zones: zoneData,
      sources: sourceData,
      options: {
        flowPerPatientLMin: options.flowPerPatientLMin,
        peakHoursPerDay: options.peakHoursPerDay,
        ...(options.vaporiserDerating !== undefined ? { vaporiserDerating: options.vaporiserDerating } : {}),
      },
    },
  };
}

/**
 * SHA-256 of the design inputs of the report (site, what-if inputs, zones with their rules and pipe
 * runs, sources), so a sign-off can tell whether it still applies. The forecast demand is left out on
 * purpose: it moves with every reading, while the sign-off attests to the design; the report as signed
 * keeps the demand figures of that day.
 */
function hashInputs(input: Loaded['input']): string {
  const canonical = JSON.stringify({
    site: input.site,
    options: input.options,
    zones: input.zones,
    sources: input.sources.map(({ forecastFlowLMin: _f, forecastBasis: _b, ...design }) => design),
  });
  return createHash('sha256').update(canonical).digest('hex');
}

async function buildReport(actor: Actor, site: Site, options: CapacityQuery): Promise<CapacityReport> {
  const loaded = await loadCapacityInput(actor, site, options);
  const result = assessSiteCapacity(loaded.input);
  return {
    site: { id: site.id, name: site.name },
    generatedAt: new Date().toISOString(),
    inputsHash: hashInputs(loaded.input),
    sources: loaded.sources.map((s) => ({ id: s.id, name: s.name, type: s.type, gasCode: s.gasCode })),
    zoneCount: loaded.zones.length,
    ...result,
  };
}

/** The capacity check of a site, with the latest sign-off and whether it still matches the inputs. */
export async function getCapacity(actor: Actor, siteId: number, options: CapacityQuery): Promise<CapacityResponse> {
  const site = await getSiteFor(actor, siteId);
  const report = await buildReport(actor, site, options);
  const latest = await db()
    .getRepository(CapacitySignoff)
    .findOne({ where: { siteId }, order: { signedAt: 'DESC', id: 'DESC' } });
  return {
    ...report,
    latestSignoff: latest ? { ...presentSignoff(latest, false), current: latest.inputsHash === report.inputsHash } : null,
  };
}

/**
 * Records the engineer's sign-off of the report as it stands: recomputed on the server with the same
 * what-if inputs, refused (409) when the inputs changed since the engineer loaded it.
 */
export async function signOff(actor: Actor, siteId: number, input: SignoffInput) {
  const site = await getSiteFor(actor, siteId);
  const report = await buildReport(actor, site, {
    flowPerPatientLMin: input.flowPerPatientLMin,
    vaporiserDerating: input.vaporiserDerating,
    peakHoursPerDay: input.peakHoursPerDay,
  });
  if (report.inputsHash !== input.inputsHash) {
    throw new AppError(409, 'inputs_changed', 'The zones, sources or rules changed since you loaded the check: review the new figures and sign again.');
  }
  if (report.zoneCount === 0)
    throw badRequest('There is nothing to sign off: add the pipeline zones first', [{ path: 'inputsHash', message: 'no zones on this site' }]);
  return db().transaction(async (m) => {
    const repo = m.getRepository(CapacitySignoff);
    const saved = await repo.save(
      repo.create({
        siteId,
        engineerName: input.engineerName,
        userId: actor.user.id,
        signedAt: new Date(),
        inputsHash: report.inputsHash,
        note: input.note,
        summaryJson: JSON.stringify(report),
      }),
    );
    const row = presentSignoff(saved, false);
    await recordAudit(m, whoOf(actor), {
      action: 'sign_off',
      entity: 'capacity_signoff',
      entityId: String(saved.id),
      after: { ...row, totals: report.gases.map((g) => ({ gas: g.gasCode, designFlowLMin: g.designFlowLMin, limiting: g.limiting?.name ?? null })) },
    });
    return row;
  });
}

export async function listSignoffs(actor: Actor, siteId: number) {
  await getSiteFor(actor, siteId);
  const rows = await db()
    .getRepository(CapacitySignoff)
    .find({ where: { siteId }, order: { signedAt: 'DESC', id: 'DESC' }, take: 100 });
  return rows.map((r) => presentSignoff(r, false));
}

export async function getSignoff(actor: Actor, id: number) {
  return presentSignoff(await signoffFor(actor, id), true);
}
