import { In, type EntityManager } from 'typeorm';
import { DateTime } from 'luxon';
import type {
  DeliveryInput,
  DeliveryView,
  Department,
  ForecastBasis,
  ReadingInput,
  ReadingKind,
  ReadingMethod,
  ReadingPage,
  ReadingView,
  ReorderMode,
  ScenarioInput,
  ScenarioView,
  SourceInput,
  SourceType,
  SourceView,
  TherapyDevice,
  TherapyLineInput,
  TherapyLineView,
  WardInput,
  WardView,
} from '@common/schemas/supply.schema';
import { compressedContents } from '@common/gas/contents';
import { mixtureCautions } from '@common/gas/mixture-cautions';
import {
  DEFAULT_TANK_OPERATING_GAUGE_BAR,
  levelPercentToKg,
  loxDensityAtTankPressureKgPerL,
  loxLitresToKg,
  contentsFromCalibrationTable,
} from '@common/gas/liquid-oxygen';
import { freeGasLitresPerKg, type ReferenceCode } from '@common/gas/reference-conditions';
import { isLiquefiedGas, type GasCode } from '@common/gas/gases';
import { InvalidInputError } from '@common/api/errors';
import { db } from '../../db/db';
import { CylinderType, Supplier } from '../../db/entities/catalogue.entity';
import { Site } from '../../db/entities/site.entity';
import { DeviceFlow, Scenario, ScheduledDelivery, SourceReading, SupplySource, TherapyLineRow, Ward, WardFeed } from '../../db/entities/supply.entity';
import type { Actor } from '../../http/context';
import { AppError, badRequest, conflict, notFound } from '../../errors/app-error';
import { recordAudit, whoOf } from '../audit/audit.service';
import { getSiteFor } from '../sites/sites.service';
import { bumpSiteVersion } from '../forecast/site-version';
import { assertMayWriteWard, maySeeWard, visibleWards } from './ward-access';

// ---------- presenters ----------

export function presentSource(s: SupplySource) {
  return {
    id: s.id,
    siteId: s.siteId,
    name: s.name,
    type: s.type as SourceType,
    gasCode: s.gasCode,
    supplierId: s.supplierId,
    capacityKg: s.capacityKg,
    evaporationPercentPerDay: s.evaporationPercentPerDay,
    vaporiserM3H: s.vaporiserM3H,
    vaporiserDerating: s.vaporiserDerating,
    minLevelAlarmPercent: s.minLevelAlarmPercent,
    reservePercent: s.reservePercent,
    calibration: s.calibrationJson ? (JSON.parse(s.calibrationJson) as { reading: number; kg: number }[]) : null,
    calibrationUnit: s.calibrationUnit,
    cylinderTypeId: s.cylinderTypeId,
    cylindersPerBank: s.cylindersPerBank,
    regulatorLMin: s.regulatorLMin,
    changeoverGaugeBar: s.changeoverGaugeBar,
    operatingPressureBar: s.operatingPressureBar ?? null,
    temperatureC: s.temperatureC,
    backsUp: s.backsUpJson ? (JSON.parse(s.backsUpJson) as number[]) : [],
    reorderMode: s.reorderMode as ReorderMode,
    reorderLevel: s.reorderLevel,
    orderUpTo: s.orderUpTo,
    leadTimeHours: s.leadTimeHours,
    forecastBasis: s.forecastBasis as ForecastBasis,
    modelCorrectionFactor: s.modelCorrectionFactor,
    notes: s.notes,
    active: s.active,
  } satisfies SourceView;
}

export function presentReading(r: SourceReading, names?: Map<number, string>) {
  return {
    id: r.id,
    takenAt: r.takenAt.toISOString(),
    kind: r.kind as ReadingKind,
    value: r.value,
    detail: r.detailJson ? (JSON.parse(r.detailJson) as ReadingView['detail']) : null,
    contents: r.contents,
    method: r.method as ReadingMethod,
    takenByUserId: r.takenByUserId,
    takenByName: r.takenByUserId ? (names?.get(r.takenByUserId) ?? null) : null,
    note: r.note,
  } satisfies ReadingView;
}

/** Names of the people who took readings (same organisation only), for the readings tables. */
export async function readerNames(organisationId: number, readings: SourceReading[]): Promise<Map<number, string>> {
  const ids = [...new Set(readings.map((r) => r.takenByUserId).filter((x): x is number => x !== null))];
  if (ids.length === 0) return new Map();
  const rows: { id: number; name: string }[] = await db().query(
    `SELECT id, name FROM app_user WHERE organisation_id = ? AND id IN (${ids.map(() => '?').join(',')})`,
    [organisationId, ...ids],
  );
  return new Map(rows.map((u) => [Number(u.id), u.name]));
}

export function presentWard(w: Ward) {
  return {
    id: w.id,
    siteId: w.siteId,
    name: w.name,
    department: w.department as Department,
    beds: w.beds,
    leakagePercent: w.leakagePercent,
    active: w.active,
  } satisfies WardView;
}

export function presentScenario(s: Scenario) {
  return {
    id: s.id,
    siteId: s.siteId,
    name: s.name,
    multiplier: s.multiplier,
    extraPatients: s.extraPatients,
    extraFlowLMin: s.extraFlowLMin,
    wardId: s.wardId,
    wardChange: s.wardChange as ScenarioView['wardChange'],
    fromLocal: s.fromLocal,
    untilLocal: s.untilLocal,
    note: s.note,
  } satisfies ScenarioView;
}

export function presentTherapy(t: TherapyLineRow) {
  return {
    id: t.id,
    gasCode: t.gasCode,
    device: t.device as TherapyDevice,
    patients: t.patients,
    flowLMin: t.flowLMin,
    hours: t.hoursJson ? (JSON.parse(t.hoursJson) as number[]) : null,
    weekdays: t.weekdaysJson ? (JSON.parse(t.weekdaysJson) as number[]) : null,
    label: t.label,
  } satisfies TherapyLineView;
}

// ---------- scoped look-ups (404 for anything outside the actor's sites) ----------

export async function sourceFor(actor: Actor, id: number, m: EntityManager = db().manager): Promise<SupplySource> {
  const s = await m.getRepository(SupplySource).findOneBy({ id });
  if (!s || !actor.user.siteIds.includes(s.siteId)) throw notFound('Supply source');
  return s;
}

/** A ward of the actor's sites; for a user who is only a ward lead, one of their granted wards (ward-access.ts). */
export async function wardFor(actor: Actor, id: number, m: EntityManager = db().manager): Promise<Ward> {
  const w = await m.getRepository(Ward).findOneBy({ id });
  if (!w || !actor.user.siteIds.includes(w.siteId) || !(await maySeeWard(actor, w.id, m))) throw notFound('Ward');
  return w;
}

export async function scenarioFor(actor: Actor, id: number, m: EntityManager = db().manager): Promise<Scenario> {
  const s = await m.getRepository(Scenario).findOneBy({ id });
  if (!s || !actor.user.siteIds.includes(s.siteId)) throw notFound('Scenario');
  return s;
}

export async function deliveryFor(actor: Actor, id: number, m: EntityManager = db().manager): Promise<{ delivery: ScheduledDelivery; source: SupplySource }> {
  const d = await m.getRepository(ScheduledDelivery).findOneBy({ id });
  if (!d) throw notFound('Delivery');
  const source = await sourceFor(actor, d.sourceId, m).catch(() => {
    throw notFound('Delivery');
  });
  return { delivery: d, source };
}

// ---------- sources ----------

async function checkSourceRefs(m: EntityManager, actor: Actor, siteId: number, input: SourceInput) {
  if (input.supplierId && !(await m.getRepository(Supplier).findOneBy({ id: input.supplierId, organisationId: actor.user.organisationId }))) {
    throw badRequest('Unknown supplier', [{ path: 'supplierId', message: 'choose a supplier of your organisation' }]);
  }
  if (input.cylinderTypeId) {
    const c = await m.getRepository(CylinderType).findOneBy({ id: input.cylinderTypeId, organisationId: actor.user.organisationId });
    if (!c) throw badRequest('Unknown cylinder type', [{ path: 'cylinderTypeId', message: 'choose a cylinder type of your catalogue' }]);
    if (c.gasCode !== input.gasCode)
      throw badRequest('The cylinder type holds another gas', [{ path: 'cylinderTypeId', message: `this type is for ${c.gasCode}` }]);
  }
  if (input.backsUp.length) {
    const n = await m.getRepository(SupplySource).count({ where: { id: In(input.backsUp), siteId } });
    if (n !== new Set(input.backsUp).size)
      throw badRequest('A backed-up source is not on this site', [{ path: 'backsUp', message: 'choose sources of the same site' }]);
  }
}

function sourceRow(input: SourceInput) {
  const { calibration, backsUp, ...rest } = input;
  return { ...rest, calibrationJson: calibration ? JSON.stringify(calibration) : null, backsUpJson: backsUp.length ? JSON.stringify(backsUp) : null };
}

export async function listSources(actor: Actor, siteId: number) {
  await getSiteFor(actor, siteId);
  const rows = await db()
    .getRepository(SupplySource)
    .find({ where: { siteId }, order: { name: 'ASC' } });
  return rows.map(presentSource);
}

export async function createSource(actor: Actor, siteId: number, input: SourceInput) {
  await getSiteFor(actor, siteId);
  return db().transaction(async (m) => {
    await checkSourceRefs(m, actor, siteId, input);
    if (await m.getRepository(SupplySource).findOneBy({ siteId, name: input.name }))
      throw conflict(`A source called "${input.name}" exists on this site`, 'duplicate');
    const saved = await m.getRepository(SupplySource).save(m.getRepository(SupplySource).create({ ...sourceRow(input), siteId }));
    await recordAudit(m, whoOf(actor), { action: 'create', entity: 'supply_source', entityId: String(saved.id), after: presentSource(saved) });
    await bumpSiteVersion(m, siteId);
    return presentSource(saved);
  });
}

export async function updateSource(actor: Actor, id: number, input: SourceInput) {
  return db().transaction(async (m) => {
    const before = await sourceFor(actor, id, m);
    if (before.type !== input.type) throw badRequest('The type of a source cannot change: create a new source', [{ path: 'type', message: 'cannot change' }]);
    await checkSourceRefs(m, actor, before.siteId, input);
    const clash = await m.getRepository(SupplySource).findOneBy({ siteId: before.siteId, name: input.name });
    if (clash && clash.id !== id) throw conflict(`A source called "${input.name}" exists on this site`, 'duplicate');
    await m.getRepository(SupplySource).update({ id }, sourceRow(input));
    const after = await m.getRepository(SupplySource).findOneByOrFail({ id });
    await recordAudit(m, whoOf(actor), {
      action: 'update',
      entity: 'supply_source',
      entityId: String(id),
      before: presentSource(before),
      after: presentSource(after),
    });
    await bumpSiteVersion(m, before.siteId);
    return presentSource(after);
  });
}

/** Accepts (or, with factor 1, reverses) a correction factor of the modelled demand; recorded in the audit log. */
export async function setCorrection(actor: Actor, id: number, factor: number, basis: 'model' | 'measured' | 'scaled') {
  return db().transaction(async (m) => {
    const before = await sourceFor(actor, id, m);
    await m.getRepository(SupplySource).update({ id }, { modelCorrectionFactor: factor, forecastBasis: basis });
    await recordAudit(m, whoOf(actor), {
      action: 'update',
      entity: 'supply_source',
      entityId: String(id),
      before: { modelCorrectionFactor: before.modelCorrectionFactor, forecastBasis: before.forecastBasis },
      after: { modelCorrectionFactor: factor, forecastBasis: basis },
    });
    await bumpSiteVersion(m, before.siteId);
    return presentSource(await m.getRepository(SupplySource).findOneByOrFail({ id }));
  });
}

// ---------- readings ----------

/** Contents a reading means, in the source's unit (kg for bulk; L of free gas at the site's reference otherwise). */
export function contentsOfReading(source: SupplySource, site: Site, cyl: CylinderType | null, r: ReadingInput): number {
  const reference = site.referenceCode as ReferenceCode;
  const kindsFor: Record<string, string[]> = {
    bulk_liquid: ['level_percent', 'kg', 'litres_liquid', 'calibration'],
    manifold: ['bank_gauges'],
    cylinder_store: ['store_count'],
    emergency_reserve: ['store_count', 'bank_gauges'],
  };
  if (!kindsFor[source.type].includes(r.kind))
    throw badRequest(`A ${source.type.replace('_', ' ')} is read as ${kindsFor[source.type].join(' or ')}`, [
      { path: 'kind', message: `use ${kindsFor[source.type].join(' or ')}` },
    ]);
  try {
    if (source.type === 'bulk_liquid') {
      const cap = source.capacityKg ?? 0;
      let kg: number;
      if (r.kind === 'level_percent') kg = levelPercentToKg(cap, r.value);
      else if (r.kind === 'kg') kg = r.value;
      else if (r.kind === 'litres_liquid') {
        if (source.gasCode !== 'O2')
          throw badRequest('Litres of liquid are converted for liquid oxygen only: enter kg or % for this tank', [{ path: 'kind', message: 'use kg or %' }]);
        // at the saturated-liquid density of the tank's working pressure, not the boiling-point density
        kg = loxLitresToKg(r.value, loxDensityAtTankPressureKgPerL(source.operatingPressureBar ?? DEFAULT_TANK_OPERATING_GAUGE_BAR, site.atmosphericBar));
      } else if (r.kind === 'calibration') {
        if (!source.calibrationJson)
          throw badRequest('This tank has no calibration table: enter %, kg or litres', [{ path: 'kind', message: 'no calibration table' }]);
        kg = contentsFromCalibrationTable(JSON.parse(source.calibrationJson), r.value);
      } else throw new Error('unreachable');
      if (kg > cap * 1.0001)
        throw badRequest(`${kg.toFixed(0)} kg is above the tank's capacity of ${cap} kg: check the reading`, [{ path: 'value', message: 'above capacity' }]);
      return kg;
    }
    if (!cyl) throw badRequest('This source has no cylinder type', [{ path: 'kind', message: 'set the cylinder type first' }]);
    const gas = source.gasCode as GasCode;
    const temperatureC = source.temperatureC ?? site.storeTemperatureC;
    if (isLiquefiedGas(gas)) {
      const perFullKg = (cyl.maxFillingRatioKgPerL ?? 0.75) * cyl.waterCapacityL;
      const lPerKg = freeGasLitresPerKg(gas, reference);
      if (r.kind === 'store_count') {
        // while liquid is left the gauge shows the vapour pressure whatever the contents: part-used cylinders are weighed
        if (r.inUseGaugeBar.length > 0) {
          throw badRequest(
            `The gauge of ${gas} shows its vapour pressure, not the contents, while any liquid is left: weigh the cylinder: gross − tare, and enter the net weight of each part-used cylinder`,
            [{ path: 'inUseGaugeBar', message: 'weigh the cylinder: gross − tare' }],
          );
        }
        return (r.full * perFullKg + (r.inUseNetKg ?? []).reduce((sum, kg) => sum + kg, 0)) * lPerKg;
      }
      throw badRequest('The gauge of a liquefied gas shows vapour pressure, not contents: count full and in-use cylinders instead', [
        { path: 'kind', message: 'use a store count' },
      ]);
    }
    const perCyl = (gauge: number) =>
      compressedContents({ gas, waterCapacityL: cyl.waterCapacityL, gaugeBar: gauge, temperatureC, atmosphericBar: site.atmosphericBar, reference }).freeGasL;
    const full = compressedContents({
      gas,
      waterCapacityL: cyl.waterCapacityL,
      gaugeBar: cyl.fillPressureBar,
      temperatureC: 15,
      atmosphericBar: site.atmosphericBar,
      reference,
    }).freeGasL;
    if (r.kind === 'bank_gauges') {
      const n = source.cylindersPerBank ?? 1;
      for (const [k, g] of [
        ['dutyBar', r.dutyBar],
        ['standbyBar', r.standbyBar],
      ] as const) {
        if (g > cyl.fillPressureBar * 1.35)
          throw badRequest(`${g} bar is far above this cylinder's ${cyl.fillPressureBar} bar fill: check the gauge`, [
            { path: k, message: 'above the fill pressure' },
          ]);
      }
      return n * (perCyl(r.dutyBar) + perCyl(r.standbyBar)) + r.spareFull * full;
    }
    if (r.kind === 'store_count') {
      if ((r.inUseNetKg ?? []).length > 0)
        throw badRequest('Net weights are for liquefied gases (CO2, N2O): give a gauge reading for each part-used cylinder', [
          { path: 'inUseNetKg', message: 'gauge readings for this gas' },
        ]);
      r.inUseGaugeBar.forEach((g, i) => {
        if (g > cyl.fillPressureBar * 1.35)
          throw badRequest(`${g} bar is far above this cylinder's ${cyl.fillPressureBar} bar fill`, [
            { path: `inUseGaugeBar.${i}`, message: 'above the fill pressure' },
          ]);
      });
      return r.full * full + r.inUseGaugeBar.reduce((sum, g) => sum + perCyl(g), 0);
    }
    throw new Error('unreachable');
  } catch (e) {
    if (e instanceof InvalidInputError) throw badRequest(e.message, e.details);
    throw e;
  }
}

export async function addReading(actor: Actor, sourceId: number, input: ReadingInput) {
  const takenAt = new Date(input.takenAt);
  if (takenAt.getTime() > Date.now() + 5 * 60_000) throw badRequest('A reading cannot be in the future', [{ path: 'takenAt', message: 'in the future' }]);
  return db().transaction(async (m) => {
    const source = await sourceFor(actor, sourceId, m);
    const site = await m.getRepository(Site).findOneByOrFail({ id: source.siteId });
    const cyl = source.cylinderTypeId ? await m.getRepository(CylinderType).findOneBy({ id: source.cylinderTypeId }) : null;
    const contents = contentsOfReading(source, site, cyl, input);
    const { kind, takenAt: _t, method, note, ...rest } = input as ReadingInput & Record<string, unknown>;
    const value = 'value' in rest ? (rest.value as number) : null;
    const detail = 'value' in rest ? null : JSON.stringify(rest);
    const saved = await m
      .getRepository(SourceReading)
      .save(
        m.getRepository(SourceReading).create({ sourceId, takenAt, kind, value, detailJson: detail, contents, method, note, takenByUserId: actor.user.id }),
      );
    await recordAudit(m, whoOf(actor), { action: 'create', entity: 'source_reading', entityId: saved.id, after: presentReading(saved) });
    await bumpSiteVersion(m, source.siteId);
    // a 50:50 N2O/O2 reading taken in a cold store: the contents assume a mixture that may have separated
    const cautions = mixtureCautions(source.gasCode as GasCode, source.temperatureC ?? site.storeTemperatureC, 'The temperature of this reading');
    return { ...presentReading(saved, new Map([[actor.user.id, actor.user.name]])), cautions };
  });
}

export async function listReadings(actor: Actor, sourceId: number, page: number, pageSize: number) {
  await sourceFor(actor, sourceId);
  const [rows, total] = await db()
    .getRepository(SourceReading)
    .findAndCount({ where: { sourceId }, order: { takenAt: 'DESC', id: 'DESC' }, skip: (page - 1) * pageSize, take: pageSize });
  const names = await readerNames(actor.user.organisationId, rows);
  return { items: rows.map((r) => presentReading(r, names)), total, page, pageSize } satisfies ReadingPage;
}

// ---------- wards, feeds, therapy lines ----------

export async function listWards(actor: Actor, siteId: number) {
  await getSiteFor(actor, siteId);
  const wards = await db()
    .getRepository(Ward)
    .find({ where: { siteId }, order: { name: 'ASC' } });
  return (await visibleWards(actor, wards)).map(presentWard);
}

export async function createWard(actor: Actor, siteId: number, input: WardInput) {
  await getSiteFor(actor, siteId);
  return db().transaction(async (m) => {
    if (await m.getRepository(Ward).findOneBy({ siteId, name: input.name })) throw conflict(`A ward called "${input.name}" exists on this site`, 'duplicate');
    const saved = await m.getRepository(Ward).save(m.getRepository(Ward).create({ ...input, siteId }));
    await recordAudit(m, whoOf(actor), { action: 'create', entity: 'ward', entityId: String(saved.id), after: presentWard(saved) });
    await bumpSiteVersion(m, siteId);
    return presentWard(saved);
  });
}

export async function updateWard(actor: Actor, id: number, input: WardInput) {
  return db().transaction(async (m) => {
    const before = await wardFor(actor, id, m);
    const clash = await m.getRepository(Ward).findOneBy({ siteId: before.siteId, name: input.name });
    if (clash && clash.id !== id) throw conflict(`A ward called "${input.name}" exists on this site`, 'duplicate');
    await m.getRepository(Ward).update({ id }, input);
    const after = await m.getRepository(Ward).findOneByOrFail({ id });
    await recordAudit(m, whoOf(actor), { action: 'update', entity: 'ward', entityId: String(id), before: presentWard(before), after: presentWard(after) });
    await bumpSiteVersion(m, before.siteId);
    return presentWard(after);
  });
}

export async function replaceTherapy(actor: Actor, wardId: number, lines: TherapyLineInput[]) {
  return db().transaction(async (m) => {
    const ward = await wardFor(actor, wardId, m);
    await assertMayWriteWard(actor, ward, m);
    const before = (await m.getRepository(TherapyLineRow).find({ where: { wardId }, order: { id: 'ASC' } })).map(presentTherapy);
    await m.getRepository(TherapyLineRow).delete({ wardId });
    if (lines.length) {
      await m.getRepository(TherapyLineRow).insert(
        lines.map((l) => ({
          wardId,
          gasCode: l.gasCode,
          device: l.device,
          patients: l.patients,
          flowLMin: l.flowLMin,
          hoursJson: l.hours?.length ? JSON.stringify([...new Set(l.hours)].sort((a, b) => a - b)) : null,
          weekdaysJson: l.weekdays?.length ? JSON.stringify([...new Set(l.weekdays)].sort()) : null,
          label: l.label,
        })),
      );
    }
    const after = (await m.getRepository(TherapyLineRow).find({ where: { wardId }, order: { id: 'ASC' } })).map(presentTherapy);
    await recordAudit(m, whoOf(actor), { action: 'update', entity: 'therapy_lines', entityId: String(wardId), before, after });
    await bumpSiteVersion(m, ward.siteId);
    return after;
  });
}

export async function replaceFeeds(actor: Actor, wardId: number, feeds: { sourceId: number; gasCode: string; role: string }[]) {
  return db().transaction(async (m) => {
    const ward = await wardFor(actor, wardId, m);
    const ids = [...new Set(feeds.map((f) => f.sourceId))];
    const sources = ids.length ? await m.getRepository(SupplySource).find({ where: { id: In(ids), siteId: ward.siteId } }) : [];
    feeds.forEach((f, i) => {
      const s = sources.find((x) => x.id === f.sourceId);
      if (!s) throw badRequest("A feed names a source that is not on this ward's site", [{ path: `feeds.${i}.sourceId`, message: 'unknown source' }]);
      if (s.gasCode !== f.gasCode)
        throw badRequest(`${s.name} holds ${s.gasCode}, not ${f.gasCode}`, [{ path: `feeds.${i}.gasCode`, message: 'does not match the source' }]);
    });
    const primaries = new Set<string>();
    feeds.forEach((f, i) => {
      if (f.role !== 'primary') return;
      if (primaries.has(f.gasCode))
        throw badRequest(`Only one primary source per gas`, [{ path: `feeds.${i}.role`, message: 'a primary exists for this gas' }]);
      primaries.add(f.gasCode);
    });
    const before = await m.getRepository(WardFeed).find({ where: { wardId } });
    await m.getRepository(WardFeed).delete({ wardId });
    if (feeds.length) await m.getRepository(WardFeed).insert(feeds.map((f) => ({ wardId, ...f })));
    const after = await m.getRepository(WardFeed).find({ where: { wardId } });
    await recordAudit(m, whoOf(actor), { action: 'update', entity: 'ward_feeds', entityId: String(wardId), before, after });
    await bumpSiteVersion(m, ward.siteId);
    return after.map((f) => ({ sourceId: f.sourceId, gasCode: f.gasCode, role: f.role }));
  });
}

// ---------- scenarios ----------

function checkLocal(site: Site, local: string, path: string) {
  const dt = DateTime.fromFormat(local, "yyyy-MM-dd'T'HH:mm", { zone: site.timeZone });
  if (!dt.isValid || dt.toFormat("yyyy-MM-dd'T'HH:mm") !== local)
    throw badRequest(`${local} is not a valid local time in ${site.timeZone}`, [{ path, message: 'not a valid local time' }]);
}

async function checkScenario(m: EntityManager, actor: Actor, siteId: number, input: ScenarioInput) {
  const site = await m.getRepository(Site).findOneByOrFail({ id: siteId });
  checkLocal(site, input.fromLocal, 'fromLocal');
  if (input.untilLocal) checkLocal(site, input.untilLocal, 'untilLocal');
  if (input.wardId && !(await m.getRepository(Ward).findOneBy({ id: input.wardId, siteId })))
    throw badRequest('The ward is not on this site', [{ path: 'wardId', message: 'unknown ward' }]);
  void actor;
}

export async function listScenarios(actor: Actor, siteId: number) {
  await getSiteFor(actor, siteId);
  return (
    await db()
      .getRepository(Scenario)
      .find({ where: { siteId }, order: { fromLocal: 'ASC' } })
  ).map(presentScenario);
}

export async function createScenario(actor: Actor, siteId: number, input: ScenarioInput) {
  await getSiteFor(actor, siteId);
  return db().transaction(async (m) => {
    await checkScenario(m, actor, siteId, input);
    if (await m.getRepository(Scenario).findOneBy({ siteId, name: input.name })) throw conflict(`A scenario called "${input.name}" exists`, 'duplicate');
    const saved = await m.getRepository(Scenario).save(m.getRepository(Scenario).create({ ...input, siteId }));
    await recordAudit(m, whoOf(actor), { action: 'create', entity: 'scenario', entityId: String(saved.id), after: presentScenario(saved) });
    await bumpSiteVersion(m, siteId);
    return presentScenario(saved);
  });
}

export async function updateScenario(actor: Actor, id: number, input: ScenarioInput) {
  return db().transaction(async (m) => {
    const before = await scenarioFor(actor, id, m);
    await checkScenario(m, actor, before.siteId, input);
    const clash = await m.getRepository(Scenario).findOneBy({ siteId: before.siteId, name: input.name });
    if (clash && clash.id !== id) throw conflict(`A scenario called "${input.name}" exists`, 'duplicate');
    await m.getRepository(Scenario).update({ id }, input);
    const after = await m.getRepository(Scenario).findOneByOrFail({ id });
    await recordAudit(m, whoOf(actor), {
      action: 'update',
      entity: 'scenario',
      entityId: String(id),
      before: presentScenario(before),
      after: presentScenario(after),
    });
    await bumpSiteVersion(m, before.siteId);
    return presentScenario(after);
  });
}

export async function deleteScenario(actor: Actor, id: number) {
  return db().transaction(async (m) => {
    const before = await scenarioFor(actor, id, m);
    await m.getRepository(Scenario).delete({ id });
    await recordAudit(m, whoOf(actor), { action: 'delete', entity: 'scenario', entityId: String(id), before: presentScenario(before) });
    await bumpSiteVersion(m, before.siteId);
    return { ok: true };
  });
}

// ---------- scheduled deliveries ----------

export function presentDelivery(d: ScheduledDelivery) {
  return {
    id: d.id,
    sourceId: d.sourceId,
    dueAt: d.dueAt.toISOString(),
    kg: d.kg,
    cylinders: d.cylinders,
    status: d.status,
    reference: d.reference,
  } satisfies DeliveryView;
}

export async function listDeliveries(actor: Actor, sourceId: number) {
  await sourceFor(actor, sourceId);
  return (
    await db()
      .getRepository(ScheduledDelivery)
      .find({ where: { sourceId }, order: { dueAt: 'DESC' }, take: 100 })
  ).map(presentDelivery);
}

export async function scheduleDelivery(actor: Actor, sourceId: number, input: DeliveryInput) {
  return db().transaction(async (m) => {
    const source = await sourceFor(actor, sourceId, m);
    if (source.type === 'bulk_liquid' && input.kg === null) throw badRequest('A delivery to a tank is in kg', [{ path: 'kg', message: 'enter kg' }]);
    if (source.type !== 'bulk_liquid' && input.cylinders === null)
      throw badRequest('A delivery of cylinders is counted in cylinders', [{ path: 'cylinders', message: 'enter cylinders' }]);
    const saved = await m
      .getRepository(ScheduledDelivery)
      .save(
        m
          .getRepository(ScheduledDelivery)
          .create({ sourceId, dueAt: new Date(input.dueAt), kg: input.kg, cylinders: input.cylinders, status: 'scheduled', reference: input.reference }),
      );
    await recordAudit(m, whoOf(actor), { action: 'create', entity: 'scheduled_delivery', entityId: String(saved.id), after: presentDelivery(saved) });
    await bumpSiteVersion(m, source.siteId);
    return presentDelivery(saved);
  });
}

export async function cancelDelivery(actor: Actor, id: number) {
  return db().transaction(async (m) => {
    const { delivery, source } = await deliveryFor(actor, id, m);
    if (delivery.status !== 'scheduled') throw new AppError(409, 'conflict', `This delivery is ${delivery.status} already`);
    await m.getRepository(ScheduledDelivery).update({ id }, { status: 'cancelled' });
    await recordAudit(m, whoOf(actor), {
      action: 'update',
      entity: 'scheduled_delivery',
      entityId: String(id),
      before: presentDelivery(delivery),
      after: { ...presentDelivery(delivery), status: 'cancelled' },
    });
    await bumpSiteVersion(m, source.siteId);
    return { ...presentDelivery(delivery), status: 'cancelled' };
  });
}

// ---------- device flows ----------

export async function setDeviceFlows(actor: Actor, flows: { device: string; flowLMin: number }[]) {
  return db().transaction(async (m) => {
    const before = await m.getRepository(DeviceFlow).find({ where: { organisationId: actor.user.organisationId } });
    await m.getRepository(DeviceFlow).delete({ organisationId: actor.user.organisationId });
    if (flows.length)
      await m.getRepository(DeviceFlow).insert(flows.map((f) => ({ organisationId: actor.user.organisationId, device: f.device, flowLMin: f.flowLMin })));
    await recordAudit(m, whoOf(actor), {
      action: 'update',
      entity: 'device_flows',
      entityId: String(actor.user.organisationId),
      before: before.map((f) => ({ device: f.device, flowLMin: f.flowLMin })),
      after: flows,
    });
    await m.query('UPDATE site SET data_version = data_version + 1 WHERE organisation_id = ?', [actor.user.organisationId]);
    return flows;
  });
}

export async function getDeviceFlows(actor: Actor) {
  return db()
    .getRepository(DeviceFlow)
    .find({ where: { organisationId: actor.user.organisationId } });
}
