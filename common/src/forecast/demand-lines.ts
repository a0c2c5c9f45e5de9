import { InvalidInputError, type FieldIssue } from '../api/errors';
import { boundaryOfLocalTime, type HourIndex } from './hour-index';

/**
 * One line of demand: a flow of free gas (at the forecast's reference conditions) that runs during the
 * listed local clock hours (0–23) on the listed ISO weekdays (1 = Monday … 7 = Sunday). Missing hours
 * or weekdays mean "all". Lines add up. `from` (inclusive) and `until` (exclusive) limit the line to a
 * window of local wall-clock time (`yyyy-MM-ddTHH:mm`); scenarios use them.
 *
 * Field names follow the JSON contract shared by the calc verb, the API and stored demand models.
 */
export interface DemandLine {
  flow_L_min: number;
  hours?: readonly number[];
  weekdays?: readonly number[];
  from?: string;
  until?: string;
  label?: string;
}

/**
 * A what-if applied over the baseline from a local date: a multiplier on every line present so far
 * (baseline and earlier scenarios' extra lines) and/or extra lines (e.g. 10 more high-flow beds at
 * 40 L/min). `from` inclusive, `until` exclusive; both optional (open-ended).
 */
export interface DemandScenario {
  name?: string;
  from?: string;
  until?: string;
  multiplier?: number;
  extra_lines?: readonly DemandLine[];
}

/** Validates demand lines, returning every problem with its path (prefix e.g. "demand"). */
export function checkDemandLines(lines: readonly DemandLine[], pathPrefix = 'demand'): FieldIssue[] {
  const issues: FieldIssue[] = [];
  lines.forEach((line, k) => {
    const p = `${pathPrefix}.${k}`;
    if (typeof line.flow_L_min !== 'number' || !Number.isFinite(line.flow_L_min) || line.flow_L_min < 0) {
      issues.push({ path: `${p}.flow_L_min`, message: 'flow must be a finite number ≥ 0 L/min' });
    }
    line.hours?.forEach((h, j) => {
      if (!Number.isInteger(h) || h < 0 || h > 23) issues.push({ path: `${p}.hours.${j}`, message: 'local clock hour must be an integer 0–23' });
    });
    line.weekdays?.forEach((d, j) => {
      if (!Number.isInteger(d) || d < 1 || d > 7)
        issues.push({ path: `${p}.weekdays.${j}`, message: 'ISO weekday must be an integer 1 (Monday) – 7 (Sunday)' });
    });
  });
  return issues;
}

function requireValidLines(lines: readonly DemandLine[], pathPrefix: string): void {
  const issues = checkDemandLines(lines, pathPrefix);
  if (issues.length > 0) throw new InvalidInputError(`Invalid demand: ${issues[0].path}: ${issues[0].message}`, issues);
}

/**
 * Adds a line's flow into a 168-slot weekly profile, L per hour (slot = (isoWeekday − 1)·24 + hour).
 * @param profileLPerHour Float64Array(168), accumulated in place
 * @param scale extra factor on the flow (1 for plain lines)
 */
export function addLineToWeekProfile(profileLPerHour: Float64Array, line: DemandLine, scale = 1): void {
  const lPerHour = line.flow_L_min * 60 * scale;
  if (lPerHour === 0) return;
  // Masks, so that a day or hour listed twice by mistake counts once.
  let dayMask = 0x7f;
  if (line.weekdays && line.weekdays.length > 0) {
    dayMask = 0;
    for (const d of line.weekdays) dayMask |= 1 << (d - 1);
  }
  let hourMask = 0xffffff;
  if (line.hours && line.hours.length > 0) {
    hourMask = 0;
    for (const h of line.hours) hourMask |= 1 << h;
  }
  for (let d = 0; d < 7; d++) {
    if ((dayMask & (1 << d)) === 0) continue;
    const base = d * 24;
    for (let h = 0; h < 24; h++) if ((hourMask & (1 << h)) !== 0) profileLPerHour[base + h] += lPerHour;
  }
}

/**
 * Hourly demand over a forecast's hour grid, litres of free gas per elapsed hour (Float64Array, one value
 * per hour of `index`). Method: lines with the same time window are first summed into a 168-slot weekly
 * profile (hour of day × ISO weekday), then the profile is read through the grid's precomputed week
 * slots — O(lines·168 + hours), no date arithmetic per hour. Each hour's demand is its flow (L/min) × 60:
 * every grid hour is a full real hour, so clock changes add or drop whole hours of demand.
 * @param lines demand lines (flow_L_min ≥ 0; hours 0–23; weekdays 1–7; optional from/until local times)
 * @param index the shared hour grid (buildHourIndex)
 * @param pathPrefix field path used in errors
 */
export function buildHourlyDemand(lines: readonly DemandLine[], index: HourIndex, pathPrefix = 'demand'): Float64Array {
  requireValidLines(lines, pathPrefix);
  const H = index.hours;
  const out = new Float64Array(H);
  const groups = new Map<string, { from: number; until: number; profile: Float64Array }>();
  lines.forEach((line, k) => {
    const from = line.from ? Math.max(0, boundaryOfLocalTime(index, line.from, `${pathPrefix}.${k}.from`)) : 0;
    const until = line.until ? Math.min(H, boundaryOfLocalTime(index, line.until, `${pathPrefix}.${k}.until`)) : H;
    if (until <= from) return;
    const key = `${from}|${until}`;
    let g = groups.get(key);
    if (!g) {
      g = { from, until, profile: new Float64Array(168) };
      groups.set(key, g);
    }
    addLineToWeekProfile(g.profile, line);
  });
  const slot = index.weekSlot;
  for (const g of groups.values()) {
    const p = g.profile;
    for (let i = g.from; i < g.until; i++) out[i] += p[slot[i]];
  }
  return out;
}

/** Normalises `yyyy-MM-ddTHH:mm[:ss]` for ordering (local wall-clock strings sort chronologically). */
function key(local: string | undefined): string | undefined {
  return local === undefined ? undefined : local.length === 16 ? `${local}:00` : local;
}

function laterOf(a: string | undefined, b: string | undefined): string | undefined {
  if (a === undefined) return b;
  if (b === undefined) return a;
  return key(a)! >= key(b)! ? a : b;
}

function earlierOf(a: string | undefined, b: string | undefined): string | undefined {
  if (a === undefined) return b;
  if (b === undefined) return a;
  return key(a)! <= key(b)! ? a : b;
}

function before(a: string | undefined, b: string | undefined): boolean {
  // Undefined `a` as a start is −∞; undefined `b` as an end is +∞.
  if (a === undefined || b === undefined) return true;
  return key(a)! < key(b)!;
}

function withWindow(line: DemandLine, from: string | undefined, until: string | undefined, flow = line.flow_L_min): DemandLine {
  const out: DemandLine = { ...line, flow_L_min: flow };
  if (from === undefined) delete out.from;
  else out.from = from;
  if (until === undefined) delete out.until;
  else out.until = until;
  return out;
}

/**
 * Applies scenarios in order to a baseline and returns a NEW list of lines (the baseline and the
 * scenarios are never mutated). A multiplier m on a line splits it at the scenario window: the part
 * inside carries flow × m, the parts outside keep their flow. Extra lines are added inside the window
 * (intersected with their own from/until). Later scenarios scale earlier scenarios' extra lines too.
 * @param baseLines baseline demand lines (flows in L/min)
 * @param scenarios surge multipliers (≥ 0) and/or extra lines, with optional local from/until
 */
export function applyScenarios(baseLines: readonly DemandLine[], scenarios: readonly DemandScenario[]): DemandLine[] {
  let lines: DemandLine[] = baseLines.map((l) => ({ ...l }));
  scenarios.forEach((sc, k) => {
    if (sc.multiplier !== undefined && (!Number.isFinite(sc.multiplier) || sc.multiplier < 0)) {
      throw new InvalidInputError('A scenario multiplier must be a finite number ≥ 0', [{ path: `scenarios.${k}.multiplier`, message: 'must be ≥ 0' }]);
    }
    if (sc.from !== undefined && sc.until !== undefined && !before(sc.from, sc.until)) {
      throw new InvalidInputError('A scenario must end after it starts', [{ path: `scenarios.${k}.until`, message: 'must be after from' }]);
    }
    const m = sc.multiplier ?? 1;
    if (m !== 1) {
      const next: DemandLine[] = [];
      for (const line of lines) {
        const lo = laterOf(line.from, sc.from);
        const hi = earlierOf(line.until, sc.until);
        if (!before(lo, hi)) {
          next.push(line);
          continue;
        }
        if (sc.from !== undefined && before(line.from, sc.from)) next.push(withWindow(line, line.from, sc.from));
        next.push(withWindow(line, lo, hi, line.flow_L_min * m));
        if (sc.until !== undefined && (line.until === undefined || key(sc.until)! < key(line.until)!)) {
          next.push(withWindow(line, sc.until, line.until));
        }
      }
      lines = next;
    }
    if (sc.extra_lines) {
      requireValidLines(sc.extra_lines, `scenarios.${k}.extra_lines`);
      for (const extra of sc.extra_lines) {
        const lo = laterOf(extra.from, sc.from);
        const hi = earlierOf(extra.until, sc.until);
        if (lo !== undefined && hi !== undefined && key(lo)! >= key(hi)!) continue;
        const label = extra.label ?? sc.name;
        lines.push(withWindow(label === undefined ? { ...extra } : { ...extra, label }, lo, hi));
      }
    }
  });
  return lines;
}
