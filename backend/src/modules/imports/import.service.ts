import { unlink } from 'node:fs/promises';
import { In, type EntityManager } from 'typeorm';
import { DateTime } from 'luxon';
import {
  IMPORT_COLUMNS,
  IMPORT_KIND_LABELS,
  type ImportKind,
  type ImportOptions,
  type ImportRemap,
  type ImportRowError,
  type ImportStatus,
} from '@common/schemas/usage.schema';
import { toCsv } from '@common/api/csv';
import { db } from '../../db/db';
import { env } from '../../config/env';
import { SupplySource, Ward } from '../../db/entities/supply.entity';
import { ImportFile, ImportJob } from '../../db/entities/usage.entity';
import type { Actor } from '../../http/context';
import { AppError, badRequest, notFound } from '../../errors/app-error';
import { recordAudit, whoOf } from '../audit/audit.service';
import { getSiteFor } from '../sites/sites.service';
import { inspectCsvFile } from './csv-file';
import { unitsAccepted } from './import-rows';
import { wakeImportWorker } from './import-runner';
import { fileStore, uploadKey } from '../../storage/file-store';
import type { ImportJobView } from '@common/schemas/usage.schema';

/** What is stored in import_job.options_json. */
export interface JobOptions {
  sourceId: number | null;
  wardId: number | null;
  unit: string | null;
  /** A unit read from a header such as "Level (%)". */
  headerUnit: string | null;
  dateOrder: 'ymd' | 'dmy' | 'mdy';
  separator: ',' | ';';
  /** Canonical column key → header text. */
  mapping: Record<string, string>;
}

export interface JobPreview {
  rows: Record<string, unknown>[];
  firstAt: string | null;
  lastAt: string | null;
  targets: { id: number; name: string; rows: number }[];
  /** Highest row id of the target table when the check compared with stored rows: later rows were not compared. */
  checkedUpToId?: number;
}

const SOURCE_TYPES_FOR: Partial<Record<ImportKind, string[]>> = {
  tank_readings: ['bulk_liquid'],
  store_counts: ['cylinder_store', 'emergency_reserve'],
  flow_meter_totals: ['bulk_liquid', 'manifold', 'cylinder_store', 'emergency_reserve'],
};

export const FINAL_STATUSES: ImportStatus[] = ['done', 'cancelled'];

// ---------- presenters ----------

export function presentJob(job: ImportJob, file: ImportFile | null): ImportJobView {
  const options = JSON.parse(job.optionsJson) as JobOptions;
  const status = job.status as ImportStatus;
  const total = job.totalRows ?? (file ? Math.max(0, file.lineCount - 1) : null);
  return {
    id: job.id,
    siteId: job.siteId,
    kind: job.kind as ImportKind,
    kindLabel: IMPORT_KIND_LABELS[job.kind as ImportKind],
    status,
    phase: status === 'validating' ? 'check' : status === 'queued' || status === 'running' ? 'import' : null,
    file: file ? { name: file.originalName, sizeBytes: Number(file.sizeBytes), sha256: file.sha256, lines: file.lineCount } : null,
    options: {
      sourceId: options.sourceId,
      wardId: options.wardId,
      unit: options.unit,
      headerUnit: options.headerUnit,
      dateOrder: options.dateOrder,
      separator: options.separator,
    },
    mapping: options.mapping,
    columns: IMPORT_COLUMNS[job.kind as ImportKind],
    header: job.headerJson ? (JSON.parse(job.headerJson) as string[]) : [],
    sample: job.sampleJson ? (JSON.parse(job.sampleJson) as string[][]) : [],
    totalRows: total,
    processedRows: job.processedRows,
    insertedRows: job.insertedRows,
    progress: total ? Math.min(1, job.processedRows / total) : status === 'done' ? 1 : 0,
    errorCount: job.errorCount,
    errors: job.errorsJson ? (JSON.parse(job.errorsJson) as ImportRowError[]) : [],
    preview: job.previewJson ? (JSON.parse(job.previewJson) as ImportJobView['preview']) : null,
    message: job.message,
    cancelRequested: job.cancelRequested,
    confirmDuplicate: job.confirmDuplicate,
    canCommit: status === 'ready',
    canCancel: !FINAL_STATUSES.includes(status),
    canRemap: ['mapping', 'ready', 'invalid', 'failed'].includes(status),
    createdAt: job.createdAt.toISOString(),
    startedAt: job.startedAt?.toISOString() ?? null,
    finishedAt: job.finishedAt?.toISOString() ?? null,
  };
}

// ---------- look-ups ----------

export async function jobFor(actor: Actor, id: number, m: EntityManager = db().manager): Promise<ImportJob> {
  const j = await m.getRepository(ImportJob).findOneBy({ id });
  if (!j || j.organisationId !== actor.user.organisationId || !actor.user.siteIds.includes(j.siteId)) throw notFound('Upload');
  return j;
}

async function present(m: EntityManager, job: ImportJob) {
  return presentJob(job, await m.getRepository(ImportFile).findOneBy({ id: job.fileId }));
}

// ---------- mapping ----------

const norm = (h: string) =>
  h
    .toLowerCase()
    .replace(/\(.*?\)|\[.*?\]/g, '')
    .replace(/[^a-z0-9%³]+/g, '_')
    .replace(/^_+|_+$/g, '');

/** A unit written in a header, e.g. "Level (%)" or "Total [m3]". */
function unitInHeader(h: string): string | null {
  const m = /[([]\s*([^)\]]+?)\s*[)\]]/.exec(h);
  return m ? m[1] : null;
}

/** The unit written in the header of the measured column of a mapping ("Level (%)" → "%"). */
export function headerUnitOf(mapping: Record<string, string>): string | null {
  const h = mapping.level ?? mapping.total ?? mapping.volume;
  return h ? unitInHeader(h) : null;
}

/** Matches the file's headers to the kind's columns by name and known aliases. */
export function autoMap(kind: ImportKind, header: string[]): { mapping: Record<string, string>; headerUnit: string | null } {
  const mapping: Record<string, string> = {};
  const taken = new Set<number>();
  let headerUnit: string | null = null;
  for (const col of IMPORT_COLUMNS[kind]) {
    const names = [col.key, ...col.aliases];
    const i = header.findIndex((h, k) => !taken.has(k) && names.includes(norm(h)));
    if (i >= 0) {
      mapping[col.key] = header[i];
      taken.add(i);
      if (col.key === 'level' || col.key === 'total' || col.key === 'volume') headerUnit = unitInHeader(header[i]);
    }
  }
  return { mapping, headerUnit };
}

/** What still has to be chosen before the rows can be checked (empty: ready to check). */
export function missingChoices(kind: ImportKind, options: JobOptions, header: string[]): string[] {
  const out: string[] = [];
  const cols = IMPORT_COLUMNS[kind];
  const mapped = (key: string) => options.mapping[key] !== undefined && header.includes(options.mapping[key]);
  const missing = cols.filter((c) => c.required && !mapped(c.key)).map((c) => c.label);
  if (missing.length) out.push(`Match ${missing.length === 1 ? 'this column' : 'these columns'} to the file’s headers: ${missing.join(', ')}`);
  for (const [key, h] of Object.entries(options.mapping)) {
    if (!cols.some((c) => c.key === key)) out.push(`“${key}” is not a column of this kind of upload`);
    else if (!header.includes(h)) out.push(`The file has no column “${h}”`);
  }
  const hasUnit = mapped('unit') || !!options.unit || !!options.headerUnit;
  if (kind === 'tank_readings') {
    if (!mapped('source') && !options.sourceId) out.push('Choose the tank these readings belong to');
    if (!hasUnit) out.push(`Choose the unit of the readings: ${unitsAccepted(kind, null)}`);
  } else if (kind === 'store_counts') {
    if (!mapped('source') && !options.sourceId) out.push('Choose the cylinder store these counts belong to');
  } else if (kind === 'flow_meter_totals') {
    if (!options.wardId && !options.sourceId) out.push('Choose the ward (or the source) the meter measures');
    if (!hasUnit) out.push('Choose the unit of the meter totals: L or m3 of free gas');
  } else if (kind === 'historic_usage') {
    if (!hasUnit) out.push('Choose the unit of the volumes: L or m3 of free gas');
  }
  return out;
}

async function checkTargets(m: EntityManager, siteId: number, kind: ImportKind, sourceId: number | null | undefined, wardId: number | null | undefined) {
  if (sourceId) {
    const s = await m.getRepository(SupplySource).findOneBy({ id: sourceId, siteId });
    const types = SOURCE_TYPES_FOR[kind];
    if (!s) throw badRequest('The chosen source is not on this site', [{ path: 'sourceId', message: 'choose a source of this site' }]);
    if (!types || !types.includes(s.type))
      throw badRequest(`${IMPORT_KIND_LABELS[kind]} cannot go to a ${s.type.replace('_', ' ')}`, [
        { path: 'sourceId', message: `choose a ${(types ?? []).map((t) => t.replace('_', ' ')).join(' or ')}` },
      ]);
  }
  if (wardId) {
    if (kind !== 'flow_meter_totals')
      throw badRequest('Only flow-meter totals are uploaded for a ward', [{ path: 'wardId', message: 'not used for this kind' }]);
    if (!(await m.getRepository(Ward).findOneBy({ id: wardId, siteId })))
      throw badRequest('The chosen ward is not on this site', [{ path: 'wardId', message: 'choose a ward of this site' }]);
  }
  if (sourceId && wardId) throw badRequest('Choose a ward or a source for the meter, not both', [{ path: 'wardId', message: 'one target' }]);
}

/** The last completed import of the same bytes at a site, if any. */
async function earlierImportOf(siteId: number, sha256: string, exceptJobId?: number) {
  const rows: { id: number; finished_at: Date | null; inserted_rows: number; name: string | null; kind: string }[] = await db().query(
    `SELECT j.id, j.finished_at, j.inserted_rows, j.kind, u.name FROM import_job j JOIN import_file f ON f.id = j.file_id
      LEFT JOIN app_user u ON u.id = j.committed_by_user_id
      WHERE f.site_id = ? AND f.sha256 = ? AND j.status = 'done' AND j.id <> ? ORDER BY j.id DESC LIMIT 1`,
    [siteId, sha256, exceptJobId ?? 0],
  );
  return rows[0] ?? null;
}

function duplicateError(prev: { id: number; finished_at: Date | null; inserted_rows: number; name: string | null }, zone: string) {
  const when = prev.finished_at ? DateTime.fromJSDate(new Date(prev.finished_at), { zone }).toFormat('d LLL yyyy HH:mm') : 'earlier';
  return new AppError(
    409,
    'duplicate_file',
    `This file was imported already (upload #${prev.id}, ${when}${prev.name ? ` by ${prev.name}` : ''}, ${prev.inserted_rows} rows). Upload it again only if you mean to, e.g. for another tank.`,
    [{ path: 'file', message: `same content as upload #${prev.id}` }],
  );
}

// ---------- the API's operations ----------

/** Receives an uploaded file: checks its bytes, maps its columns and queues the check of every row. */
export async function createImport(actor: Actor, siteId: number, file: { path: string; originalname: string } | undefined, options: ImportOptions) {
  if (!file) throw badRequest('Attach a CSV file (field “file”)', [{ path: 'file', message: 'required' }]);
  let stored: string | null = null;
  try {
    const site = await getSiteFor(actor, siteId);
    await checkTargets(db().manager, siteId, options.kind, options.sourceId, options.wardId);
    const info = await inspectCsvFile(file.path);
    const prev = await earlierImportOf(siteId, info.sha256);
    if (prev && !options.confirmDuplicate) throw duplicateError(prev, site.timeZone);
    const auto = autoMap(options.kind, info.header);
    const jobOptions: JobOptions = {
      sourceId: options.sourceId ?? null,
      wardId: options.wardId ?? null,
      unit: options.unit ?? null,
      headerUnit: headerUnitOf(options.mapping ?? auto.mapping),
      dateOrder: options.dateOrder,
      separator: info.separator,
      mapping: options.mapping ?? auto.mapping,
    };
    const problems = missingChoices(options.kind, jobOptions, info.header);
    // Into the shared file store (streamed), so whichever app process runs the import can read it.
    const key = uploadKey(actor.user.organisationId, siteId);
    await fileStore().putFile(file.path, key);
    stored = key;
    const job = await db().transaction(async (m) => {
      const f = await m.getRepository(ImportFile).save(
        m.getRepository(ImportFile).create({
          organisationId: actor.user.organisationId,
          siteId,
          sha256: info.sha256,
          originalName: file.originalname.slice(0, 255),
          sizeBytes: String(info.sizeBytes),
          lineCount: info.lineCount,
          storagePath: key,
          uploadedByUserId: actor.user.id,
        }),
      );
      const j = await m.getRepository(ImportJob).save(
        m.getRepository(ImportJob).create({
          organisationId: actor.user.organisationId,
          siteId,
          fileId: f.id,
          kind: options.kind,
          status: problems.length ? 'mapping' : 'validating',
          optionsJson: JSON.stringify(jobOptions),
          headerJson: JSON.stringify(info.header),
          sampleJson: JSON.stringify(info.sample),
          message: problems.join('. '),
          confirmDuplicate: options.confirmDuplicate,
          createdByUserId: actor.user.id,
          totalRows: null,
        }),
      );
      await recordAudit(m, whoOf(actor), {
        action: 'upload',
        entity: 'import_job',
        entityId: String(j.id),
        after: { kind: j.kind, file: f.originalName, sha256: f.sha256, sizeBytes: info.sizeBytes, duplicateOf: prev?.id ?? null },
      });
      return j;
    });
    wakeImportWorker();
    return present(db().manager, job);
  } catch (e) {
    await unlink(file.path).catch(() => undefined);
    if (stored) await fileStore().remove(stored);
    throw e;
  }
}

export async function getImport(actor: Actor, id: number) {
  const job = await jobFor(actor, id);
  return present(db().manager, job);
}

export async function listImports(actor: Actor, siteId: number) {
  await getSiteFor(actor, siteId);
  const jobs = await db()
    .getRepository(ImportJob)
    .find({ where: { siteId }, order: { id: 'DESC' }, take: 50 });
  const files = jobs.length
    ? await db()
        .getRepository(ImportFile)
        .find({ where: { id: In(jobs.map((j) => j.fileId)) } })
    : [];
  return jobs.map((j) => {
    const p = presentJob(j, files.find((f) => f.id === j.fileId) ?? null);
    // The list is light: no sample, preview rows or errors.
    return { ...p, sample: [], header: [], errors: p.errors.slice(0, 3), preview: p.preview ? { ...p.preview, rows: [] } : null };
  });
}

/** New column mapping, target or unit for an uploaded file: the rows are checked again. */
export async function remapImport(actor: Actor, id: number, input: ImportRemap) {
  return db().transaction(async (m) => {
    const job = await jobFor(actor, id, m);
    if (!['mapping', 'ready', 'invalid', 'failed'].includes(job.status))
      throw new AppError(409, 'conflict', `This upload is ${job.status}: it cannot be changed now`);
    const file = await m.getRepository(ImportFile).findOneByOrFail({ id: job.fileId });
    if (!file.storagePath) throw new AppError(409, 'conflict', 'The uploaded file is no longer kept: upload it again');
    await checkTargets(m, job.siteId, job.kind as ImportKind, input.sourceId, input.wardId);
    const old = JSON.parse(job.optionsJson) as JobOptions;
    const header = JSON.parse(job.headerJson ?? '[]') as string[];
    const mapping = Object.keys(input.mapping).length ? input.mapping : old.mapping;
    const next: JobOptions = {
      ...old,
      sourceId: input.sourceId ?? null,
      wardId: input.wardId ?? null,
      unit: input.unit || null,
      dateOrder: input.dateOrder,
      mapping,
      headerUnit: headerUnitOf(mapping),
    };
    const problems = missingChoices(job.kind as ImportKind, next, header);
    await m.getRepository(ImportJob).update(
      { id },
      {
        optionsJson: JSON.stringify(next),
        status: problems.length ? 'mapping' : 'validating',
        message: problems.join('. '),
        workerId: null,
        errorsJson: null,
        errorCount: 0,
        previewJson: null,
        processedRows: 0,
        insertedRows: 0,
        totalRows: null,
        cancelRequested: false,
        startedAt: null,
        finishedAt: null,
      },
    );
    wakeImportWorker();
    return present(m, await m.getRepository(ImportJob).findOneByOrFail({ id }));
  });
}

/** Queues a checked upload for import (all rows in one transaction, in the background). */
export async function commitImport(actor: Actor, id: number, confirmDuplicate: boolean) {
  const job = await jobFor(actor, id);
  if (job.status === 'invalid')
    throw new AppError(
      409,
      'conflict',
      `The file has ${job.errorCount} row error${job.errorCount === 1 ? '' : 's'}: correct the file and upload it again; nothing was imported`,
    );
  if (job.status !== 'ready')
    throw new AppError(
      409,
      'conflict',
      job.status === 'mapping' || job.status === 'validating' ? 'The file has not been checked yet' : `This upload is ${job.status}`,
    );
  const file = await db().getRepository(ImportFile).findOneByOrFail({ id: job.fileId });
  const prev = await earlierImportOf(job.siteId, file.sha256, job.id);
  if (prev && !confirmDuplicate && !job.confirmDuplicate) {
    const site = await getSiteFor(actor, job.siteId);
    throw duplicateError(prev, site.timeZone);
  }
  const res = await db()
    .createQueryBuilder()
    .update(ImportJob)
    .set({ status: 'queued', committedByUserId: actor.user.id, confirmDuplicate: job.confirmDuplicate || confirmDuplicate, processedRows: 0, message: '' })
    .where('id = :id AND status = :s', { id, s: 'ready' })
    .execute();
  if (!res.affected) throw new AppError(409, 'conflict', 'This upload changed meanwhile: reload it');
  wakeImportWorker();
  return getImport(actor, id);
}

/** Cancels an upload: before the import nothing was written; during it the transaction is rolled back. */
export async function cancelImport(actor: Actor, id: number) {
  const job = await jobFor(actor, id);
  if (FINAL_STATUSES.includes(job.status as ImportStatus)) throw new AppError(409, 'conflict', `This upload is ${job.status} already`);
  if (job.status === 'running') {
    await db().getRepository(ImportJob).update({ id, status: 'running' }, { cancelRequested: true });
  } else {
    const res = await db()
      .createQueryBuilder()
      .update(ImportJob)
      .set({ status: 'cancelled', cancelRequested: true, finishedAt: new Date(), workerId: null, message: 'Cancelled before anything was imported.' })
      .where('id = :id AND status <> :r', { id, r: 'running' })
      .execute();
    if (!res.affected) await db().getRepository(ImportJob).update({ id }, { cancelRequested: true });
    else await discardFile(job.fileId);
  }
  return getImport(actor, id);
}

/** Deletes an upload's bytes from disk once they are no longer needed. */
export async function discardFile(fileId: number): Promise<void> {
  const f = await db().getRepository(ImportFile).findOneBy({ id: fileId });
  if (!f?.storagePath) return;
  // Another job may use the same stored file only if it is the same upload: files are per upload.
  await fileStore().remove(f.storagePath);
  await db().getRepository(ImportFile).update({ id: fileId }, { storagePath: null });
}

/** The first row errors of an upload as CSV (row, column, value, reason). */
export async function errorsCsv(actor: Actor, id: number): Promise<string> {
  const job = await jobFor(actor, id);
  const errors = job.errorsJson ? (JSON.parse(job.errorsJson) as ImportRowError[]) : [];
  return toCsv(
    ['row', 'column', 'value', 'reason'],
    errors.map((e) => [e.row, e.column, e.value, e.reason]),
  );
}

// ---------- templates ----------

/** A template CSV of one kind for a site: its columns and three example rows that import as they are. */
export async function templateCsv(actor: Actor, siteId: number, kind: ImportKind): Promise<string> {
  const site = await getSiteFor(actor, siteId);
  const ward = await db()
    .getRepository(Ward)
    .findOne({ where: { siteId, active: true }, order: { name: 'ASC' } });
  const cols = IMPORT_COLUMNS[kind];
  const base = DateTime.now().setZone(site.timeZone).minus({ days: 3 }).startOf('day');
  const rows = [0, 1, 2].map((i) =>
    cols.map((c) => {
      if (c.key === 'time')
        return base.plus({ days: kind === 'tank_readings' ? 0 : i, hours: 8 + (kind === 'tank_readings' ? i : 0) }).toFormat("yyyy-MM-dd'T'HH:mm");
      if (c.key === 'date') return base.plus({ days: i }).toISODate();
      if (c.key === 'ward') return ward?.name ?? c.examples[i];
      return c.examples[i] ?? '';
    }),
  );
  return toCsv(
    cols.map((c) => c.key),
    rows,
  );
}

export function uploadLimitBytes(): number {
  return Math.round(env().UPLOAD_MAX_MB * 1024 * 1024);
}
