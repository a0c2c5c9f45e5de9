import type { Response } from 'express';
import { In } from 'typeorm';
import { csvLine } from '@common/api/csv';
import type { ExportTable } from '@common/schemas/usage.schema';
import { cylinderTypeName } from '@common/catalogue/cylinder-type';
import { db } from '../../db/db';
import { bulkPool } from '../../db/bulk-pool';
import { CylinderType } from '../../db/entities/catalogue.entity';
import { ScheduledDelivery, SupplySource, TherapyLineRow, Ward } from '../../db/entities/supply.entity';
import { ImportFile, ImportJob, UsageReport, UsageReportLine } from '../../db/entities/usage.entity';
import { User } from '../../db/entities/user.entity';
import type { Actor } from '../../http/context';
import { getSiteFor } from '../sites/sites.service';
import { presentSource } from '../supply/supply.service';

/**
 * CSV exports of a site's tables. Every record goes through csvLine (csv-stringify), which quotes per RFC 4180 and puts
 * an apostrophe before text starting with = + - @ so a spreadsheet shows it instead of running it.
 * Readings can run to millions of rows: they stream from the database with back-pressure.
 */

async function write(res: Response, text: string): Promise<void> {
  if (!res.write(text)) await new Promise<void>((resolve) => res.once('drain', resolve));
}

const line = csvLine;

export async function exportTable(actor: Actor, siteId: number, table: ExportTable, res: Response): Promise<void> {
  const site = await getSiteFor(actor, siteId);
  const m = db().manager;
  const sources = await m.getRepository(SupplySource).find({ where: { siteId }, order: { name: 'ASC' } });
  const wards = await m.getRepository(Ward).find({ where: { siteId }, order: { name: 'ASC' } });
  const sourceName = new Map(sources.map((s) => [s.id, s.name]));
  const wardName = new Map(wards.map((w) => [w.id, w.name]));
  const safeSite = site.name
    .replace(/[^A-Za-z0-9]+/g, '-')
    .replace(/^-|-$/g, '')
    .toLowerCase();
  res.setHeader('Content-Type', 'text/csv; charset=utf-8');
  res.setHeader('Content-Disposition', `attachment; filename="${safeSite}-${table}.csv"`);
  // A BOM so spreadsheet programs read the file as UTF-8.
  await write(res, '\uFEFF');

  if (table === 'readings') {
    await write(res, line(['source', 'source_id', 'taken_at_utc', 'kind', 'value', 'detail', 'contents', 'contents_unit', 'method', 'note']));
    if (sources.length) {
      const conn = await bulkPool().getConnection();
      try {
        const stream = conn.queryStream(
          `SELECT source_id, taken_at, kind, value, detail_json, contents, method, note FROM source_reading WHERE source_id IN (${sources.map(() => '?').join(',')}) ORDER BY source_id, taken_at, id`,
          sources.map((s) => s.id),
        );
        let chunk = '';
        for await (const r of stream as AsyncIterable<{
          source_id: number;
          taken_at: Date;
          kind: string;
          value: number | null;
          detail_json: string | null;
          contents: number;
          method: string;
          note: string;
        }>) {
          const s = sources.find((x) => x.id === r.source_id)!;
          chunk += line([
            s.name,
            r.source_id,
            r.taken_at.toISOString(),
            r.kind,
            r.value,
            r.detail_json,
            r.contents,
            s.type === 'bulk_liquid' ? 'kg' : 'L free gas',
            r.method,
            r.note,
          ]);
          if (chunk.length > 64 * 1024) {
            await write(res, chunk);
            chunk = '';
          }
        }
        if (chunk) await write(res, chunk);
      } finally {
        conn.release();
      }
    }
  } else if (table === 'sources') {
    const rows = sources.map(presentSource);
    const keys = rows.length ? Object.keys(rows[0]) : ['id', 'name'];
    await write(res, line(keys));
    for (const r of rows)
      await write(
        res,
        line(
          keys.map((k) => {
            const v = (r as Record<string, unknown>)[k];
            return v !== null && typeof v === 'object' ? JSON.stringify(v) : v;
          }),
        ),
      );
  } else if (table === 'wards') {
    await write(res, line(['id', 'name', 'department', 'beds', 'leakage_percent', 'active']));
    for (const w of wards) await write(res, line([w.id, w.name, w.department, w.beds, w.leakagePercent, w.active ? 'yes' : 'no']));
  } else if (table === 'therapy_lines') {
    const lines = wards.length
      ? await m.getRepository(TherapyLineRow).find({ where: { wardId: In(wards.map((w) => w.id)) }, order: { wardId: 'ASC', id: 'ASC' } })
      : [];
    await write(res, line(['ward', 'gas', 'device', 'patients', 'flow_l_min', 'hours', 'weekdays', 'label']));
    for (const t of lines) await write(res, line([wardName.get(t.wardId), t.gasCode, t.device, t.patients, t.flowLMin, t.hoursJson, t.weekdaysJson, t.label]));
  } else if (table === 'deliveries') {
    const rows = sources.length
      ? await m.getRepository(ScheduledDelivery).find({ where: { sourceId: In(sources.map((s) => s.id)) }, order: { dueAt: 'ASC' } })
      : [];
    await write(res, line(['source', 'due_at_utc', 'kg', 'cylinders', 'status', 'reference']));
    for (const d of rows) await write(res, line([sourceName.get(d.sourceId), d.dueAt.toISOString(), d.kg, d.cylinders, d.status, d.reference]));
  } else if (table === 'usage_reports') {
    const reports = await m.getRepository(UsageReport).find({ where: { siteId }, order: { reportDate: 'ASC', wardId: 'ASC' } });
    const lines = reports.length ? await m.getRepository(UsageReportLine).find({ where: { reportId: In(reports.map((r) => r.id)) } }) : [];
    const types = await m.getRepository(CylinderType).find({ where: { organisationId: actor.user.organisationId } });
    const users = await m.getRepository(User).find({ select: { id: true, name: true }, where: { organisationId: actor.user.organisationId } });
    await write(
      res,
      line([
        'date',
        'ward',
        'line',
        'device',
        'patients_now',
        'patients_shift',
        'cylinder_type',
        'cylinders_used',
        'cylinders_returned',
        'note',
        'submitted_by',
        'submitted_at_utc',
      ]),
    );
    for (const r of reports) {
      const own = lines.filter((l) => l.reportId === r.id);
      const by = users.find((u) => u.id === r.submittedByUserId)?.name ?? '';
      if (!own.length) await write(res, line([r.reportDate, wardName.get(r.wardId), 'none', '', '', '', '', '', '', r.note, by, r.submittedAt.toISOString()]));
      for (const l of own) {
        const t = l.cylinderTypeId ? types.find((x) => x.id === l.cylinderTypeId) : undefined;
        await write(
          res,
          line([
            r.reportDate,
            wardName.get(r.wardId),
            l.lineKind,
            l.device ?? '',
            l.patientsNow,
            l.patientsShift,
            t ? `${t.gasCode} ${cylinderTypeName(t.waterCapacityL, t.fillPressureBar)}` : '',
            l.cylindersUsed,
            l.cylindersReturned,
            r.note,
            by,
            r.submittedAt.toISOString(),
          ]),
        );
      }
    }
  } else if (table === 'flow_meter_readings') {
    const rows: { ward_id: number | null; source_id: number | null; taken_at: Date; total_l: number; note: string }[] = await db().query(
      'SELECT ward_id, source_id, taken_at, total_l, note FROM flow_meter_reading WHERE site_id = ? ORDER BY ward_id, source_id, taken_at',
      [siteId],
    );
    await write(res, line(['ward', 'source', 'taken_at_utc', 'total_l', 'note']));
    for (const r of rows)
      await write(
        res,
        line([
          r.ward_id ? wardName.get(r.ward_id) : '',
          r.source_id ? sourceName.get(r.source_id) : '',
          new Date(r.taken_at).toISOString(),
          Number(r.total_l),
          r.note,
        ]),
      );
  } else if (table === 'usage_history') {
    const rows: { ward_id: number; gas_code: string; usage_date: string; volume_l: number; note: string }[] = await db().query(
      'SELECT ward_id, gas_code, usage_date, volume_l, note FROM usage_history WHERE site_id = ? ORDER BY usage_date, ward_id, gas_code',
      [siteId],
    );
    await write(res, line(['date', 'ward', 'gas', 'volume', 'unit', 'note']));
    for (const r of rows) await write(res, line([r.usage_date, wardName.get(r.ward_id), r.gas_code, Number(r.volume_l), 'L', r.note]));
  } else if (table === 'imports') {
    const jobs = await m.getRepository(ImportJob).find({ where: { siteId }, order: { id: 'ASC' } });
    const files = jobs.length ? await m.getRepository(ImportFile).find({ where: { id: In(jobs.map((j) => j.fileId)) } }) : [];
    await write(res, line(['id', 'kind', 'file', 'sha256', 'status', 'rows', 'inserted', 'errors', 'message', 'created_at_utc', 'finished_at_utc']));
    for (const j of jobs) {
      const f = files.find((x) => x.id === j.fileId);
      await write(
        res,
        line([
          j.id,
          j.kind,
          f?.originalName ?? '',
          f?.sha256 ?? '',
          j.status,
          j.totalRows,
          j.insertedRows,
          j.errorCount,
          j.message,
          j.createdAt.toISOString(),
          j.finishedAt?.toISOString() ?? '',
        ]),
      );
    }
  }
  res.end();
}
