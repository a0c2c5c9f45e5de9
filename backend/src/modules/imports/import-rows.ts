import { lookup } from '@common/api/lookup';
import { IMPORT_COLUMNS, type ImportKind, type ImportRowError } from '@common/schemas/usage.schema';
import { GAS_CODES_CATALOGUE } from '@common/schemas/admin.schema';
import { resolveLocalTimeUtcMs } from '@common/forecast/hour-index';
import type { ReadingInput } from '@common/schemas/supply.schema';
import type { Site } from '../../db/entities/site.entity';
import type { CylinderType } from '../../db/entities/catalogue.entity';
import type { SupplySource, Ward } from '../../db/entities/supply.entity';
import { AppError } from '../../errors/app-error';
import { contentsOfReading } from '../supply/supply.service';

/**
 * Turning CSV records into rows of the database, one kind of upload at a time. Everything here is
 * per-row hot code (a year of 1-minute telemetry is 525,600 rows): no zod, no luxon per row, time-zone
 * offsets cached per local hour, errors collected rather than thrown.
 */

export type DateOrder = 'ymd' | 'dmy' | 'mdy';

/** Everything a row needs that does not change from row to row. */
export interface RowContext {
  kind: ImportKind;
  site: Site;
  separator: ',' | ';';
  dateOrder: DateOrder;
  /** Canonical column key → index in the record (absent keys are not in the file). */
  columns: Record<string, number>;
  /** Unit chosen on upload (used when the file has no unit column or the cell is empty). */
  defaultUnit: string | null;
  /** Target chosen on upload. */
  defaultSource: SupplySource | null;
  defaultWard: SupplySource | Ward | null;
  /** Sources of the site that this kind may write to, by lower-case name and by id. */
  sources: Map<string, SupplySource>;
  wards: Map<string, Ward>;
  cylinderTypes: Map<number, CylinderType>;
  userId: number | null;
  jobId: number;
  now: number;
}

/** One row ready for the bulk insert, with what duplicate checks and the preview need. */
export interface ParsedRow {
  values: unknown[];
  /** Identifies the row's slot (target + time or day): two rows with one key are duplicates. */
  dupKey: number;
  /** The target (source or ward) the row belongs to. */
  targetId: number;
  /** UTC ms of the reading, or of the local day's start for daily usage. */
  atMs: number;
}

export type RowParser = ((record: string[], line: number, onError: (e: ImportRowError) => void) => ParsedRow | null) & {
  /** The duplicate key of a target (source or ward) at an instant, as rows compute it (gas: historic usage). */
  keyOf: (targetId: number, atMs: number, gasCode?: string) => number;
  /** The series a row belongs to (target, and gas for daily usage): repeats are looked for within it. */
  groupOf: (targetId: number, gasCode?: string) => number;
};

/** Where each kind's rows go: the table and the columns of `ParsedRow.values`, in order. */
export const INSERT_TARGET: Record<ImportKind, { table: string; columns: readonly string[] }> = {
  tank_readings: {
    table: 'source_reading',
    columns: ['source_id', 'taken_at', 'kind', 'value', 'detail_json', 'contents', 'method', 'taken_by_user_id', 'note'],
  },
  store_counts: {
    table: 'source_reading',
    columns: ['source_id', 'taken_at', 'kind', 'value', 'detail_json', 'contents', 'method', 'taken_by_user_id', 'note'],
  },
  flow_meter_totals: { table: 'flow_meter_reading', columns: ['site_id', 'ward_id', 'source_id', 'taken_at', 'total_l', 'note', 'import_job_id'] },
  historic_usage: { table: 'usage_history', columns: ['site_id', 'ward_id', 'gas_code', 'usage_date', 'volume_l', 'note', 'import_job_id'] },
};

/**
 * The INSERT for one batch, with every column that holds one value across the whole batch written as a
 * literal (the tank, the unit, the method, an empty note…), so only the columns that vary travel as
 * parameters: telemetry sends 3 values a row instead of 9, which the connector encodes and the server
 * binds for every row. `escape` is the connection's own literal escaping.
 */
export function batchStatement(kind: ImportKind, rows: readonly unknown[][], escape: (v: unknown) => string): { sql: string; params: unknown[][] } {
  const { table, columns } = INSERT_TARGET[kind];
  const first = rows[0];
  const constant = columns.map((_, c) => {
    const v = first[c];
    if (v !== null && typeof v !== 'number' && typeof v !== 'string') return false;
    for (let i = 1; i < rows.length; i++) if (rows[i][c] !== v) return false;
    return true;
  });
  const varying: number[] = [];
  const values = columns.map((_, c) => {
    if (constant[c]) return first[c] === null ? 'NULL' : escape(first[c]);
    varying.push(c);
    return '?';
  });
  if (varying.length === columns.length || varying.length === 0 || rows.length < 2) {
    // Nothing to fold (or a single row, where everything looks constant): every column a parameter.
    return { sql: `INSERT INTO ${table} (${columns.join(', ')}) VALUES (${columns.map(() => '?').join(', ')})`, params: rows as unknown[][] };
  }
  const sql = `INSERT INTO ${table} (${columns.join(', ')}) VALUES (${values.join(', ')})`;
  const params = new Array<unknown[]>(rows.length);
  for (let i = 0; i < rows.length; i++) {
    const row = rows[i];
    const out = new Array<unknown>(varying.length);
    for (let k = 0; k < varying.length; k++) out[k] = row[varying[k]];
    params[i] = out;
  }
  return { sql, params };
}

// ---------- cells ----------

/** A cell as text; a leading apostrophe our own exports put before = + - @ is taken off again. */
function cell(record: string[], index: number | undefined): string {
  if (index === undefined || index < 0) return '';
  const v = record[index];
  if (v === undefined) return '';
  if (v.charCodeAt(0) === 39 && v.length > 1) {
    const c = v.charCodeAt(1);
    if (c === 61 || c === 43 || c === 45 || c === 64 || c === 9 || c === 13) return v.slice(1).trim();
  }
  return v.trim();
}

/** A number cell: NaN when not a number; a decimal comma is read when the separator is a semicolon. */
function numberOf(text: string, decimalComma: boolean): number {
  if (text === '') return Number.NaN;
  const t = decimalComma && text.includes(',') ? text.replace(',', '.') : text;
  const v = Number(t);
  return Number.isFinite(v) ? v : Number.NaN;
}

const clip = (s: string) => (s.length > 80 ? `${s.slice(0, 77)}…` : s);

// ---------- times ----------

const ISO_RE = /^(\d{4})-(\d{1,2})-(\d{1,2})(?:[T ](\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?)?\s*(Z|z|[+-]\d{2}(?::?\d{2})?)?$/;
const DMY_RE = /^(\d{1,2})[/.-](\d{1,2})[/.-](\d{4})(?:[T ,]+(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?)?\s*(Z|z|[+-]\d{2}(?::?\d{2})?)?$/;

export interface ParsedTime {
  /** UTC ms (first occurrence for a local time in the hour repeated when clocks go back). */
  ms: number;
  /** The second occurrence when the local time is ambiguous, else null. */
  altMs: number | null;
  hasTime: boolean;
  /** Local date as written, yyyy-MM-dd. */
  date: string;
}

const hourCaches = new Map<string, Map<number, { start: number | null; alt: number | null }>>();
const wallFormats = new Map<string, Intl.DateTimeFormat>();

/** Local wall clock `yyyy-MM-ddTHH:mm` of an instant (sv-SE formats that way); one formatter per zone. */
function wallClockOf(ms: number, zone: string): string {
  let f = wallFormats.get(zone);
  if (!f) {
    f = new Intl.DateTimeFormat('sv-SE', {
      timeZone: zone,
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      hourCycle: 'h23',
    });
    if (wallFormats.size < 100) wallFormats.set(zone, f);
  }
  return f.format(new Date(ms)).replace(' ', 'T');
}

/** UTC start of a local clock hour (null if the clocks skipped it) and its repeat when they went back. */
function localHourStart(zone: string, y: number, mo: number, d: number, h: number): { start: number | null; alt: number | null } {
  let cache = hourCaches.get(zone);
  if (!cache) {
    cache = new Map();
    if (hourCaches.size > 50) hourCaches.clear();
    hourCaches.set(zone, cache);
  }
  const key = ((y * 13 + mo) * 32 + d) * 24 + h;
  let hit = cache.get(key);
  if (!hit) {
    const local = `${y}-${String(mo).padStart(2, '0')}-${String(d).padStart(2, '0')}T${String(h).padStart(2, '0')}:00`;
    const start = resolveLocalTimeUtcMs(local, zone);
    let alt: number | null = null;
    // The same wall hour an hour later in real time is the repeat of a clock going back.
    if (start !== null && wallClockOf(start + 3_600_000, zone) === local) alt = start + 3_600_000;
    hit = { start, alt };
    if (cache.size > 200_000) cache.clear();
    cache.set(key, hit);
  }
  return hit;
}

const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];
function isCalendarDay(y: number, mo: number, d: number): boolean {
  if (mo < 1 || mo > 12 || d < 1) return false;
  if (mo === 2) return d <= ((y % 4 === 0 && y % 100 !== 0) || y % 400 === 0 ? 29 : 28);
  return d <= DAYS_IN_MONTH[mo - 1];
}

/** Digits at text[i..i+n) as a number, or −1. */
function digitsAt(text: string, i: number, n: number): number {
  let v = 0;
  for (let k = i; k < i + n; k++) {
    const c = text.charCodeAt(k) - 48;
    if (c < 0 || c > 9) return -1;
    v = v * 10 + c;
  }
  return v;
}

const pad2 = (n: number) => (n < 10 ? `0${n}` : String(n));

/**
 * The common shapes without a regular expression (this runs for every row): `yyyy-MM-dd`,
 * `yyyy-MM-ddTHH:mm[:ss[.fff]]` with T or a space, then nothing, Z or ±HH:mm / ±HHmm / ±HH.
 * Returns false when the text has another shape (the general reader then takes over).
 */
function parseIsoFast(text: string, zone: string, needTime: boolean, out: ParsedTime): boolean | string {
  const n = text.length;
  if (n < 10 || text.charCodeAt(4) !== 45 || text.charCodeAt(7) !== 45) return false;
  const y = digitsAt(text, 0, 4);
  const mo = digitsAt(text, 5, 2);
  const d = digitsAt(text, 8, 2);
  if (y < 0 || mo < 0 || d < 0) return false;
  let h = 0;
  let mi = 0;
  let sec = 0;
  let frac = 0;
  let pos = 10;
  const hasTime = n > 10;
  if (hasTime) {
    const sep = text.charCodeAt(10);
    if ((sep !== 84 && sep !== 32) || n < 16 || text.charCodeAt(13) !== 58) return false;
    h = digitsAt(text, 11, 2);
    mi = digitsAt(text, 14, 2);
    if (h < 0 || mi < 0) return false;
    pos = 16;
    if (pos < n && text.charCodeAt(pos) === 58) {
      sec = digitsAt(text, 17, 2);
      if (sec < 0 || n < 19) return false;
      pos = 19;
      const c = text.charCodeAt(pos);
      if (pos < n && (c === 46 || c === 44)) {
        pos++;
        let scale = 100;
        while (pos < n) {
          const dgt = text.charCodeAt(pos) - 48;
          if (dgt < 0 || dgt > 9) break;
          frac += dgt * scale;
          scale /= 10;
          pos++;
        }
        frac = Math.round(frac);
      }
    }
  } else if (needTime) return 'needs the time of day as well as the date';
  if (!isCalendarDay(y, mo, d)) return 'not a calendar date';
  if (h > 23 || mi > 59 || sec > 59) return 'not a time of day';
  const wall = Date.UTC(y, mo - 1, d, h, mi, sec, frac);
  out.hasTime = hasTime;
  out.altMs = null;
  out.date = needTime ? '' : `${y}-${pad2(mo)}-${pad2(d)}`;
  if (pos === n) {
    const hour = localHourStart(zone, y, mo, d, h);
    if (hour.start === null) return `does not exist in ${zone} (the clocks went forward): add the UTC offset, e.g. +01:00`;
    const within = mi * 60_000 + sec * 1000 + frac;
    out.ms = hour.start + within;
    out.altMs = hour.alt === null ? null : hour.alt + within;
    return true;
  }
  const c = text.charCodeAt(pos);
  if ((c === 90 || c === 122) && pos + 1 === n) {
    out.ms = wall;
    return true;
  }
  if (c === 43 || c === 45) {
    const oh = digitsAt(text, pos + 1, 2);
    let om = 0;
    let end = pos + 3;
    if (end < n && text.charCodeAt(end) === 58) end++;
    if (end < n) {
      om = digitsAt(text, end, 2);
      end += 2;
    }
    if (oh < 0 || om < 0 || end !== n) return false;
    const minutes = (c === 45 ? -1 : 1) * (oh * 60 + om);
    if (Math.abs(minutes) > 14 * 60) return 'offset beyond ±14:00';
    out.ms = wall - minutes * 60_000;
    return true;
  }
  return false;
}

/**
 * Reads a time cell: ISO-like `2027-01-04T08:30[:ss[.mmm]][Z|±hh:mm]` (a space may replace the T), or
 * day/month/year or month/day/year when that order is chosen. Without an offset the time is the site's
 * local time (IANA zone); a time skipped by the spring clock change is an error; a time in the repeated
 * autumn hour gives both candidates. Returns a reason string when the cell cannot be read.
 */
export function parseTimeCell(
  text: string,
  zone: string,
  order: DateOrder,
  needTime: boolean,
  out: ParsedTime = { ms: 0, altMs: null, hasTime: false, date: '' },
): ParsedTime | string {
  if (text === '') return 'missing';
  const fast = parseIsoFast(text, zone, needTime, out);
  if (fast === true) return out;
  if (typeof fast === 'string') return fast;
  let m = ISO_RE.exec(text);
  let y: number, mo: number, d: number;
  if (m) {
    y = +m[1];
    mo = +m[2];
    d = +m[3];
  } else {
    m = DMY_RE.exec(text);
    if (!m) return 'not a date and time (use 2027-01-04T08:30 or 2027-01-04 08:30)';
    if (order === 'ymd') return 'a day/month or month/day date: choose the date order on upload';
    y = +m[3];
    mo = order === 'dmy' ? +m[2] : +m[1];
    d = order === 'dmy' ? +m[1] : +m[2];
  }
  const hasTime = m[4] !== undefined;
  if (needTime && !hasTime) return 'needs the time of day as well as the date';
  const h = hasTime ? +m[4] : 0;
  const mi = hasTime ? +m[5] : 0;
  const s = m[6] !== undefined ? +m[6] : 0;
  const frac = m[7] !== undefined ? Math.round(Number(`0.${m[7]}`) * 1000) : 0;
  if (!isCalendarDay(y, mo, d)) return 'not a calendar date';
  if (h > 23 || mi > 59 || s > 59) return 'not a time of day';
  const wall = Date.UTC(y, mo - 1, d, h, mi, s, frac);
  out.hasTime = hasTime;
  out.date = `${y}-${pad2(mo)}-${pad2(d)}`;
  out.altMs = null;
  const off = m[8];
  if (off !== undefined) {
    if (off === 'Z' || off === 'z') {
      out.ms = wall;
      return out;
    }
    const sign = off[0] === '-' ? -1 : 1;
    const digits = off.slice(1).replace(':', '');
    const minutes = sign * (Number(digits.slice(0, 2)) * 60 + Number(digits.slice(2) || '0'));
    if (Math.abs(minutes) > 14 * 60) return 'offset beyond ±14:00';
    out.ms = wall - minutes * 60_000;
    return out;
  }
  const hour = localHourStart(zone, y, mo, d, h);
  if (hour.start === null) return `does not exist in ${zone} (the clocks went forward): add the UTC offset, e.g. +01:00`;
  const within = mi * 60_000 + s * 1000 + frac;
  out.ms = hour.start + within;
  out.altMs = hour.alt === null ? null : hour.alt + within;
  return out;
}

// ---------- units ----------

const TANK_UNITS: Record<string, ReadingInput['kind']> = {
  '%': 'level_percent',
  percent: 'level_percent',
  pct: 'level_percent',
  level_percent: 'level_percent',
  kg: 'kg',
  l: 'litres_liquid',
  litres: 'litres_liquid',
  liters: 'litres_liquid',
  litres_liquid: 'litres_liquid',
  l_liquid: 'litres_liquid',
  dp: 'calibration',
  calibration: 'calibration',
};
const VOLUME_UNITS: Record<string, number> = { l: 1, litres: 1, liters: 1, m3: 1000, 'm³': 1000, cubic_metres: 1000, cubic_meters: 1000 };

const unitKey = (u: string) => u.trim().toLowerCase().replace(/³/g, '3').replace(/\s+/g, '_');

/** The reading kind a tank unit means for a source (its calibration unit counts as differential pressure). */
export function tankUnitKind(unit: string, source: SupplySource | null): ReadingInput['kind'] | null {
  const k = unitKey(unit);
  if (source?.calibrationUnit && k === unitKey(source.calibrationUnit)) return 'calibration';
  return lookup(TANK_UNITS, k) ?? null; // a unit cell of "constructor" is no unit
}

export function volumeUnitFactor(unit: string): number | null {
  return lookup(VOLUME_UNITS, unitKey(unit)) ?? null;
}

export function unitsAccepted(kind: ImportKind, source: SupplySource | null): string {
  if (kind === 'tank_readings')
    return `%, kg, L (litres of liquid)${source?.calibrationUnit ? ` or ${source.calibrationUnit}` : ' or the tank’s calibration unit'}`;
  if (kind === 'flow_meter_totals' || kind === 'historic_usage') return 'L or m3';
  return '';
}

// ---------- the row parsers ----------

const PAD3 = Array.from({ length: 1000 }, (_, i) => String(i).padStart(3, '0'));
const PAD2 = PAD3.slice(0, 60).map((x) => x.slice(1));
let prefixHour = -1;
let prefix = '';

/** UTC 'yyyy-MM-dd HH:mm:ss.SSS' for the bulk insert (the hour's prefix is formatted once per hour). */
function formatUtc(ms: number): string {
  const hour = Math.floor(ms / 3_600_000);
  if (hour !== prefixHour) {
    prefixHour = hour;
    prefix = new Date(hour * 3_600_000).toISOString().slice(0, 14).replace('T', ' ');
  }
  const within = ms - hour * 3_600_000;
  const min = Math.floor(within / 60_000);
  const sec = Math.floor((within - min * 60_000) / 1000);
  return `${prefix}${PAD2[min]}:${PAD2[sec]}.${PAD3[within % 1000]}`;
}

/**
 * Resolves the repeated autumn hour: the first row at an ambiguous local time takes the first
 * occurrence, a second row at the same time (same target) the second. Memory: only rows in such hours.
 */
function ambiguityResolver() {
  const seen = new Set<string>();
  return (targetId: number, t: ParsedTime): number => {
    if (t.altMs === null) return t.ms;
    const key = `${targetId}|${t.ms}`;
    if (seen.has(key)) return t.altMs;
    seen.add(key);
    return t.ms;
  };
}

/** Builds the parser of one kind of upload for one job. */
export function createRowParser(ctx: RowContext): RowParser {
  // Hot path (every row): helpers are made once here, never per row; `sink` is the row's error callback
  // and `errs` counts errors so a row knows whether it added any.
  let errs = 0;
  let sink: (e: ImportRowError) => void = () => undefined;
  const report = (e: ImportRowError) => {
    errs++;
    sink(e);
  };
  const c = ctx.columns;
  const comma = ctx.separator === ';';
  const zone = ctx.site.timeZone;
  const resolve = ambiguityResolver();
  const labels: Record<string, string> = Object.fromEntries(IMPORT_COLUMNS[ctx.kind].map((x) => [x.key, x.label]));
  const label = (key: string) => labels[key] ?? key;
  const futureLimit = ctx.now + 5 * 60_000;
  const time: ParsedTime = { ms: 0, altMs: null, hasTime: false, date: '' };
  const smallIndex = new Map<number, number>();
  const indexOf = (id: number) => {
    let i = smallIndex.get(id);
    if (i === undefined) {
      i = smallIndex.size;
      smallIndex.set(id, i);
    }
    return i;
  };

  const sourceOf = (record: string[], line: number, what: string): SupplySource | null => {
    const text = cell(record, c.source);
    if (text === '') {
      if (ctx.defaultSource) return ctx.defaultSource;
      report({ row: line, column: label('source'), value: '', reason: `no ${what}: choose one on upload or fill this column` });
      return null;
    }
    const s = ctx.sources.get(text.toLowerCase());
    if (!s) report({ row: line, column: label('source'), value: clip(text), reason: `no ${what} with this name or number on this site` });
    return s ?? null;
  };

  const timeOf = (record: string[], line: number, targetId: number): number | null => {
    const text = cell(record, c.time);
    const t = parseTimeCell(text, zone, ctx.dateOrder, true, time);
    if (typeof t === 'string') {
      report({ row: line, column: label('time'), value: clip(text), reason: t });
      return null;
    }
    const ms = resolve(targetId, t);
    if (ms > futureLimit) {
      report({ row: line, column: label('time'), value: clip(text), reason: 'in the future' });
      return null;
    }
    return ms;
  };

  const noteOf = (record: string[], line: number): string | null => {
    const note = cell(record, c.note);
    if (note.length > 500) {
      report({ row: line, column: label('note'), value: clip(note), reason: 'longer than 500 characters' });
      return null;
    }
    return note;
  };

  const contentsOf = (source: SupplySource, reading: ReadingInput, line: number, column: string, value: string): number | null => {
    const cyl = source.cylinderTypeId ? (ctx.cylinderTypes.get(source.cylinderTypeId) ?? null) : null;
    try {
      return contentsOfReading(source, ctx.site, cyl, reading);
    } catch (e) {
      if (e instanceof AppError) {
        report({ row: line, column, value: clip(value), reason: e.message });
        return null;
      }
      throw e;
    }
  };

  const countOf = (record: string[], line: number, key: string, required: boolean): number | null => {
    const text = cell(record, c[key]);
    if (text === '' && !required) return 0;
    const v = numberOf(text, comma);
    if (Number.isNaN(v) || !Number.isInteger(v) || v < 0 || v > 100_000) {
      report({ row: line, column: label(key), value: clip(text), reason: text === '' ? 'missing' : 'a count of cylinders: a whole number from 0' });
      return null;
    }
    return v;
  };

  const gasIndex = new Map<string, number>(GAS_CODES_CATALOGUE.map((g, i) => [g.toLowerCase(), i]));
  const keyOf = (targetId: number, atMs: number, gasCode?: string): number => {
    if (ctx.kind === 'flow_meter_totals') return atMs;
    if (ctx.kind === 'historic_usage') return (atMs / 86_400_000) * 2 ** 20 + indexOf(targetId) * 32 + (gasIndex.get((gasCode ?? 'O2').toLowerCase()) ?? 0);
    // Exact below 2^53 until the year 2248; a file with over 1,024 tanks could alias two of them.
    return atMs * 1024 + (indexOf(targetId) % 1024);
  };

  const tankRow = (record: string[], line: number): ParsedRow | null => {
    const before = errs;
    const source = sourceOf(record, line, 'tank');
    const unitText = cell(record, c.unit) || ctx.defaultUnit || '';
    const kind = unitText ? tankUnitKind(unitText, source) : null;
    if (!kind)
      report({
        row: line,
        column: label('unit'),
        value: clip(unitText),
        reason: unitText
          ? `not a unit of a tank reading: use ${unitsAccepted('tank_readings', source)}`
          : 'missing: fill the unit column or choose the unit on upload',
      });
    const levelText = cell(record, c.level);
    const value = numberOf(levelText, comma);
    if (Number.isNaN(value)) report({ row: line, column: label('level'), value: clip(levelText), reason: levelText === '' ? 'missing' : 'not a number' });
    else if (kind === 'level_percent' && (value < 0 || value > 100))
      report({ row: line, column: label('level'), value: clip(levelText), reason: 'a level is 0–100 %' });
    else if ((kind === 'kg' || kind === 'litres_liquid') && value < 0)
      report({ row: line, column: label('level'), value: clip(levelText), reason: 'cannot be negative' });
    const at = timeOf(record, line, source?.id ?? 0);
    const note = noteOf(record, line);
    if (errs !== before || !source || !kind || at === null || note === null) return null;
    const contents = contentsOf(source, { kind, value, takenAt: '', method: 'import', note } as ReadingInput, line, label('level'), levelText);
    if (contents === null) return null;
    return {
      values: [source.id, formatUtc(at), kind, value, null, contents, 'import', ctx.userId, note],
      dupKey: keyOf(source.id, at),
      targetId: source.id,
      atMs: at,
    };
  };

  const storeRow = (record: string[], line: number): ParsedRow | null => {
    const before = errs;
    const source = sourceOf(record, line, 'cylinder store');
    const full = countOf(record, line, 'full', true);
    const empty = countOf(record, line, 'empty', false);
    const gaugeText = cell(record, c.in_use_gauges_bar);
    const gauges: number[] = [];
    if (gaugeText !== '') {
      for (const part of gaugeText.split(/[\s|]+/)) {
        const g = numberOf(part, comma);
        if (Number.isNaN(g) || g < 0 || g > 350) {
          report({ row: line, column: label('in_use_gauges_bar'), value: clip(gaugeText), reason: `“${clip(part)}” is not a gauge pressure of 0–350 bar` });
          break;
        }
        gauges.push(g);
      }
    }
    const at = timeOf(record, line, source?.id ?? 0);
    const note = noteOf(record, line);
    if (errs !== before || !source || full === null || empty === null || at === null || note === null) return null;
    const reading = { kind: 'store_count', full, inUseGaugeBar: gauges, empty, takenAt: '', method: 'import', note } as ReadingInput;
    const contents = contentsOf(source, reading, line, label('full'), String(full));
    if (contents === null) return null;
    return {
      values: [source.id, formatUtc(at), 'store_count', null, JSON.stringify({ full, inUseGaugeBar: gauges, empty }), contents, 'import', ctx.userId, note],
      dupKey: keyOf(source.id, at),
      targetId: source.id,
      atMs: at,
    };
  };

  const meterTarget = ctx.defaultWard;
  const meterIsWard = meterTarget !== null && !('type' in meterTarget);
  const meterRow = (record: string[], line: number): ParsedRow | null => {
    const before = errs;
    const unitText = cell(record, c.unit) || ctx.defaultUnit || '';
    const factor = unitText ? volumeUnitFactor(unitText) : null;
    if (factor === null)
      report({
        row: line,
        column: label('unit'),
        value: clip(unitText),
        reason: unitText ? 'use L or m3 (free gas at the reference conditions)' : 'missing: fill the unit column or choose the unit on upload',
      });
    const totalText = cell(record, c.total);
    const total = numberOf(totalText, comma);
    if (Number.isNaN(total) || total < 0)
      report({ row: line, column: label('total'), value: clip(totalText), reason: totalText === '' ? 'missing' : 'a meter total is a number from 0' });
    const at = timeOf(record, line, meterTarget?.id ?? 0);
    const note = noteOf(record, line);
    if (errs !== before || factor === null || at === null || note === null || !meterTarget) return null;
    return {
      values: [ctx.site.id, meterIsWard ? meterTarget.id : null, meterIsWard ? null : meterTarget.id, formatUtc(at), total * factor, note, ctx.jobId],
      dupKey: keyOf(meterTarget.id, at),
      targetId: meterTarget.id,
      atMs: at,
    };
  };

  const historyRow = (record: string[], line: number): ParsedRow | null => {
    const before = errs;
    const dateText = cell(record, c.date);
    const t = parseTimeCell(dateText, zone, ctx.dateOrder, false, time);
    let date: string | null = null;
    let dayMs = 0;
    if (typeof t === 'string') report({ row: line, column: label('date'), value: clip(dateText), reason: t });
    else if (t.hasTime) report({ row: line, column: label('date'), value: clip(dateText), reason: 'a day without a time, e.g. 2026-11-30' });
    else {
      date = t.date;
      dayMs = Date.UTC(+date.slice(0, 4), +date.slice(5, 7) - 1, +date.slice(8, 10));
      if (t.ms > ctx.now) report({ row: line, column: label('date'), value: clip(dateText), reason: 'in the future' });
    }
    const wardText = cell(record, c.ward);
    const ward = wardText ? ctx.wards.get(wardText.toLowerCase()) : undefined;
    if (!ward)
      report({ row: line, column: label('ward'), value: clip(wardText), reason: wardText ? 'no ward with this name or number on this site' : 'missing' });
    const gasText = cell(record, c.gas) || 'O2';
    const gi = gasIndex.get(gasText.toLowerCase());
    if (gi === undefined) report({ row: line, column: label('gas'), value: clip(gasText), reason: `not a gas code: ${GAS_CODES_CATALOGUE.join(', ')}` });
    const unitText = cell(record, c.unit) || ctx.defaultUnit || '';
    const factor = unitText ? volumeUnitFactor(unitText) : null;
    if (factor === null)
      report({
        row: line,
        column: label('unit'),
        value: clip(unitText),
        reason: unitText ? 'use L or m3 (free gas at the reference conditions)' : 'missing: fill the unit column or choose the unit on upload',
      });
    const volText = cell(record, c.volume);
    const vol = numberOf(volText, comma);
    if (Number.isNaN(vol) || vol < 0)
      report({ row: line, column: label('volume'), value: clip(volText), reason: volText === '' ? 'missing' : 'a volume is a number from 0' });
    const note = noteOf(record, line);
    if (errs !== before || !ward || gi === undefined || factor === null || date === null || note === null) return null;
    return {
      values: [ctx.site.id, ward.id, GAS_CODES_CATALOGUE[gi], date, vol * factor, note, ctx.jobId],
      dupKey: keyOf(ward.id, dayMs, GAS_CODES_CATALOGUE[gi]),
      targetId: ward.id,
      atMs: dayMs,
    };
  };

  const row = ctx.kind === 'tank_readings' ? tankRow : ctx.kind === 'store_counts' ? storeRow : ctx.kind === 'flow_meter_totals' ? meterRow : historyRow;
  const parse = (record: string[], line: number, onError: (e: ImportRowError) => void): ParsedRow | null => {
    sink = onError;
    return row(record, line);
  };
  const groupOf = (targetId: number, gasCode?: string): number =>
    ctx.kind === 'historic_usage' ? indexOf(targetId) * 32 + (gasIndex.get((gasCode ?? 'O2').toLowerCase()) ?? 0) : indexOf(targetId);
  return Object.assign(parse, { keyOf, groupOf });
}
/** True for a record that is an empty line (csv-parse passes it through as one empty field). */
export function isBlankRecord(record: string[]): boolean {
  if (record.length > 0 && record[0] !== '' && record[0].trim() !== '') return false;
  return record.every((v) => v.trim() === '');
}
