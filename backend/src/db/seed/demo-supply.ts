import type { EntityManager } from 'typeorm';
import { DateTime } from 'luxon';
import { compressedContents } from '@common/gas/contents';
import { freeGasLitresPerKg } from '@common/gas/reference-conditions';
import { Scenario, ScheduledDelivery, SourceReading, SupplySource, TherapyLineRow, Ward, WardFeed } from '../entities/supply.entity';
import { UserWard } from '../entities/ward-grant.entity';
import type { FoundationIds } from './demo-foundation';

/** A small seeded generator (mulberry32), so the demo is the same on every machine. */
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

const DAY = [8, 9, 10, 11, 12, 13, 14, 15, 16, 17];
const WEEKDAYS = [1, 2, 3, 4, 5];

interface WardSpec {
  name: string;
  department: string;
  beds: number;
  leakagePercent?: number;
  lines: { gas: string; device: string; patients: number; flow?: number; hours?: number[]; weekdays?: number[]; label?: string }[];
}

/** The demo hospital's wards and their demand model (invented numbers, plausible for a 350-bed acute site). */
const HOSPITAL_WARDS: WardSpec[] = [
  {
    name: 'Heron Ward (acute medicine)',
    department: 'ward',
    beds: 30,
    leakagePercent: 3,
    lines: [
      { gas: 'O2', device: 'nasal_cannula', patients: 6 },
      { gas: 'O2', device: 'simple_mask', patients: 2 },
      { gas: 'O2', device: 'non_rebreather', patients: 1 },
    ],
  },
  {
    name: 'Kestrel Ward (respiratory)',
    department: 'ward',
    beds: 28,
    leakagePercent: 3,
    lines: [
      { gas: 'O2', device: 'nasal_cannula', patients: 9 },
      { gas: 'O2', device: 'venturi_35', patients: 4 },
      { gas: 'O2', device: 'hfno', patients: 1 },
      { gas: 'O2', device: 'cpap', patients: 1 },
    ],
  },
  {
    name: 'Linnet Ward (general surgery)',
    department: 'ward',
    beds: 28,
    leakagePercent: 3,
    lines: [
      { gas: 'O2', device: 'nasal_cannula', patients: 5 },
      { gas: 'O2', device: 'simple_mask', patients: 2 },
    ],
  },
  {
    name: 'Merlin Ward (older people)',
    department: 'ward',
    beds: 30,
    leakagePercent: 3,
    lines: [
      { gas: 'O2', device: 'nasal_cannula', patients: 7 },
      { gas: 'O2', device: 'simple_mask', patients: 1 },
    ],
  },
  { name: 'Osprey Ward (orthopaedics)', department: 'ward', beds: 28, leakagePercent: 3, lines: [{ gas: 'O2', device: 'nasal_cannula', patients: 3 }] },
  {
    name: 'Plover Ward (cardiology)',
    department: 'ward',
    beds: 24,
    leakagePercent: 3,
    lines: [
      { gas: 'O2', device: 'nasal_cannula', patients: 5 },
      { gas: 'O2', device: 'simple_mask', patients: 1 },
    ],
  },
  {
    name: 'Wren Ward (children)',
    department: 'ward',
    beds: 20,
    leakagePercent: 3,
    lines: [
      { gas: 'O2', device: 'nasal_cannula', patients: 3, flow: 1 },
      { gas: 'O2', device: 'hfno', patients: 1, flow: 15, label: 'Paediatric high-flow (O2 share)' },
    ],
  },
  {
    name: 'Critical Care Unit',
    department: 'critical_care',
    beds: 16,
    leakagePercent: 3,
    lines: [
      { gas: 'O2', device: 'ventilator', patients: 9 },
      { gas: 'O2', device: 'hfno', patients: 2 },
      { gas: 'AIR', device: 'custom', patients: 9, flow: 4, label: 'Ventilators (air share)' },
    ],
  },
  {
    name: 'Emergency Department',
    department: 'emergency',
    beds: 30,
    leakagePercent: 3,
    lines: [
      { gas: 'O2', device: 'simple_mask', patients: 4 },
      { gas: 'O2', device: 'non_rebreather', patients: 2 },
      { gas: 'O2', device: 'nasal_cannula', patients: 4, hours: [10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 20, 21, 22], label: 'Evening peak, nasal cannula' },
    ],
  },
  {
    name: 'Theatres 1–6',
    department: 'theatre',
    beds: 6,
    leakagePercent: 3,
    lines: [
      { gas: 'O2', device: 'theatre', patients: 6, flow: 6, hours: DAY, weekdays: WEEKDAYS, label: 'Anaesthesia, fresh gas O2 (6 sessions)' },
      { gas: 'AIR', device: 'theatre', patients: 6, flow: 5, hours: DAY, weekdays: WEEKDAYS, label: 'Anaesthesia, fresh gas air (6 sessions)' },
    ],
  },
  {
    name: 'Recovery',
    department: 'recovery',
    beds: 12,
    leakagePercent: 3,
    lines: [{ gas: 'O2', device: 'simple_mask', patients: 5, hours: [9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19], weekdays: WEEKDAYS }],
  },
  {
    name: 'Maternity Suite',
    department: 'maternity',
    beds: 14,
    leakagePercent: 3,
    lines: [
      { gas: 'O2', device: 'nasal_cannula', patients: 1 },
      { gas: 'N2O_O2_50', device: 'custom', patients: 0.5, flow: 8, label: 'Labour analgesia (women using gas × mean flow)' },
    ],
  },
  {
    name: 'Portering & transfers',
    department: 'other',
    beds: 0,
    lines: [
      { gas: 'O2', device: 'custom', patients: 2, flow: 4, hours: [8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19], label: 'Transfers on portable cylinders' },
    ],
  },
];

const CLINIC_WARDS: WardSpec[] = [
  {
    name: 'Day ward',
    department: 'day_unit',
    beds: 16,
    leakagePercent: 2,
    lines: [{ gas: 'O2', device: 'nasal_cannula', patients: 3, hours: [8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18], weekdays: WEEKDAYS }],
  },
  {
    name: 'Procedure rooms',
    department: 'theatre',
    beds: 4,
    leakagePercent: 2,
    lines: [{ gas: 'O2', device: 'custom', patients: 2, flow: 4, hours: DAY, weekdays: WEEKDAYS, label: 'Sedation, O2 via mask' }],
  },
];

async function addWards(m: EntityManager, siteId: number, specs: WardSpec[]): Promise<Map<string, Ward>> {
  const out = new Map<string, Ward>();
  for (const w of specs) {
    const ward = await m
      .getRepository(Ward)
      .save(
        m.getRepository(Ward).create({ siteId, name: w.name, department: w.department, beds: w.beds, leakagePercent: w.leakagePercent ?? 0, active: true }),
      );
    out.set(w.name, ward);
    for (const l of w.lines) {
      await m.getRepository(TherapyLineRow).insert({
        wardId: ward.id,
        gasCode: l.gas,
        device: l.device,
        patients: l.patients,
        flowLMin: l.flow ?? null,
        hoursJson: l.hours ? JSON.stringify(l.hours) : null,
        weekdaysJson: l.weekdays ? JSON.stringify(l.weekdays) : null,
        label: l.label ?? '',
      });
    }
  }
  return out;
}

/** Mean modelled demand of ward specs for one gas, L/min of free gas (for simulating the history). */
function meanFlow(specs: WardSpec[], gas: string, flows: Record<string, number>): number {
  let sum = 0;
  for (const w of specs) {
    for (const l of w.lines) {
      if (l.gas !== gas) continue;
      const flow = l.flow ?? flows[l.device] ?? 0;
      sum += l.patients * flow * (1 + (w.leakagePercent ?? 0) / 100) * ((l.hours?.length ?? 24) / 24) * ((l.weekdays?.length ?? 7) / 7);
    }
  }
  return sum;
}

const FLOWS = { nasal_cannula: 2, simple_mask: 6, non_rebreather: 15, venturi_35: 8, hfno: 40, cpap: 30, ventilator: 6 };

/**
 * The demo supply model: a 10-tonne liquid-oxygen tank with 60 days of hourly telemetry (refills
 * included), manifolds, cylinder stores, wards with their therapy lines, two scenarios and a delivery.
 */
export async function seedSupply(m: EntityManager, ids: FoundationIds, now = new Date()): Promise<void> {
  const random = rng(20270104);
  const hospitalWards = await addWards(m, ids.hospitalId, HOSPITAL_WARDS);
  const clinicWards = await addWards(m, ids.clinicId, CLINIC_WARDS);
  // The demo ward lead reports for the hospital's inpatient wards (the report screen, its browser
  // journeys and the ward screens open on these); departments report through facilities.
  const wardLead = ids.userIds['ward@plenum.example'];
  if (wardLead) {
    const inpatient = [...hospitalWards.values()].filter((w) => w.department === 'ward');
    if (inpatient.length) await m.getRepository(UserWard).insert(inpatient.map((w) => ({ userId: wardLead, wardId: w.id })));
  }
  const src = (row: Partial<SupplySource>) =>
    m
      .getRepository(SupplySource)
      .save(m.getRepository(SupplySource).create({ reorderMode: 'none', forecastBasis: 'model', modelCorrectionFactor: 1, notes: '', active: true, ...row }));

  const vie = await src({
    siteId: ids.hospitalId,
    name: 'Main VIE — liquid oxygen',
    type: 'bulk_liquid',
    gasCode: 'O2',
    supplierId: ids.supplierIds.bulk,
    capacityKg: 10_000,
    evaporationPercentPerDay: 0.4,
    vaporiserM3H: 90,
    vaporiserDerating: 0.7,
    minLevelAlarmPercent: 25,
    reservePercent: 10,
    reorderMode: 'percent',
    reorderLevel: 35,
    orderUpTo: 9000,
    leadTimeHours: 48,
    notes: 'Telemetry every hour from the tank’s level gauge.',
  });
  const o2Secondary = await src({
    siteId: ids.hospitalId,
    name: 'Oxygen secondary manifold',
    type: 'manifold',
    gasCode: 'O2',
    supplierId: ids.supplierIds.cylinders,
    cylinderTypeId: ids.cylinderTypes['O2-50-200'],
    cylindersPerBank: 6,
    regulatorLMin: 2500,
    changeoverGaugeBar: 10,
    temperatureC: 12,
    notes: 'Automatic secondary supply to the VIE.',
  });
  const air = await src({
    siteId: ids.hospitalId,
    name: 'Medical air manifold',
    type: 'manifold',
    gasCode: 'AIR',
    supplierId: ids.supplierIds.cylinders,
    cylinderTypeId: ids.cylinderTypes['AIR-50-200'],
    cylindersPerBank: 6,
    regulatorLMin: 1500,
    changeoverGaugeBar: 10,
    temperatureC: 12,
    reorderMode: 'amount',
    reorderLevel: 8,
    orderUpTo: 22,
  });
  const entonox = await src({
    siteId: ids.hospitalId,
    name: 'Maternity 50:50 store',
    type: 'cylinder_store',
    gasCode: 'N2O_O2_50',
    supplierId: ids.supplierIds.cylinders,
    cylinderTypeId: ids.cylinderTypes['N2O_O2_50-10-137'],
    temperatureC: 16,
    reorderMode: 'amount',
    reorderLevel: 4,
    orderUpTo: 14,
    notes: 'Kept above 10 °C (mixture separates in the cold).',
  });
  const portable = await src({
    siteId: ids.hospitalId,
    name: 'Portable oxygen store (2 L · 230 bar)',
    type: 'cylinder_store',
    gasCode: 'O2',
    supplierId: ids.supplierIds.cylinders,
    cylinderTypeId: ids.cylinderTypes['O2-2-230'],
    temperatureC: 6,
    reorderMode: 'days',
    reorderLevel: 2,
    orderUpTo: 50,
    notes: 'Outdoor store: readings are corrected for its temperature.',
  });
  const reserve = await src({
    siteId: ids.hospitalId,
    name: 'Emergency reserve (oxygen)',
    type: 'emergency_reserve',
    gasCode: 'O2',
    supplierId: ids.supplierIds.cylinders,
    cylinderTypeId: ids.cylinderTypes['O2-50-200'],
    cylindersPerBank: 6,
    temperatureC: 12,
    backsUpJson: JSON.stringify([vie.id, o2Secondary.id]),
    notes: 'Emergency reserve manifold at the main risers.',
  });
  const clinicO2 = await src({
    siteId: ids.clinicId,
    name: 'Clinic oxygen manifold',
    type: 'manifold',
    gasCode: 'O2',
    supplierId: ids.supplierIds.cylinders,
    cylinderTypeId: ids.cylinderTypes['O2-47-137'],
    cylindersPerBank: 2,
    regulatorLMin: 600,
    changeoverGaugeBar: 8,
    temperatureC: 14,
    reorderMode: 'amount',
    reorderLevel: 2,
    orderUpTo: 6,
  });

  const feed = (wardId: number, sourceId: number, gasCode: string, role: string) => m.getRepository(WardFeed).insert({ wardId, sourceId, gasCode, role });
  for (const [name, w] of hospitalWards) {
    if (name === 'Portering & transfers') {
      await feed(w.id, portable.id, 'O2', 'primary');
      continue;
    }
    await feed(w.id, vie.id, 'O2', 'primary');
    await feed(w.id, o2Secondary.id, 'O2', 'secondary');
  }
  await feed(hospitalWards.get('Critical Care Unit')!.id, air.id, 'AIR', 'primary');
  await feed(hospitalWards.get('Theatres 1–6')!.id, air.id, 'AIR', 'primary');
  await feed(hospitalWards.get('Maternity Suite')!.id, entonox.id, 'N2O_O2_50', 'primary');
  for (const w of clinicWards.values()) await feed(w.id, clinicO2.id, 'O2', 'primary');

  // 60 days of hourly tank telemetry, simulated backwards from today's level so the demo always starts
  // in the same place: use = modelled mean × 1.08 (the wards use a little more than modelled, for the
  // reconciliation screen) with day-to-day variation; a tanker refill to ~90 % when the level was ~37 %.
  const kgPerL = 1 / freeGasLitresPerKg('O2', '15C');
  const lMinVie =
    meanFlow(
      HOSPITAL_WARDS.filter((w) => w.name !== 'Portering & transfers'),
      'O2',
      FLOWS,
    ) * 1.08;
  const hours = 60 * 24;
  const endMs = DateTime.fromJSDate(now).startOf('hour').toMillis();
  let kg = 6240;
  let dayFactor = 1;
  const rows: Partial<SourceReading>[] = [];
  for (let h = 0; h < hours; h++) {
    const takenAt = new Date(endMs - h * 3_600_000 - 7 * 60_000);
    const percent = Math.round((kg / 10_000) * 1000) / 10;
    rows.push({
      sourceId: vie.id,
      takenAt,
      kind: 'level_percent',
      value: percent,
      detailJson: null,
      contents: (percent / 100) * 10_000,
      method: 'telemetry',
      takenByUserId: null,
      note: '',
    });
    if (h % 24 === 0) dayFactor = Math.max(0.6, 1 + 0.15 * (random() * 2 - 1));
    const hourOfDay = takenAt.getUTCHours();
    const diurnal = hourOfDay >= 8 && hourOfDay < 20 ? 1.12 : 0.88;
    kg += Math.max(lMinVie * 60 * dayFactor * diurnal * kgPerL, (0.004 * 10_000) / 24);
    if (kg > 8950) kg = 3650 + random() * 150; // before the tanker came
  }
  rows.reverse();
  for (let i = 0; i < rows.length; i += 500) await m.getRepository(SourceReading).insert(rows.slice(i, i + 500));

  // Cylinder sources: the latest round's readings.
  const ago = (hoursAgo: number) => new Date(now.getTime() - hoursAgo * 3_600_000);
  const reading = async (sourceId: number, takenAt: Date, kind: string, detail: Record<string, unknown>, contents: number, method = 'manual', note = '') =>
    m.getRepository(SourceReading).insert({
      sourceId,
      takenAt,
      kind,
      value: null,
      detailJson: JSON.stringify(detail),
      contents,
      method,
      takenByUserId: ids.userIds['facilities@plenum.example'],
      note,
    });
  const bank = (gas: 'O2' | 'AIR', wc: number, n: number, duty: number, standby: number, spare: number, fill: number, t: number) =>
    n *
      (compressedContents({ gas, waterCapacityL: wc, gaugeBar: duty, temperatureC: t, reference: '15C' }).freeGasL +
        compressedContents({ gas, waterCapacityL: wc, gaugeBar: standby, temperatureC: t, reference: '15C' }).freeGasL) +
    spare * compressedContents({ gas, waterCapacityL: wc, gaugeBar: fill, temperatureC: 15, reference: '15C' }).freeGasL;
  await reading(
    reserve.id,
    ago(48),
    'store_count',
    { full: 12, inUseGaugeBar: [], empty: 0 },
    12 * compressedContents({ gas: 'O2', waterCapacityL: 50, gaugeBar: 200, temperatureC: 15, reference: '15C' }).freeGasL,
    'manual',
    'Weekly reserve check',
  );
  await reading(o2Secondary.id, ago(20), 'bank_gauges', { dutyBar: 196, standbyBar: 198, spareFull: 6 }, bank('O2', 50, 6, 196, 198, 6, 200, 12));
  await reading(air.id, ago(30), 'bank_gauges', { dutyBar: 180, standbyBar: 194, spareFull: 10 }, bank('AIR', 50, 6, 180, 194, 10, 200, 12));
  await reading(air.id, ago(6), 'bank_gauges', { dutyBar: 121, standbyBar: 194, spareFull: 10 }, bank('AIR', 50, 6, 121, 194, 10, 200, 12));
  const entonoxFull = compressedContents({ gas: 'N2O_O2_50', waterCapacityL: 10, gaugeBar: 137, temperatureC: 15, reference: '15C' }).freeGasL;
  const entonoxInUse = [95, 40].reduce(
    (s, g) => s + compressedContents({ gas: 'N2O_O2_50', waterCapacityL: 10, gaugeBar: g, temperatureC: 16, reference: '15C' }).freeGasL,
    0,
  );
  await reading(entonox.id, ago(9), 'store_count', { full: 13, inUseGaugeBar: [95, 40], empty: 3 }, 13 * entonoxFull + entonoxInUse);
  const portFull = compressedContents({ gas: 'O2', waterCapacityL: 2, gaugeBar: 230, temperatureC: 15, reference: '15C' }).freeGasL;
  const portInUse = [180, 120, 60].reduce(
    (s, g) => s + compressedContents({ gas: 'O2', waterCapacityL: 2, gaugeBar: g, temperatureC: 6, reference: '15C' }).freeGasL,
    0,
  );
  await reading(
    portable.id,
    ago(4),
    'store_count',
    { full: 34, inUseGaugeBar: [180, 120, 60], empty: 11 },
    34 * portFull + portInUse,
    'manual',
    'Morning round; store at 6 °C',
  );
  await reading(clinicO2.id, ago(26), 'bank_gauges', { dutyBar: 88, standbyBar: 135, spareFull: 2 }, bank('O2', 47, 2, 88, 135, 2, 137, 14));

  // A scheduled cylinder delivery for the clinic, and two named scenarios at the hospital.
  const local = DateTime.fromJSDate(now, { zone: 'Europe/London' });
  await m.getRepository(ScheduledDelivery).insert({
    sourceId: clinicO2.id,
    dueAt: local.plus({ days: 3 }).set({ hour: 10, minute: 0 }).toJSDate(),
    kg: null,
    cylinders: 4,
    status: 'scheduled',
    reference: 'Standing weekly order',
  });
  const monday = local.plus({ weeks: 1 }).startOf('week').toFormat("yyyy-MM-dd'T'HH:mm");
  await m.getRepository(Scenario).insert({
    siteId: ids.hospitalId,
    name: 'Winter respiratory surge',
    multiplier: 1.2,
    extraPatients: 8,
    extraFlowLMin: 40,
    wardId: null,
    wardChange: null,
    fromLocal: monday,
    untilLocal: null,
    note: '20 % more oxygen use and eight extra high-flow patients from next Monday.',
  });
  await m.getRepository(Scenario).insert({
    siteId: ids.hospitalId,
    name: 'Linnet Ward closed for refurbishment',
    multiplier: 1,
    extraPatients: 0,
    extraFlowLMin: 0,
    wardId: hospitalWards.get('Linnet Ward (general surgery)')!.id,
    wardChange: 'close',
    fromLocal: local.plus({ days: 10 }).startOf('day').toFormat("yyyy-MM-dd'T'HH:mm"),
    untilLocal: null,
    note: '',
  });
}
