import { In, type EntityManager } from 'typeorm';
import type { CylinderTypeInput, SupplierInput } from '@common/schemas/admin.schema';
import { cylinderTypeName, nominalContents } from '@common/catalogue/cylinder-type';
import { DEFAULT_RESIDUAL_FRACTION_OF_FILL, DEFAULT_RESIDUAL_SOURCE } from '@common/gas/contents';
import { db } from '../../db/db';
import { CylinderType, Gas, Supplier, SupplierPrice } from '../../db/entities/catalogue.entity';
import type { Actor } from '../../http/context';
import { badRequest, conflict, notFound } from '../../errors/app-error';
import { recordAudit, whoOf } from '../audit/audit.service';
import { bumpOrganisationSiteVersions } from '../forecast/site-version';
import type { CylinderTypeView, GasView, SupplierPriceView, SupplierView } from '@common/schemas/admin.schema';

export async function listGases(): Promise<GasView[]> {
  const gases = await db()
    .getRepository(Gas)
    .find({ order: { sortOrder: 'ASC' } });
  return gases.map((g) => ({
    code: g.code,
    name: g.name,
    state: g.state as GasView['state'],
    iso32Colours: g.iso32Colours.split(',').filter(Boolean),
    cgaColours: g.cgaColours.split(',').filter(Boolean),
  }));
}

export function presentCylinderType(c: CylinderType): CylinderTypeView {
  return {
    id: c.id,
    name: cylinderTypeName(c.waterCapacityL, c.fillPressureBar),
    gasCode: c.gasCode,
    waterCapacityL: c.waterCapacityL,
    fillPressureBar: c.fillPressureBar,
    tareKg: c.tareKg,
    maxFillingRatioKgPerL: c.maxFillingRatioKgPerL,
    residualGaugeBar: c.residualGaugeBar ?? null,
    /** The residual the forecasts use: the type's own, else 10 % of the fill, with where it comes from. */
    residual:
      c.residualGaugeBar != null
        ? { gaugeBar: c.residualGaugeBar, basis: 'set for this cylinder type' }
        : { gaugeBar: DEFAULT_RESIDUAL_FRACTION_OF_FILL * c.fillPressureBar, basis: DEFAULT_RESIDUAL_SOURCE },
    material: c.material,
    valveNotes: c.valveNotes,
    active: c.active,
    nominal: nominalContents({
      gas: c.gasCode,
      waterCapacityL: c.waterCapacityL,
      fillPressureBar: c.fillPressureBar,
      maxFillingRatioKgPerL: c.maxFillingRatioKgPerL,
    }),
  };
}

export async function listCylinderTypes(actor: Actor) {
  const rows = await db()
    .getRepository(CylinderType)
    .find({ where: { organisationId: actor.user.organisationId }, order: { gasCode: 'ASC', waterCapacityL: 'ASC', fillPressureBar: 'ASC' } });
  return rows.map(presentCylinderType);
}

async function cylinderTypeInOrg(m: EntityManager, actor: Actor, id: number) {
  const row = await m.getRepository(CylinderType).findOneBy({ id, organisationId: actor.user.organisationId });
  if (!row) throw notFound('Cylinder type');
  return row;
}

export async function getCylinderType(actor: Actor, id: number) {
  return presentCylinderType(await cylinderTypeInOrg(db().manager, actor, id));
}

async function assertUniqueType(m: EntityManager, actor: Actor, input: CylinderTypeInput, exceptId?: number) {
  const clash = await m.getRepository(CylinderType).findOneBy({
    organisationId: actor.user.organisationId,
    gasCode: input.gasCode,
    waterCapacityL: input.waterCapacityL,
    fillPressureBar: input.fillPressureBar,
  });
  if (clash && clash.id !== exceptId)
    throw conflict(`${cylinderTypeName(input.waterCapacityL, input.fillPressureBar)} for this gas exists already`, 'duplicate');
}

export async function createCylinderType(actor: Actor, input: CylinderTypeInput) {
  return db().transaction(async (m) => {
    await assertUniqueType(m, actor, input);
    const repo = m.getRepository(CylinderType);
    const saved = await repo.save(
      repo.create({
        ...input,
        tareKg: input.tareKg ?? null,
        maxFillingRatioKgPerL: input.maxFillingRatioKgPerL ?? null,
        residualGaugeBar: input.residualGaugeBar ?? null,
        organisationId: actor.user.organisationId,
      }),
    );
    const row = presentCylinderType(saved);
    await recordAudit(m, whoOf(actor), { action: 'create', entity: 'cylinder_type', entityId: String(saved.id), after: row });
    return row;
  });
}

export async function updateCylinderType(actor: Actor, id: number, input: CylinderTypeInput) {
  return db().transaction(async (m) => {
    const before = presentCylinderType(await cylinderTypeInOrg(m, actor, id));
    await assertUniqueType(m, actor, input, id);
    await m.getRepository(CylinderType).update(
      { id },
      {
        ...input,
        tareKg: input.tareKg ?? null,
        maxFillingRatioKgPerL: input.maxFillingRatioKgPerL ?? null,
        residualGaugeBar: input.residualGaugeBar ?? null,
      },
    );
    // A cylinder type's size and fill pressure are forecast inputs of every source using it.
    await bumpOrganisationSiteVersions(m, actor.user.organisationId);
    const after = presentCylinderType(await cylinderTypeInOrg(m, actor, id));
    await recordAudit(m, whoOf(actor), { action: 'update', entity: 'cylinder_type', entityId: String(id), before, after });
    return after;
  });
}

// ---- suppliers ----

async function presentSuppliers(m: EntityManager, suppliers: Supplier[]): Promise<SupplierView[]> {
  const prices = suppliers.length
    ? await m.getRepository(SupplierPrice).find({ where: { supplierId: In(suppliers.map((s) => s.id)) }, order: { id: 'ASC' } })
    : [];
  return suppliers.map((s) => ({
    id: s.id,
    name: s.name,
    orderEmail: s.orderEmail,
    phone: s.phone,
    leadTimeHours: s.leadTimeHours,
    rentalMinorPerCylinderDay: s.rentalMinorPerCylinderDay,
    minBulkDropKg: s.minBulkDropKg,
    currency: s.currency,
    active: s.active,
    prices: prices
      .filter((p) => p.supplierId === s.id)
      .map((p) => ({ id: p.id, cylinderTypeId: p.cylinderTypeId, gasCode: p.gasCode, unit: p.unit as SupplierPriceView['unit'], priceMinor: p.priceMinor })),
  }));
}

export async function listSuppliers(actor: Actor) {
  const rows = await db()
    .getRepository(Supplier)
    .find({ where: { organisationId: actor.user.organisationId }, order: { name: 'ASC' } });
  return presentSuppliers(db().manager, rows);
}

async function supplierInOrg(m: EntityManager, actor: Actor, id: number) {
  const row = await m.getRepository(Supplier).findOneBy({ id, organisationId: actor.user.organisationId });
  if (!row) throw notFound('Supplier');
  return row;
}

export async function getSupplier(actor: Actor, id: number) {
  const [row] = await presentSuppliers(db().manager, [await supplierInOrg(db().manager, actor, id)]);
  return row;
}

async function writePrices(m: EntityManager, actor: Actor, supplierId: number, prices: SupplierInput['prices']) {
  const typeIds = prices.map((p) => p.cylinderTypeId).filter((x): x is number => !!x);
  if (typeIds.length) {
    const found = await m.getRepository(CylinderType).count({ where: { id: In(typeIds), organisationId: actor.user.organisationId } });
    if (found !== new Set(typeIds).size)
      throw badRequest('A price names a cylinder type that does not exist', [{ path: 'prices', message: 'unknown cylinder type' }]);
  }
  await m.getRepository(SupplierPrice).delete({ supplierId });
  if (prices.length) {
    await m.getRepository(SupplierPrice).insert(
      prices.map((p) => ({
        supplierId,
        cylinderTypeId: p.unit === 'cylinder' ? (p.cylinderTypeId ?? null) : null,
        gasCode: p.unit === 'kg' ? (p.gasCode ?? null) : null,
        unit: p.unit,
        priceMinor: p.priceMinor,
      })),
    );
  }
}

export async function createSupplier(actor: Actor, input: SupplierInput) {
  return db().transaction(async (m) => {
    const repo = m.getRepository(Supplier);
    if (await repo.findOneBy({ organisationId: actor.user.organisationId, name: input.name }))
      throw conflict(`A supplier called "${input.name}" exists already`, 'duplicate');
    const { prices, ...fields } = input;
    const saved = await repo.save(repo.create({ ...fields, organisationId: actor.user.organisationId }));
    await writePrices(m, actor, saved.id, prices);
    const [row] = await presentSuppliers(m, [saved]);
    await recordAudit(m, whoOf(actor), { action: 'create', entity: 'supplier', entityId: String(saved.id), after: row });
    return row;
  });
}

export async function updateSupplier(actor: Actor, id: number, input: SupplierInput) {
  return db().transaction(async (m) => {
    const [before] = await presentSuppliers(m, [await supplierInOrg(m, actor, id)]);
    const clash = await m.getRepository(Supplier).findOneBy({ organisationId: actor.user.organisationId, name: input.name });
    if (clash && clash.id !== id) throw conflict(`A supplier called "${input.name}" exists already`, 'duplicate');
    const { prices, ...fields } = input;
    await m.getRepository(Supplier).update({ id }, fields);
    await writePrices(m, actor, id, prices);
    // A supplier's lead time (and name) reach the forecasts and screens of every site.
    await bumpOrganisationSiteVersions(m, actor.user.organisationId);
    const [after] = await presentSuppliers(m, [await supplierInOrg(m, actor, id)]);
    await recordAudit(m, whoOf(actor), { action: 'update', entity: 'supplier', entityId: String(id), before, after });
    return after;
  });
}
