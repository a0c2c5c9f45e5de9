import { createServer } from 'node:net';
import type { DataSource } from 'typeorm';
import type { Role } from '@common/api/roles';
import { CylinderType, Supplier, SupplierPrice } from '@backend/db/entities/catalogue.entity';
import { SourceReading, SupplySource, TherapyLineRow, Ward, WardFeed } from '@backend/db/entities/supply.entity';
import { User, UserRole, UserSite } from '@backend/db/entities/user.entity';
import { UserApprovalLimit } from '@backend/db/entities/orders.entity';
import { hashPassword } from '@backend/modules/auth/auth.service';
import { PASSWORD, uniq, type TestOrg } from './test-app';

/** A free loopback port (for the local mail service of a test). */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const { port } = s.address() as { port: number };
      s.close(() => resolve(port));
    });
  });
}

let hashed: string | undefined;

/** An extra user of the organisation with the given roles, granted every site of it. */
export async function addUser(ds: DataSource, org: TestOrg, roles: Role[], limitMinor?: number): Promise<{ id: number; email: string }> {
  hashed ??= await hashPassword(PASSWORD);
  const email = `${roles.join('-')}.${uniq('u')}@test.example`;
  const u = await ds.getRepository(User).save(
    ds.getRepository(User).create({
      organisationId: org.organisationId,
      email,
      name: `User ${email.slice(0, 30)}`,
      passwordHash: hashed,
      active: true,
      failedLogins: 0,
      lockedUntil: null,
      passwordChangedAt: null,
    }),
  );
  for (const role of roles) await ds.getRepository(UserRole).insert({ userId: u.id, role });
  for (const siteId of org.siteIds) await ds.getRepository(UserSite).insert({ userId: u.id, siteId });
  if (limitMinor !== undefined)
    await ds.getRepository(UserApprovalLimit).insert({ userId: u.id, organisationId: org.organisationId, limitMinor, currency: 'GBP' });
  return { id: u.id, email };
}

export interface StoreFixture {
  supplier: Supplier;
  cylinderType: CylinderType;
  source: SupplySource;
  priceMinor: number;
}

/**
 * A cylinder store of 10 L · 200 bar oxygen cylinders with a reorder rule (level 10, order up to 30), a
 * supplier with a 24 h lead time and a price of `priceMinor` per cylinder, fed to a ward using a constant
 * `flowLMin` of oxygen, and a store count of `full` cylinders taken at `countedAt`.
 */
export async function cylinderStore(
  ds: DataSource,
  org: TestOrg,
  siteId: number,
  opts: { full: number; countedAt: Date; flowLMin?: number; priceMinor?: number; supplierName?: string; rentalMinorPerCylinderDay?: number },
): Promise<StoreFixture> {
  const tag = uniq('st');
  const priceMinor = opts.priceMinor ?? 2600;
  const supplier = await ds.getRepository(Supplier).save(
    ds.getRepository(Supplier).create({
      organisationId: org.organisationId,
      name: opts.supplierName ?? `Supplier ${tag}`,
      orderEmail: `orders-${tag}@supplier.example`,
      phone: '+44 1632 960 000',
      leadTimeHours: 24,
      rentalMinorPerCylinderDay: opts.rentalMinorPerCylinderDay ?? 9,
      minBulkDropKg: 0,
      currency: 'GBP',
      active: true,
    }),
  );
  const cylinderType =
    (await ds.getRepository(CylinderType).findOneBy({ organisationId: org.organisationId, gasCode: 'O2', waterCapacityL: 10, fillPressureBar: 200 })) ??
    (await ds.getRepository(CylinderType).save(
      ds.getRepository(CylinderType).create({
        organisationId: org.organisationId,
        gasCode: 'O2',
        waterCapacityL: 10,
        fillPressureBar: 200,
        tareKg: null,
        maxFillingRatioKgPerL: null,
        residualGaugeBar: 0 /* drawn to empty: the order arithmetic of the tests counts whole-cylinder contents */,
        material: 'steel',
        valveNotes: '',
        active: true,
      }),
    ));
  await ds.getRepository(SupplierPrice).insert({ supplierId: supplier.id, cylinderTypeId: cylinderType.id, gasCode: null, unit: 'cylinder', priceMinor });
  const source = await ds.getRepository(SupplySource).save(
    ds.getRepository(SupplySource).create({
      siteId,
      name: `Store ${tag}`,
      type: 'cylinder_store',
      gasCode: 'O2',
      supplierId: supplier.id,
      cylinderTypeId: cylinderType.id,
      temperatureC: 15,
      reorderMode: 'amount',
      reorderLevel: 10,
      orderUpTo: 30,
      forecastBasis: 'model',
      modelCorrectionFactor: 1,
      notes: '',
      active: true,
    }),
  );
  const ward = await ds
    .getRepository(Ward)
    .save(ds.getRepository(Ward).create({ siteId, name: `Ward ${tag}`, department: 'ward', beds: 20, leakagePercent: 0, active: true }));
  await ds.getRepository(WardFeed).insert({ wardId: ward.id, sourceId: source.id, gasCode: 'O2', role: 'primary' });
  await ds.getRepository(TherapyLineRow).insert({
    wardId: ward.id,
    gasCode: 'O2',
    device: 'custom',
    patients: 1,
    flowLMin: opts.flowLMin ?? 10,
    hoursJson: null,
    weekdaysJson: null,
    label: 'constant',
  });
  await addStoreCount(ds, source.id, opts.full, opts.countedAt);
  return { supplier, cylinderType, source, priceMinor };
}

/** A store count written straight to the table (contents as the reading route would compute them). */
export async function addStoreCount(ds: DataSource, sourceId: number, full: number, at: Date, perCylL = 0): Promise<void> {
  await ds.getRepository(SourceReading).insert({
    sourceId,
    takenAt: at,
    kind: 'store_count',
    value: null,
    detailJson: JSON.stringify({ full, inUseGaugeBar: [], empty: 0 }),
    contents: full * perCylL,
    method: 'manual',
    takenByUserId: null,
    note: '',
  });
}
