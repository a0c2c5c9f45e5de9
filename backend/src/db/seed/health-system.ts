import type { DataSource, EntityManager } from 'typeorm';
import { DateTime } from 'luxon';
import type { PoolConnection } from 'mariadb';
import { DEVICE_DEFAULTS, type OxygenDevice } from '@common/forecast/demand-model';
import { freeGasLitresPerKg } from '@common/gas/reference-conditions';
import { compressedContents } from '@common/gas/contents';
import { Organisation } from '../entities/organisation.entity';
import { Site } from '../entities/site.entity';
import { User, UserRole, UserSite } from '../entities/user.entity';
import { CylinderType, Supplier, SupplierPrice } from '../entities/catalogue.entity';
import { SupplySource, TherapyLineRow, Ward, WardFeed } from '../entities/supply.entity';
import { DeliveryRecord, PurchaseOrder, ReorderRequest } from '../entities/orders.entity';
import { hashPassword } from '../../modules/auth/auth.service';
import { standardAtmosphereBar } from '../../modules/sites/sites.service';
import { bulkPool } from '../bulk-pool';
import { CYLINDER_TYPES, DEMO_PASSWORD } from './demo-foundation';

/**
 * The large-organisation data set (`npm run seed -- --scale health-system`): an invented health system
 * of 40 sites (10 hospitals, 30 clinics), 1,000 supply sources, 400 wards with therapy lines, hourly
 * telemetry for every bulk tank (730 days unless told otherwise), two weeks of usage reports and six
 * months of delivered bulk orders. Everything is invented and seeded with a fixed generator, so two
 * builds are the same apart from the clock. A separate organisation: the demo organisation is untouched.
 *
 * The bulk rows (readings, reports, report lines) go through the `mariadb` connector's batch() in
 * batches of at most BATCH_ROWS, one transaction each, so no write set grows past what a Galera
 * cluster accepts; the small tables go through TypeORM.
 */
export const HEALTH_SYSTEM_ORGANISATION = 'Vornhallow Health System (invented, scale test)';

export const HEALTH_SYSTEM_USERS: { email: string; name: string; role: 'administrator' | 'facilities_manager' }[] = [
  { email: 'hs-admin@plenum.example', name: 'Ysolde Brackwater', role: 'administrator' },
  { email: 'hs-facilities@plenum.example', name: 'Corvin Maelstead', role: 'facilities_manager' },
];

/** Rows per batch() call and per transaction: far below Galera's default write-set limits. */
export const BATCH_ROWS = 5000;

const SITE_COUNT = 40;
const SOURCES_PER_SITE = 25;
const WARDS_PER_HOSPITAL = 25;
const WARDS_PER_CLINIC = 5;
const REPORT_DAYS = 14;
const ORDERS_PER_TANK = 6;

/** Invented syllables; their products name the sites (no real place intended). */
const HEADS = ['Quel', 'Vorn', 'Tarra', 'Ysk', 'Olm', 'Brae', 'Cind', 'Drom', 'Fael', 'Gwyth'];
const TAILS = ['hythe', 'mere', 'worth', 'combe'];

/** A small seeded generator (mulberry32), as in the demo seed. */
function rng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const WARD_KINDS: { name: string; department: string; beds: number; lines: { device: OxygenDevice; patients: number }[] }[] = [
  {
    name: 'medical ward',
    department: 'ward',
    beds: 28,
    lines: [
      { device: 'nasal_cannula', patients: 6 },
      { device: 'simple_mask', patients: 2 },
    ],
  },
  {
    name: 'respiratory ward',
    department: 'ward',
    beds: 26,
    lines: [
      { device: 'nasal_cannula', patients: 8 },
      { device: 'venturi_35', patients: 3 },
      { device: 'hfno', patients: 1 },
    ],
  },
  {
    name: 'surgical ward',
    department: 'ward',
    beds: 28,
    lines: [
      { device: 'nasal_cannula', patients: 4 },
      { device: 'simple_mask', patients: 1 },
    ],
  },
  {
    name: 'critical care',
    department: 'critical_care',
    beds: 12,
    lines: [
      { device: 'ventilator', patients: 7 },
      { device: 'hfno', patients: 2 },
    ],
  },
  {
    name: 'emergency unit',
    department: 'emergency',
    beds: 24,
    lines: [
      { device: 'simple_mask', patients: 3 },
      { device: 'non_rebreather', patients: 1 },
    ],
  },
];

export interface ScaleOptions {
  telemetryDays: number;
  now?: Date;
  log?: (line: string) => void;
}

export interface ScaleResult {
  created: boolean;
  rows: Record<string, number>;
}

interface Tank {
  id: number;
  capacityKg: number;
  lMin: number;
}

const utc = (d: Date) => d.toISOString().slice(0, 23).replace('T', ' ');

/** Sends rows in batches of BATCH_ROWS, each in a transaction of its own. */
async function batchInsert(conn: PoolConnection, sql: string, rows: unknown[][]): Promise<void> {
  for (let i = 0; i < rows.length; i += BATCH_ROWS) {
    await conn.beginTransaction();
    try {
      await conn.batch(sql, rows.slice(i, i + BATCH_ROWS));
      await conn.commit();
    } catch (e) {
      await conn.rollback().catch(() => undefined);
      throw e;
    }
  }
}

/** Builds the invented health system once; a second run leaves it as it is and returns created: false. */
export async function seedHealthSystem(ds: DataSource, opts: ScaleOptions): Promise<ScaleResult> {
  const now = opts.now ?? new Date();
  const log = opts.log ?? (() => undefined);
  const rows: Record<string, number> = {};
  const count = (table: string, n: number) => {
    rows[table] = (rows[table] ?? 0) + n;
  };
  const random = rng(20270315);

  // 1. The organisation, its sites, catalogue, users, wards and sources: one TypeORM transaction.
  const built = await ds.transaction(async (m) => {
    if (await m.getRepository(Organisation).findOneBy({ name: HEALTH_SYSTEM_ORGANISATION })) return null;
    return buildStructure(m, now, random, count);
  });
  if (!built) return { created: false, rows };
  log(`structure: ${rows.site} sites, ${rows.supply_source} sources, ${rows.ward} wards, ${rows.therapy_line} therapy lines`);

  const conn = await bulkPool().getConnection();
  try {
    // 2. Hourly telemetry of every bulk tank, simulated backwards from a level near 60 %, as the demo does.
    const kgPerL = 1 / freeGasLitresPerKg('O2', '15C');
    const hours = opts.telemetryDays * 24;
    const endMs = DateTime.fromJSDate(now).startOf('hour').toMillis();
    const readingSql =
      'INSERT INTO source_reading (source_id, taken_at, kind, value, detail_json, contents, method, taken_by_user_id, note) VALUES (?, ?, ?, ?, NULL, ?, ?, NULL, ?)';
    for (const tank of built.tanks) {
      const out: unknown[][] = [];
      let kg = tank.capacityKg * (0.5 + random() * 0.2);
      let dayFactor = 1;
      for (let h = 0; h < hours; h++) {
        const takenAt = new Date(endMs - h * 3_600_000 - 7 * 60_000);
        const percent = Math.round((kg / tank.capacityKg) * 1000) / 10;
        out.push([tank.id, utc(takenAt), 'level_percent', percent, (percent / 100) * tank.capacityKg, 'telemetry', '']);
        if (h % 24 === 0) dayFactor = Math.max(0.6, 1 + 0.15 * (random() * 2 - 1));
        const diurnal = takenAt.getUTCHours() >= 8 && takenAt.getUTCHours() < 20 ? 1.12 : 0.88;
        kg += Math.max(tank.lMin * 60 * dayFactor * diurnal * kgPerL, (0.004 * tank.capacityKg) / 24);
        if (kg > tank.capacityKg * 0.9) kg = tank.capacityKg * (0.35 + random() * 0.02); // before the tanker came
      }
      out.reverse();
      await batchInsert(conn, readingSql, out);
      count('source_reading', out.length);
    }
    log(`telemetry: ${rows.source_reading} readings of ${built.tanks.length} tanks`);

    // The latest round's reading of every cylinder source (one each).
    const cyl: unknown[][] = built.cylinderSources.map((s) => [
      s.id,
      utc(new Date(now.getTime() - (2 + Math.floor(random() * 40)) * 3_600_000)),
      'store_count',
      null,
      JSON.stringify({ full: s.full, inUseGaugeBar: [], empty: 0 }),
      s.full * s.perCylinderL,
      'manual',
      built.facilitiesId,
      'Round (scale data)',
    ]);
    await batchInsert(
      conn,
      'INSERT INTO source_reading (source_id, taken_at, kind, value, detail_json, contents, method, taken_by_user_id, note) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)',
      cyl,
    );
    count('source_reading', cyl.length);

    // 3. Usage reports: the last REPORT_DAYS days for every ward, with a line per device near the model.
    const today = DateTime.fromJSDate(now, { zone: 'Europe/London' }).startOf('day');
    const reports: unknown[][] = [];
    for (let back = REPORT_DAYS; back >= 1; back--) {
      const day = today.minus({ days: back });
      for (const w of built.wards)
        reports.push([
          w.siteId,
          w.id,
          day.toISODate(),
          '',
          built.facilitiesId,
          utc(day.plus({ hours: 18, minutes: Math.floor(random() * 180) }).toJSDate()),
          built.facilitiesId,
        ]);
    }
    await batchInsert(
      conn,
      'INSERT INTO usage_report (site_id, ward_id, report_date, note, submitted_by_user_id, submitted_at, updated_by_user_id) VALUES (?, ?, ?, ?, ?, ?, ?)',
      reports,
    );
    count('usage_report', reports.length);
    // Ids are read back (not inferred from the first insert id: a cluster's auto-increment steps by its size).
    const ids = (await conn.query('SELECT r.id, r.ward_id FROM usage_report r JOIN site s ON s.id = r.site_id WHERE s.organisation_id = ?', [
      built.organisationId,
    ])) as { id: number; ward_id: number }[];
    const linesByWard = new Map(built.wards.map((w) => [w.id, w.lines]));
    const lines: unknown[][] = [];
    for (const r of ids) {
      for (const l of linesByWard.get(r.ward_id) ?? []) {
        const n = Math.max(0, Math.round(l.patients * (0.8 + random() * 0.45)));
        lines.push([r.id, 'device', l.device, n, n + (random() < 0.5 ? 1 : 0)]);
      }
    }
    await batchInsert(conn, 'INSERT INTO usage_report_line (report_id, line_kind, device, patients_now, patients_shift) VALUES (?, ?, ?, ?, ?)', lines);
    count('usage_report_line', lines.length);
    log(`usage: ${rows.usage_report} reports, ${rows.usage_report_line} lines`);
  } finally {
    await conn.release();
  }

  // 4. Six months of delivered bulk orders per tank (request, purchase order, delivery), one transaction per site.
  let seq = 0;
  for (const tank of built.tanks) {
    await ds.transaction(async (m) => {
      const site = built.siteOfTank.get(tank.id)!;
      for (let k = ORDERS_PER_TANK; k >= 1; k--) {
        seq += 1;
        const at = new Date(now.getTime() - (k * 30 + Math.floor(random() * 10)) * 86_400_000);
        const kg = Math.round(tank.capacityKg * 0.5);
        const unitPriceMinor = 21;
        const r = await m.getRepository(ReorderRequest).save(
          m.getRepository(ReorderRequest).create({
            organisationId: built.organisationId,
            siteId: site.id,
            sourceId: tank.id,
            supplierId: built.bulkSupplierId,
            origin: 'auto',
            status: 'delivered',
            unit: 'kg',
            gasCode: 'O2',
            cylinderTypeId: null,
            suggestedQuantity: kg,
            quantity: kg,
            quantityReason: '',
            unitPriceMinor,
            totalMinor: kg * unitPriceMinor,
            currency: 'GBP',
            neededBy: new Date(at.getTime() + 2 * 86_400_000),
            triggerJson: null,
            problem: '',
            note: '',
            requestedByUserId: null,
            version: 1,
            createdAt: at,
          }),
        );
        const windowStart = new Date(at.getTime() + 48 * 3_600_000);
        const poNumber = `PO-${String(seq).padStart(6, '0')}`;
        const po = await m.getRepository(PurchaseOrder).save(
          m.getRepository(PurchaseOrder).create({
            organisationId: built.organisationId,
            requestId: r.id,
            seq,
            poNumber,
            siteId: site.id,
            sourceId: tank.id,
            supplierId: built.bulkSupplierId,
            status: 'delivered',
            description: 'Liquid oxygen, bulk delivery',
            unit: 'kg',
            quantity: kg,
            unitPriceMinor,
            totalMinor: kg * unitPriceMinor,
            currency: 'GBP',
            windowStart,
            windowEnd: new Date(windowStart.getTime() + 86_400_000),
            deliveryAddress: [site.name, site.address].join('\n'),
            contactName: 'Corvin Maelstead',
            contactEmail: 'hs-facilities@plenum.example',
            approvedByJson: JSON.stringify([]),
            scheduledDeliveryId: null,
            deliveredQuantity: kg,
            sentAt: at,
            pdf: null,
            createdAt: at,
          }),
        );
        await m.getRepository(DeliveryRecord).insert({
          purchaseOrderId: po.id,
          siteId: site.id,
          sourceId: tank.id,
          deliveryNote: `DN-${90_000 + seq}`,
          deliveredAt: windowStart,
          quantity: kg,
          unit: 'kg',
          emptiesCollected: 0,
          readingId: null,
          note: '',
          recordedByUserId: built.facilitiesId,
        });
      }
    });
    count('reorder_request', ORDERS_PER_TANK);
    count('purchase_order', ORDERS_PER_TANK);
    count('delivery_record', ORDERS_PER_TANK);
  }
  await ds.query('INSERT INTO po_sequence (organisation_id, last_value) VALUES (?, ?)', [built.organisationId, seq]);
  log(`orders: ${rows.purchase_order} delivered purchase orders`);
  return { created: true, rows };
}

async function buildStructure(m: EntityManager, now: Date, random: () => number, count: (t: string, n: number) => void) {
  const org = await m.getRepository(Organisation).save({ name: HEALTH_SYSTEM_ORGANISATION });
  count('organisation', 1);

  const cylinderTypes: Record<string, number> = {};
  for (const [key, row] of Object.entries(CYLINDER_TYPES)) {
    const saved = await m
      .getRepository(CylinderType)
      .save(m.getRepository(CylinderType).create({ tareKg: null, maxFillingRatioKgPerL: null, active: true, ...row, organisationId: org.id }));
    cylinderTypes[key] = saved.id;
  }
  const supRepo = m.getRepository(Supplier);
  const cylSupplier = await supRepo.save(
    supRepo.create({
      organisationId: org.id,
      name: 'Ormsgill Cylinder Logistics (invented)',
      orderEmail: 'orders@ormsgill.example',
      phone: '+44 1632 960 731',
      leadTimeHours: 24,
      rentalMinorPerCylinderDay: 9,
      minBulkDropKg: 0,
      currency: 'GBP',
      active: true,
    }),
  );
  const bulkSupplier = await supRepo.save(
    supRepo.create({
      organisationId: org.id,
      name: 'Thessaly Cryo Haulage (invented)',
      orderEmail: 'bulk@thessalycryo.example',
      phone: '+44 1632 960 732',
      leadTimeHours: 48,
      rentalMinorPerCylinderDay: 0,
      minBulkDropKg: 1000,
      currency: 'GBP',
      active: true,
    }),
  );
  await m.getRepository(SupplierPrice).insert([
    { supplierId: cylSupplier.id, cylinderTypeId: cylinderTypes['O2-10-200'], gasCode: null, unit: 'cylinder', priceMinor: 2600 },
    { supplierId: cylSupplier.id, cylinderTypeId: cylinderTypes['O2-50-200'], gasCode: null, unit: 'cylinder', priceMinor: 5200 },
    { supplierId: cylSupplier.id, cylinderTypeId: cylinderTypes['AIR-50-200'], gasCode: null, unit: 'cylinder', priceMinor: 4600 },
    { supplierId: bulkSupplier.id, cylinderTypeId: null, gasCode: 'O2', unit: 'kg', priceMinor: 21 },
  ]);

  const siteRepo = m.getRepository(Site);
  const sites: Site[] = [];
  for (let i = 0; i < SITE_COUNT; i++) {
    const hospital = i % 4 === 0;
    const place = HEADS[i % HEADS.length] + TAILS[Math.floor(i / HEADS.length) % TAILS.length];
    const altitudeM = 10 + Math.floor(random() * 300);
    sites.push(
      await siteRepo.save(
        siteRepo.create({
          organisationId: org.id,
          name: hospital ? `${place} General Hospital` : `${place} Community Clinic`,
          kind: hospital ? 'hospital' : 'clinic',
          address: `${1 + i} Harrow Row, ${place} (fictional)`,
          timeZone: 'Europe/London',
          referenceCode: '15C',
          unitSystem: 'metric',
          altitudeM,
          atmosphericBar: Number(standardAtmosphereBar(altitudeM).toFixed(5)),
          currency: 'GBP',
          cylinderColours: 'ISO32',
          storeTemperatureC: 10,
          beds: hospital ? 400 : 24,
        }),
      ),
    );
  }
  count('site', sites.length);

  const hash = await hashPassword(DEMO_PASSWORD);
  let facilitiesId = 0;
  for (const u of HEALTH_SYSTEM_USERS) {
    const saved = await m.getRepository(User).save(
      m.getRepository(User).create({
        organisationId: org.id,
        email: u.email,
        name: u.name,
        passwordHash: hash,
        active: true,
        failedLogins: 0,
        lockedUntil: null,
        passwordChangedAt: now,
      }),
    );
    if (u.role === 'facilities_manager') facilitiesId = saved.id;
    await m.getRepository(UserRole).insert({ userId: saved.id, role: u.role });
    await m.getRepository(UserSite).insert(sites.map((s) => ({ userId: saved.id, siteId: s.id })));
  }
  count('app_user', HEALTH_SYSTEM_USERS.length);

  const tanks: Tank[] = [];
  const siteOfTank = new Map<number, Site>();
  const wards: { id: number; siteId: number; lines: { device: OxygenDevice; patients: number }[] }[] = [];
  const cylinderSources: { id: number; full: number; perCylinderL: number }[] = [];
  const o2Cyl = compressedContents({ gas: 'O2', waterCapacityL: 10, gaugeBar: 200, temperatureC: 15, reference: '15C' }).freeGasL;
  const src = (row: Partial<SupplySource>) =>
    m
      .getRepository(SupplySource)
      .save(m.getRepository(SupplySource).create({ reorderMode: 'none', forecastBasis: 'model', modelCorrectionFactor: 1, notes: '', active: true, ...row }));

  for (const site of sites) {
    const hospital = site.kind === 'hospital';
    const capacityKg = hospital ? 10_000 : 1_500;
    const vie = await src({
      siteId: site.id,
      name: 'Bulk tank — liquid oxygen',
      type: 'bulk_liquid',
      gasCode: 'O2',
      supplierId: bulkSupplier.id,
      capacityKg,
      evaporationPercentPerDay: 0.4,
      vaporiserM3H: hospital ? 90 : 20,
      vaporiserDerating: 0.7,
      minLevelAlarmPercent: 25,
      reservePercent: 10,
      reorderMode: 'percent',
      reorderLevel: 35,
      orderUpTo: capacityKg * 0.9,
      leadTimeHours: 48,
      notes: 'Hourly telemetry (scale data).',
    });
    const secondary = await src({
      siteId: site.id,
      name: 'Oxygen secondary manifold',
      type: 'manifold',
      gasCode: 'O2',
      supplierId: cylSupplier.id,
      cylinderTypeId: cylinderTypes['O2-50-200'],
      cylindersPerBank: 6,
      regulatorLMin: 2500,
      changeoverGaugeBar: 10,
      temperatureC: 12,
    });
    const stores: number[] = [];
    for (let k = 0; k < SOURCES_PER_SITE - 2; k++) {
      const full = 10 + Math.floor(random() * 30);
      const s = await src({
        siteId: site.id,
        name: `Cylinder store ${k + 1}`,
        type: 'cylinder_store',
        gasCode: 'O2',
        supplierId: cylSupplier.id,
        cylinderTypeId: cylinderTypes['O2-10-200'],
        temperatureC: 12,
        reorderMode: 'amount',
        reorderLevel: 6,
        orderUpTo: 40,
      });
      stores.push(s.id);
      cylinderSources.push({ id: s.id, full, perCylinderL: o2Cyl });
    }
    cylinderSources.push({
      id: secondary.id,
      full: 12,
      perCylinderL: compressedContents({ gas: 'O2', waterCapacityL: 50, gaugeBar: 200, temperatureC: 15, reference: '15C' }).freeGasL,
    });
    count('supply_source', SOURCES_PER_SITE);

    let lMin = 0;
    const nWards = hospital ? WARDS_PER_HOSPITAL : WARDS_PER_CLINIC;
    for (let k = 0; k < nWards; k++) {
      const kind = WARD_KINDS[hospital ? k % WARD_KINDS.length : 0];
      const lines = kind.lines.map((l) => ({
        device: l.device,
        patients: Math.max(1, Math.round(l.patients * (0.7 + random() * 0.6) * (hospital ? 1 : 0.4))),
      }));
      const ward = await m.getRepository(Ward).save(
        m.getRepository(Ward).create({
          siteId: site.id,
          name: `${kind.name[0].toUpperCase()}${kind.name.slice(1)} ${k + 1}`,
          department: kind.department,
          beds: hospital ? kind.beds : 4,
          leakagePercent: 3,
          active: true,
        }),
      );
      await m.getRepository(TherapyLineRow).insert(
        lines.map((l) => ({
          wardId: ward.id,
          gasCode: 'O2',
          device: l.device,
          patients: l.patients,
          flowLMin: null,
          hoursJson: null,
          weekdaysJson: null,
          label: '',
        })),
      );
      await m.getRepository(WardFeed).insert([
        { wardId: ward.id, sourceId: vie.id, gasCode: 'O2', role: 'primary' },
        { wardId: ward.id, sourceId: secondary.id, gasCode: 'O2', role: 'secondary' },
      ]);
      for (const l of lines) lMin += l.patients * DEVICE_DEFAULTS[l.device].flowLMin * 1.03;
      wards.push({ id: ward.id, siteId: site.id, lines });
      count('ward', 1);
      count('therapy_line', lines.length);
      count('ward_feed', 2);
    }
    tanks.push({ id: vie.id, capacityKg, lMin: lMin * 1.05 });
    siteOfTank.set(vie.id, site);
  }
  return { organisationId: org.id, facilitiesId, bulkSupplierId: bulkSupplier.id, tanks, siteOfTank, wards, cylinderSources };
}
