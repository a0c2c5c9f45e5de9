import { hostname } from 'node:os';
import { randomBytes } from 'node:crypto';
import { In } from 'typeorm';
import type { PoolConnection } from 'mariadb';
import { IMPORT_COLUMNS, type ImportKind, type ImportRowError } from '@common/schemas/usage.schema';
import { db } from '../../db/db';
import { bulkPool } from '../../db/bulk-pool';
import { env } from '../../config/env';
import { logger } from '../../logger';
import { Site } from '../../db/entities/site.entity';
import { CylinderType } from '../../db/entities/catalogue.entity';
import { SupplySource, Ward } from '../../db/entities/supply.entity';
import { ImportFile, ImportJob } from '../../db/entities/usage.entity';
import { User } from '../../db/entities/user.entity';
import { readCsvChunks } from './csv-file';
import { batchStatement, createRowParser, INSERT_TARGET, isBlankRecord, type ParsedRow, type RowContext, type RowParser } from './import-rows';
import { SlotTracker } from './key-set';
import type { JobOptions, JobPreview } from './import.service';
import { isDuplicateKey } from '../../db/db-errors';
import { fileStore } from '../../storage/file-store';

/**
 * The background side of uploads. A job is checked (every row parsed and validated, duplicates found,
 * nothing written) and, once confirmed, imported: all rows inside ONE transaction on a connection of
 * the bulk pool, written with batch(). Progress and the cancel flag travel through import_job on other
 * connections, so a reload shows the bar where it is and a cancel rolls the whole import back. If the
 * process dies, the server rolls the open transaction back and the job is queued again.
 */

const ERRORS_KEPT = 100;
const PREVIEW_ROWS = 10;
const TICK_MS = 400;
const STALE_SECONDS = 120;
const MAX_ATTEMPTS = 3;

class Stop extends Error {
  constructor(readonly why: 'cancelled' | 'lost' | 'shutdown') {
    super(why);
  }
}

class RowFailure extends Error {
  constructor(
    readonly errors: ImportRowError[],
    message: string,
  ) {
    super(message);
  }
}

const SOURCE_TYPES: Record<ImportKind, string[]> = {
  tank_readings: ['bulk_liquid'],
  store_counts: ['cylinder_store', 'emergency_reserve'],
  flow_meter_totals: ['bulk_liquid', 'manifold', 'cylinder_store', 'emergency_reserve'],
  historic_usage: [],
};

interface Loaded {
  job: ImportJob;
  file: ImportFile;
  /** A local copy of the stored upload (the file store may be remote), released after the run. */
  localPath: string;
  release: () => Promise<void>;
  options: JobOptions;
  ctx: RowContext;
  parse: RowParser;
  names: Map<number, string>;
}

async function load(job: ImportJob, now = Date.now()): Promise<Loaded> {
  const m = db().manager;
  const file = await m.getRepository(ImportFile).findOneByOrFail({ id: job.fileId });
  if (!file.storagePath) throw new RowFailure([], 'The uploaded file is no longer kept: upload it again');
  const options = JSON.parse(job.optionsJson) as JobOptions;
  const kind = job.kind as ImportKind;
  const site = await m.getRepository(Site).findOneByOrFail({ id: job.siteId });
  const header = JSON.parse(job.headerJson ?? '[]') as string[];
  const columns: Record<string, number> = {};
  for (const [key, h] of Object.entries(options.mapping)) {
    const i = header.indexOf(h);
    if (i >= 0) columns[key] = i;
  }
  const [sources, wards, cylinderTypes] = await Promise.all([
    m.getRepository(SupplySource).find({ where: { siteId: site.id } }),
    m.getRepository(Ward).find({ where: { siteId: site.id } }),
    m.getRepository(CylinderType).find({ where: { organisationId: site.organisationId } }),
  ]);
  const fitting = sources.filter((s) => SOURCE_TYPES[kind].includes(s.type));
  const sourceMap = new Map<string, SupplySource>();
  for (const s of fitting) {
    sourceMap.set(s.name.toLowerCase(), s);
    sourceMap.set(String(s.id), s);
  }
  const wardMap = new Map<string, Ward>();
  for (const w of wards) {
    wardMap.set(w.name.toLowerCase(), w);
    wardMap.set(String(w.id), w);
  }
  const chosenSource = options.sourceId ? (sources.find((s) => s.id === options.sourceId) ?? null) : null;
  const chosenWard = options.wardId ? (wards.find((w) => w.id === options.wardId) ?? null) : null;
  if (options.sourceId && !chosenSource) throw new RowFailure([], 'The chosen source no longer exists: choose another');
  if (options.wardId && !chosenWard) throw new RowFailure([], 'The chosen ward no longer exists: choose another');
  const ctx: RowContext = {
    kind,
    site,
    separator: options.separator,
    dateOrder: options.dateOrder,
    columns,
    defaultUnit: options.unit ?? options.headerUnit,
    defaultSource: kind === 'flow_meter_totals' ? null : chosenSource,
    defaultWard: kind === 'flow_meter_totals' ? (chosenWard ?? chosenSource) : null,
    sources: sourceMap,
    wards: wardMap,
    cylinderTypes: new Map(cylinderTypes.map((c) => [c.id, c])),
    userId: job.committedByUserId ?? job.createdByUserId,
    jobId: job.id,
    now,
  };
  // Targets are wards (daily usage, a meter on a ward) or sources: ids of the two tables overlap, so one map per upload.
  const byWard = kind === 'historic_usage' || (kind === 'flow_meter_totals' && chosenWard !== null);
  const names = new Map<number, string>(byWard ? wards.map((w) => [w.id, w.name] as [number, string]) : sources.map((s) => [s.id, s.name] as [number, string]));
  let copy;
  try {
    copy = await fileStore().localCopy(file.storagePath);
  } catch (e) {
    logger.error(`upload file ${file.id} cannot be read from the file store: ${(e as Error).message}`);
    throw new RowFailure([], 'The uploaded file cannot be read from the file store: upload it again');
  }
  return { job, file, localPath: copy.path, release: copy.release, options, ctx, parse: createRowParser(ctx), names };
}

function timeLabel(kind: ImportKind): string {
  const key = kind === 'historic_usage' ? 'date' : 'time';
  return IMPORT_COLUMNS[kind].find((c) => c.key === key)!.label;
}

function slotWord(kind: ImportKind): string {
  return kind === 'historic_usage' ? 'ward, gas and day' : kind === 'flow_meter_totals' ? 'meter time' : 'tank and time';
}

function localText(ms: number, zone: string): string {
  return new Date(ms).toLocaleString('sv-SE', { timeZone: zone, hour12: false }).slice(0, 16);
}

/** A row as the preview shows it: what will be stored, in words and the site's time. */
function previewOf(l: Loaded, line: number, r: ParsedRow): Record<string, unknown> {
  const v = r.values;
  const zone = l.ctx.site.timeZone;
  switch (l.ctx.kind) {
    case 'tank_readings':
      return {
        row: line,
        time: localText(r.atMs, zone),
        target: l.names.get(r.targetId),
        reading: `${v[3]} ${v[2] === 'level_percent' ? '%' : v[2] === 'kg' ? 'kg' : v[2] === 'litres_liquid' ? 'L liquid' : 'calibration'}`,
        contents: `${Math.round(Number(v[5]))} kg`,
      };
    case 'store_counts': {
      const d = JSON.parse(String(v[4])) as { full: number; inUseGaugeBar: number[]; empty: number };
      return {
        row: line,
        time: localText(r.atMs, zone),
        target: l.names.get(r.targetId),
        reading: `${d.full} full, ${d.inUseGaugeBar.length} in use, ${d.empty} empty`,
        contents: `${Math.round(Number(v[5]))} L`,
      };
    }
    case 'flow_meter_totals':
      return { row: line, time: localText(r.atMs, zone), target: l.names.get(r.targetId), reading: `${Math.round(Number(v[4]))} L total`, contents: null };
    default:
      return { row: line, time: String(v[3]), target: `${l.names.get(r.targetId)} · ${v[2]}`, reading: `${Math.round(Number(v[4]))} L`, contents: null };
  }
}

// ---------- progress ----------

async function tick(jobId: number, workerId: string, processed: number, signal: { stopping: boolean }, watchCancel: boolean): Promise<void> {
  const res = await db()
    .createQueryBuilder()
    .update(ImportJob)
    .set({ processedRows: processed, heartbeatAt: () => 'UTC_TIMESTAMP(3)' })
    .where('id = :id AND worker_id = :w', { id: jobId, w: workerId })
    .execute();
  if (!res.affected) throw new Stop('lost');
  if (watchCancel) {
    const row = await db()
      .getRepository(ImportJob)
      .findOne({ select: { id: true, cancelRequested: true }, where: { id: jobId } });
    if (row?.cancelRequested) throw new Stop('cancelled');
  }
  if (signal.stopping) throw new Stop('shutdown');
}

async function finish(jobId: number, workerId: string, fromStatus: string, set: Partial<ImportJob>): Promise<boolean> {
  const res = await db()
    .createQueryBuilder()
    .update(ImportJob)
    .set({ ...set, heartbeatAt: () => 'UTC_TIMESTAMP(3)' })
    .where('id = :id AND worker_id = :w AND status = :s', { id: jobId, w: workerId, s: fromStatus })
    .execute();
  return !!res.affected;
}

// ---------- the check ----------

/** Checks every row of an upload (nothing written): errors, duplicates in the file and against stored rows, preview. */
export async function validateJob(job: ImportJob, workerId: string, signal: { stopping: boolean } = { stopping: false }): Promise<void> {
  let l: Loaded;
  try {
    l = await load(job);
  } catch (e) {
    if (e instanceof RowFailure) {
      await finish(job.id, workerId, 'validating', { status: 'mapping', message: e.message });
      return;
    }
    throw e;
  }
  try {
    await validateLoaded(l, job, workerId, signal);
  } finally {
    await l.release();
  }
}

async function validateLoaded(l: Loaded, job: ImportJob, workerId: string, signal: { stopping: boolean }): Promise<void> {
  const { ctx, parse } = l;
  const errors: ImportRowError[] = [];
  let errorCount = 0;
  const onError = (e: ImportRowError) => {
    errorCount++;
    if (errors.length < ERRORS_KEPT) errors.push(e);
  };
  const keys = new SlotTracker();
  const ranges = new Map<number, { min: number; max: number; rows: number }>();
  const preview: Record<string, unknown>[] = [];
  let rows = 0;
  let last = Date.now();
  try {
    for await (const { firstLine, records } of readCsvChunks(l.localPath, ctx.separator)) {
      for (let k = 0; k < records.length; k++) {
        const record = records[k];
        if (isBlankRecord(record)) continue;
        const line = firstLine + k;
        rows++;
        const r = parse(record, line, onError);
        if (!r) continue;
        const first = keys.add(parse.groupOf(r.targetId, ctx.kind === 'historic_usage' ? String(r.values[2]) : undefined), r.atMs, r.dupKey, line);
        if (first) {
          onError({
            row: line,
            column: timeLabel(ctx.kind),
            value: ctx.kind === 'historic_usage' ? String(r.values[3]) : localText(r.atMs, ctx.site.timeZone),
            reason: `repeats row ${first} (same ${slotWord(ctx.kind)})`,
          });
          continue;
        }
        const g = ranges.get(r.targetId);
        if (g) {
          if (r.atMs < g.min) g.min = r.atMs;
          if (r.atMs > g.max) g.max = r.atMs;
          g.rows++;
        } else ranges.set(r.targetId, { min: r.atMs, max: r.atMs, rows: 1 });
        if (preview.length < PREVIEW_ROWS) preview.push(previewOf(l, line, r));
      }
      if (Date.now() - last > TICK_MS) {
        last = Date.now();
        await tick(job.id, workerId, rows, signal, false);
      }
    }
  } catch (e) {
    if (e instanceof Stop) {
      if (e.why === 'shutdown') await finish(job.id, workerId, 'validating', { workerId: null });
      return;
    }
    if ((e as { code?: string }).code === 'invalid_input') {
      await finish(job.id, workerId, 'validating', {
        status: 'invalid',
        message: (e as Error).message,
        errorCount: errorCount + 1,
        errorsJson: JSON.stringify(errors),
        totalRows: rows,
        processedRows: rows,
      });
      return;
    }
    throw e;
  }
  if (rows === 0) onError({ row: 2, column: '', value: '', reason: 'the file has a header but no data rows' });
  const table = INSERT_TARGET[ctx.kind].table;
  const [{ top }] = (await db().query(`SELECT COALESCE(MAX(id), 0) AS top FROM ${table}`)) as { top: string | number }[];
  if (errors.length < ERRORS_KEPT && ranges.size) await checkStored(l, keys, ranges, onError);
  const firstAt = ranges.size ? Math.min(...[...ranges.values()].map((g) => g.min)) : null;
  const lastAt = ranges.size ? Math.max(...[...ranges.values()].map((g) => g.max)) : null;
  const summary: JobPreview = {
    rows: preview,
    firstAt: firstAt === null ? null : new Date(firstAt).toISOString(),
    lastAt: lastAt === null ? null : new Date(lastAt).toISOString(),
    targets: [...ranges.entries()].map(([id, g]) => ({ id, name: l.names.get(id) ?? String(id), rows: g.rows })),
    checkedUpToId: Number(top),
  };
  const partial = keys.full ? ' (the file is too long to check every pair of rows for repeats here; the import checks them again)' : '';
  await finish(job.id, workerId, 'validating', {
    status: errorCount ? 'invalid' : 'ready',
    message: errorCount
      ? `${errorCount.toLocaleString('en-GB')} row error${errorCount === 1 ? '' : 's'} in ${rows.toLocaleString('en-GB')} rows: nothing will be imported. Correct the file and upload it again.`
      : `${rows.toLocaleString('en-GB')} rows checked: ready to import${partial}.`,
    errorCount,
    errorsJson: JSON.stringify(errors),
    previewJson: JSON.stringify(summary),
    totalRows: rows,
    processedRows: rows,
  });
}

/** Rows whose slot (target and time, or ward, gas and day) is stored already: found by streaming the stored keys. */
async function checkStored(
  l: Loaded,
  keys: SlotTracker,
  ranges: Map<number, { min: number; max: number }>,
  onError: (e: ImportRowError) => void,
): Promise<void> {
  const { ctx, parse } = l;
  const conn = await bulkPool().getConnection();
  try {
    for (const [targetId, g] of ranges) {
      let sql: string;
      let params: unknown[];
      const from = new Date(g.min).toISOString().slice(0, 23).replace('T', ' ');
      const to = new Date(g.max).toISOString().slice(0, 23).replace('T', ' ');
      if (ctx.kind === 'tank_readings' || ctx.kind === 'store_counts') {
        sql = 'SELECT taken_at AS t FROM source_reading WHERE source_id = ? AND taken_at BETWEEN ? AND ?';
        params = [targetId, from, to];
      } else if (ctx.kind === 'flow_meter_totals') {
        sql = `SELECT taken_at AS t FROM flow_meter_reading WHERE ${ctx.defaultWard && !('type' in ctx.defaultWard) ? 'ward_id' : 'source_id'} = ? AND taken_at BETWEEN ? AND ?`;
        params = [targetId, from, to];
      } else {
        sql = 'SELECT usage_date AS d, gas_code AS g FROM usage_history WHERE ward_id = ? AND usage_date BETWEEN ? AND ?';
        params = [targetId, from.slice(0, 10), to.slice(0, 10)];
      }
      const stream = conn.queryStream(sql, params);
      for await (const row of stream as AsyncIterable<{ t?: Date; d?: string; g?: string }>) {
        const at = row.t ? row.t.getTime() : Date.UTC(+row.d!.slice(0, 4), +row.d!.slice(5, 7) - 1, +row.d!.slice(8, 10));
        const line = keys.lineOf(parse.groupOf(targetId, row.g), at, parse.keyOf(targetId, at, row.g));
        if (line)
          onError({
            row: line,
            column: timeLabel(ctx.kind),
            value: row.d ?? localText(at, ctx.site.timeZone),
            reason:
              ctx.kind === 'historic_usage'
                ? 'usage for this ward, gas and day is stored already'
                : 'a reading at this time is stored already (imported before?)',
          });
      }
    }
  } finally {
    conn.release();
  }
}

// ---------- the import ----------

/** Imports a checked upload in one transaction (all rows or none). */
export async function importJob(job: ImportJob, workerId: string, signal: { stopping: boolean } = { stopping: false }): Promise<void> {
  const batchRows = env().IMPORT_BATCH_ROWS;
  let l: Loaded;
  try {
    l = await load(job);
  } catch (e) {
    if (e instanceof RowFailure) {
      await finish(job.id, workerId, 'running', { status: 'failed', message: `${e.message}. Nothing was imported.`, finishedAt: new Date() });
      return;
    }
    throw e;
  }
  try {
    await importLoaded(l, job, workerId, signal, batchRows);
  } finally {
    await l.release();
  }
}

async function importLoaded(l: Loaded, job: ImportJob, workerId: string, signal: { stopping: boolean }, batchRows: number): Promise<void> {
  const { ctx, parse } = l;
  const conn: PoolConnection = await bulkPool().getConnection();
  let rows = 0;
  let inserted = 0;
  const ranges = new Map<number, { min: number; max: number }>();
  const rowErrors: ImportRowError[] = [];
  const onError = (e: ImportRowError) => {
    if (rowErrors.length < 20) rowErrors.push(e);
  };
  // One batch travels to the server while the next is parsed: on two cores, parsing and the server's
  // inserts overlap instead of taking turns.
  let inflight: Promise<void> | null = null;
  const send = async (rowsOut: unknown[][]) => {
    if (inflight) await inflight;
    const st = batchStatement(ctx.kind, rowsOut, (v) => conn.escape(v));
    const p = conn.batch({ sql: st.sql, fullResult: false } as { sql: string }, st.params).then(() => {
      inserted += rowsOut.length;
    });
    p.catch(() => undefined); // awaited below; this only keeps an early exit from leaving it unhandled
    inflight = p;
  };
  const checked = job.previewJson ? (JSON.parse(job.previewJson) as JobPreview) : null;
  let recheck = true;
  try {
    await conn.beginTransaction();
    recheck = await lockTargets(conn, ctx, checked);
    let batch: unknown[][] = [];
    let last = Date.now();
    for await (const { firstLine, records } of readCsvChunks(l.localPath, ctx.separator)) {
      for (let k = 0; k < records.length; k++) {
        const record = records[k];
        if (isBlankRecord(record)) continue;
        const line = firstLine + k;
        rows++;
        const r = parse(record, line, onError);
        if (!r) {
          const first = rowErrors[0];
          throw new RowFailure(rowErrors, first ? `Row ${first.row}, ${first.column}: ${first.reason}` : `Row ${line} cannot be imported`);
        }
        batch.push(r.values);
        const g = ranges.get(r.targetId);
        if (g) {
          if (r.atMs < g.min) g.min = r.atMs;
          if (r.atMs > g.max) g.max = r.atMs;
        } else ranges.set(r.targetId, { min: r.atMs, max: r.atMs });
        if (batch.length >= batchRows) {
          await send(batch);
          batch = [];
        }
      }
      if (Date.now() - last > TICK_MS) {
        last = Date.now();
        await tick(job.id, workerId, rows, signal, true);
      }
    }
    if (batch.length) await send(batch);
    if (inflight) await inflight;
    await tick(job.id, workerId, rows, signal, true);
    if (recheck) await checkNoRepeats(conn, ctx.kind, ranges, ctx);
    const who = job.committedByUserId
      ? await db()
          .getRepository(User)
          .findOne({ select: { id: true, email: true }, where: { id: job.committedByUserId } })
      : null;
    await conn.query('INSERT INTO audit_log (organisation_id, user_id, user_email, action, entity, entity_id, after_json) VALUES (?, ?, ?, ?, ?, ?, ?)', [
      job.organisationId,
      job.committedByUserId,
      who?.email ?? null,
      'import',
      'import_job',
      String(job.id),
      JSON.stringify({
        kind: ctx.kind,
        file: l.file.originalName,
        sha256: l.file.sha256,
        rows: inserted,
        targets: [...ranges.keys()].map((id) => ({ id, name: l.names.get(id) })),
      }),
    ]);
    // Last look at the cancel flag before the point of no return.
    await tick(job.id, workerId, rows, signal, true);
    await conn.commit();
    await finish(job.id, workerId, 'running', {
      status: 'done',
      insertedRows: inserted,
      processedRows: rows,
      finishedAt: new Date(),
      message: `${inserted.toLocaleString('en-GB')} rows imported.`,
    });
    await removeFile(l.file);
  } catch (e) {
    if (inflight) await (inflight as Promise<void>).catch(() => undefined);
    await conn.rollback().catch(() => undefined);
    if (e instanceof Stop) {
      if (e.why === 'cancelled') {
        await finish(job.id, workerId, 'running', {
          status: 'cancelled',
          finishedAt: new Date(),
          insertedRows: 0,
          message: `Cancelled after ${rows.toLocaleString('en-GB')} rows: the import was rolled back and nothing was written.`,
        });
        await removeFile(l.file);
      } else if (e.why === 'shutdown') {
        await finish(job.id, workerId, 'running', {
          status: 'queued',
          workerId: null,
          processedRows: 0,
          message: 'Interrupted by a restart (nothing was written): it will run again.',
        });
      }
      return;
    }
    if (e instanceof RowFailure) {
      await finish(job.id, workerId, 'running', {
        status: 'failed',
        finishedAt: new Date(),
        insertedRows: 0,
        errorCount: e.errors.length || 1,
        errorsJson: JSON.stringify(e.errors),
        message: `${e.message}. The import stopped and was rolled back: nothing was written. Check the file and upload it again.`,
      });
      return;
    }
    if (isDuplicateKey(e)) {
      await finish(job.id, workerId, 'running', {
        status: 'failed',
        finishedAt: new Date(),
        insertedRows: 0,
        message: 'A row repeats data stored already (it arrived after the check). Nothing was written.',
      });
      return;
    }
    logger.error(`import #${job.id} failed: ${(e as Error).stack ?? e}`);
    await finish(job.id, workerId, 'running', {
      status: 'failed',
      finishedAt: new Date(),
      insertedRows: 0,
      message: `The import failed (${(e as Error).message.slice(0, 200)}). It was rolled back: nothing was written.`,
    });
  } finally {
    conn.release();
  }
}

/**
 * Locks the rows of the targets (tank, store, meter's ward or source) for the import's transaction, so
 * two imports into one target run one after the other, and tells whether rows reached a target after
 * the check compared with stored rows (then the import looks for repeats again once its rows are in;
 * otherwise the check's answer still holds and the scan over a million rows is skipped).
 */
async function lockTargets(conn: PoolConnection, ctx: RowContext, checked: JobPreview | null): Promise<boolean> {
  if (ctx.kind === 'historic_usage') return false; // a unique key refuses repeats on insert
  const ids = checked?.targets.map((t) => t.id) ?? [];
  if (!ids.length || checked?.checkedUpToId === undefined) return true;
  const place = ids.map(() => '?').join(',');
  const meterOnWard = ctx.kind === 'flow_meter_totals' && ctx.defaultWard !== null && !('type' in ctx.defaultWard);
  await conn.query(`SELECT id FROM ${meterOnWard ? 'ward' : 'supply_source'} WHERE id IN (${place}) FOR UPDATE`, ids);
  const table = INSERT_TARGET[ctx.kind].table;
  const col = meterOnWard ? 'ward_id' : 'source_id';
  const later: unknown[] = await conn.query(`SELECT 1 FROM ${table} WHERE id > ? AND ${col} IN (${place}) LIMIT 1`, [checked.checkedUpToId, ...ids]);
  return later.length > 0;
}

/** Inside the import's transaction: no target may now hold two rows for one slot (stored before or just added). */
async function checkNoRepeats(conn: PoolConnection, kind: ImportKind, ranges: Map<number, { min: number; max: number }>, ctx: RowContext): Promise<void> {
  if (kind === 'historic_usage') return; // its unique key refuses repeats on insert
  const table = kind === 'flow_meter_totals' ? 'flow_meter_reading' : 'source_reading';
  const col = kind === 'flow_meter_totals' ? (ctx.defaultWard && !('type' in ctx.defaultWard) ? 'ward_id' : 'source_id') : 'source_id';
  for (const [targetId, g] of ranges) {
    const rows: { t: Date }[] = await conn.query(
      `SELECT taken_at AS t FROM ${table} WHERE ${col} = ? AND taken_at BETWEEN ? AND ? GROUP BY taken_at HAVING COUNT(*) > 1 LIMIT 5`,
      [targetId, new Date(g.min).toISOString().slice(0, 23).replace('T', ' '), new Date(g.max).toISOString().slice(0, 23).replace('T', ' ')],
    );
    if (rows.length) {
      const errors = rows.map((r) => ({
        row: 0,
        column: timeLabel(kind),
        value: localText(r.t.getTime(), ctx.site.timeZone),
        reason: 'a reading at this time is stored already',
      }));
      throw new RowFailure(errors, `${rows.length} time${rows.length === 1 ? '' : 's'} would hold two readings (stored meanwhile?), e.g. ${errors[0].value}`);
    }
  }
}

async function removeFile(file: ImportFile): Promise<void> {
  if (!file.storagePath) return;
  await fileStore().remove(file.storagePath);
  await db().getRepository(ImportFile).update({ id: file.id }, { storagePath: null });
}

// ---------- the worker ----------

let wakeUp: (() => void) | null = null;
let remoteWake: (() => void) | null = null;

/** Makes a sleeping worker (of this process, or the worker process) look for work now (after an upload or a commit). */
export function wakeImportWorker(): void {
  wakeUp?.();
  remoteWake?.();
}

/** How to wake the worker process (main.ts registers it; null when it is not running). */
export function setRemoteWake(fn: (() => void) | null): void {
  remoteWake = fn;
}

/** Jobs whose worker stopped answering: an import is queued again (its transaction died with it), a check is released. */
export async function recoverStaleJobs(): Promise<void> {
  const stale = `heartbeat_at < UTC_TIMESTAMP(3) - INTERVAL ${STALE_SECONDS} SECOND`;
  await db().query(
    `UPDATE import_job SET status = 'queued', worker_id = NULL, processed_rows = 0, message = 'Interrupted (nothing was written): it will run again.' WHERE status = 'running' AND ${stale} AND attempts < ?`,
    [MAX_ATTEMPTS],
  );
  await db().query(
    `UPDATE import_job SET status = 'failed', worker_id = NULL, finished_at = UTC_TIMESTAMP(3), message = 'The import was interrupted ${MAX_ATTEMPTS} times and has stopped; nothing was written.' WHERE status = 'running' AND ${stale} AND attempts >= ?`,
    [MAX_ATTEMPTS],
  );
  await db().query(`UPDATE import_job SET worker_id = NULL WHERE status = 'validating' AND worker_id IS NOT NULL AND ${stale}`);
}

/** Claims the oldest job waiting for a check or an import and runs it; false when there was none. */
export async function processNextJob(workerId: string, signal: { stopping: boolean } = { stopping: false }): Promise<boolean> {
  const candidates = await db()
    .getRepository(ImportJob)
    .createQueryBuilder('j')
    .where("(j.status = 'validating' AND j.worker_id IS NULL) OR j.status = 'queued'")
    .orderBy('j.id', 'ASC')
    .limit(5)
    .getMany();
  for (const c of candidates) {
    const fromStatus = c.status;
    const toStatus = fromStatus === 'queued' ? 'running' : 'validating';
    const res = await db()
      .createQueryBuilder()
      .update(ImportJob)
      .set({
        status: toStatus,
        workerId,
        heartbeatAt: () => 'UTC_TIMESTAMP(3)',
        ...(toStatus === 'running' ? { startedAt: new Date(), attempts: () => 'attempts + 1', processedRows: 0 } : {}),
      })
      .where(fromStatus === 'queued' ? "id = :id AND status = 'queued'" : "id = :id AND status = 'validating' AND worker_id IS NULL", { id: c.id })
      .execute();
    if (!res.affected) continue;
    const job = await db().getRepository(ImportJob).findOneByOrFail({ id: c.id });
    try {
      if (toStatus === 'running') await importJob(job, workerId, signal);
      else await validateJob(job, workerId, signal);
    } catch (e) {
      logger.error(`upload #${job.id}: ${(e as Error).stack ?? e}`);
      await finish(job.id, workerId, toStatus, {
        status: 'failed',
        finishedAt: new Date(),
        message: `The ${toStatus === 'running' ? 'import' : 'check'} failed: ${(e as Error).message.slice(0, 200)}. Nothing was written.`,
      }).catch(() => undefined);
    }
    return true;
  }
  return false;
}

/** Drops uploads left unfinished for a week (their files too). */
async function tidyAbandoned(): Promise<void> {
  const old = await db()
    .getRepository(ImportJob)
    .createQueryBuilder('j')
    .where("j.status IN ('mapping', 'ready', 'invalid', 'failed') AND j.updated_at < UTC_TIMESTAMP(3) - INTERVAL 7 DAY")
    .limit(50)
    .getMany();
  if (!old.length) return;
  const files = await db()
    .getRepository(ImportFile)
    .find({ where: { id: In(old.map((j) => j.fileId)) } });
  for (const f of files) await removeFile(f);
  await db()
    .getRepository(ImportJob)
    .update({ id: In(old.map((j) => j.id)) }, { status: 'cancelled', message: 'Left unfinished for a week: closed.', finishedAt: new Date() });
}

/** Starts this process's import worker (main.ts; tests start their own). Returns a stop function. */
export function startImportWorker(opts: { pollMs?: number } = {}): () => Promise<void> {
  const workerId = `${hostname().slice(0, 30)}:${process.pid}:${randomBytes(3).toString('hex')}`;
  const pollMs = opts.pollMs ?? env().IMPORT_POLL_MS;
  const signal = { stopping: false };
  let sleeping: NodeJS.Timeout | null = null;
  let resolveSleep: (() => void) | null = null;
  wakeUp = () => {
    if (sleeping) clearTimeout(sleeping);
    sleeping = null;
    resolveSleep?.();
  };
  const loop = (async () => {
    let lastTidy = 0;
    let lastRecover = 0;
    while (!signal.stopping) {
      try {
        if (Date.now() - lastRecover > 30_000) {
          lastRecover = Date.now();
          await recoverStaleJobs();
        }
        if (Date.now() - lastTidy > 3_600_000) {
          lastTidy = Date.now();
          await tidyAbandoned();
        }
        if (await processNextJob(workerId, signal)) continue;
      } catch (e) {
        logger.error(`import worker: ${(e as Error).message}`);
      }
      if (signal.stopping) break;
      await new Promise<void>((resolve) => {
        resolveSleep = resolve;
        sleeping = setTimeout(resolve, pollMs);
      });
      resolveSleep = null;
    }
  })();
  return async () => {
    signal.stopping = true;
    wakeUp?.();
    wakeUp = null;
    await loop;
  };
}
