import type { EntityManager } from 'typeorm';
import { DateTime } from 'luxon';
import { DEVICE_DEFAULTS, type OxygenDevice } from '@common/forecast/demand-model';
import { TherapyLineRow, Ward } from '../entities/supply.entity';
import { FlowMeterReading, UsageReport, UsageReportLine } from '../entities/usage.entity';
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

/**
 * How each demo ward's reports run against its model (invented): the respiratory ward is busier than
 * modelled, surgery quieter; wards not listed report about what the model says.
 */
const WARD_BIAS: Record<string, number> = {
  'Kestrel Ward (respiratory)': 1.25,
  'Linnet Ward (general surgery)': 0.75,
  'Heron Ward (acute medicine)': 1.1,
};

/** Wards whose lead has not filed yesterday's report (so the status board shows a gap). */
const MISSED_YESTERDAY = new Set(['Osprey Ward (orthopaedics)', 'Recovery']);

/**
 * The demo's usage reports: the last six days (not today, so the ward lead's screen opens on a draft
 * prefilled from yesterday) for every ward of the hospital with oxygen lines, with patients on each
 * device near the model (biased on some wards for the reconciliation screen), portable cylinders
 * changed and returned, and three weeks of daily flow-meter totals on the critical care branch.
 */
export async function seedUsage(m: EntityManager, ids: FoundationIds, now = new Date()): Promise<void> {
  const random = rng(20270201);
  const wards = await m.getRepository(Ward).find({ where: { siteId: ids.hospitalId }, order: { name: 'ASC' } });
  const therapy = await m.getRepository(TherapyLineRow).find();
  const wardLead = ids.userIds['ward@plenum.example'] ?? null;
  const facilities = ids.userIds['facilities@plenum.example'] ?? null;
  const today = DateTime.fromJSDate(now, { zone: 'Europe/London' }).startOf('day');
  const portable = ids.cylinderTypes['O2-2-230'];
  const wardSize = ids.cylinderTypes['O2-10-200'];

  for (let back = 6; back >= 1; back--) {
    const day = today.minus({ days: back });
    for (const w of wards) {
      const lines = therapy.filter((t) => t.wardId === w.id && t.gasCode === 'O2' && t.device in DEVICE_DEFAULTS);
      if (!lines.length) continue;
      if (back === 1 && MISSED_YESTERDAY.has(w.name)) continue;
      const bias = WARD_BIAS[w.name] ?? 1;
      const byDevice = new Map<string, number>();
      for (const l of lines) byDevice.set(l.device, (byDevice.get(l.device) ?? 0) + l.patients);
      // Filed during the late shift, between 18:00 and 21:00 local.
      const filedAt = day.plus({ hours: 18, minutes: Math.floor(random() * 180) }).toJSDate();
      // The ward lead is granted the inpatient wards (demo-supply); departments are filed by facilities.
      const byFacilities = (back === 4 && w.name.startsWith('Merlin')) || w.department !== 'ward';
      const report = await m.getRepository(UsageReport).save(
        m.getRepository(UsageReport).create({
          siteId: ids.hospitalId,
          wardId: w.id,
          reportDate: day.toISODate()!,
          note: back === 3 && w.name.startsWith('Kestrel') ? 'Two admissions on high flow overnight' : '',
          submittedByUserId: byFacilities ? facilities : wardLead,
          submittedAt: filedAt,
          updatedByUserId: byFacilities ? facilities : wardLead,
        }),
      );
      const rows: Partial<UsageReportLine>[] = [];
      for (const [device, modelled] of byDevice) {
        const count = Math.max(0, Math.round(modelled * bias * (0.85 + random() * 0.3)));
        const shift = count + (random() < 0.5 ? 1 : 0) + (modelled >= 4 ? Math.round(random() * 2) : 0);
        rows.push({
          reportId: report.id,
          lineKind: 'device',
          device: device as OxygenDevice,
          patientsNow: count,
          patientsShift: shift,
          cylinderTypeId: null,
          cylindersUsed: null,
          cylindersReturned: null,
        });
      }
      const used = Math.floor(random() * 4);
      rows.push({
        reportId: report.id,
        lineKind: 'cylinder',
        device: null,
        patientsNow: null,
        patientsShift: null,
        cylinderTypeId: portable,
        cylindersUsed: used,
        cylindersReturned: Math.max(0, used - (random() < 0.3 ? 1 : 0)),
      });
      if (w.department === 'critical_care' || w.department === 'emergency') {
        const big = random() < 0.5 ? 1 : 0;
        rows.push({
          reportId: report.id,
          lineKind: 'cylinder',
          device: null,
          patientsNow: null,
          patientsShift: null,
          cylinderTypeId: wardSize,
          cylindersUsed: big,
          cylindersReturned: big,
        });
      }
      await m.getRepository(UsageReportLine).insert(rows);
    }
  }

  // Critical care has a flow meter on its oxygen branch, read every morning: a running total of free
  // gas, about 3 % below its model (the ventilators' bias flow is lower than the default).
  const icu = wards.find((w) => w.department === 'critical_care');
  if (icu) {
    const perDayL =
      therapy
        .filter((t) => t.wardId === icu.id && t.gasCode === 'O2')
        .reduce((s, t) => s + t.patients * (t.flowLMin ?? DEVICE_DEFAULTS[t.device as OxygenDevice]?.flowLMin ?? 0), 0) *
      1440 *
      (1 + icu.leakagePercent / 100) *
      0.97;
    let total = 4_812_000;
    const rows: Partial<FlowMeterReading>[] = [];
    for (let back = 21; back >= 0; back--) {
      rows.push({
        siteId: ids.hospitalId,
        wardId: icu.id,
        sourceId: null,
        takenAt: today.minus({ days: back }).plus({ hours: 7, minutes: 30 }).toJSDate(),
        totalL: Math.round(total),
        note: '',
        importJobId: null,
      });
      total += perDayL * (0.9 + random() * 0.2);
    }
    await m.getRepository(FlowMeterReading).insert(rows);
  }
}
