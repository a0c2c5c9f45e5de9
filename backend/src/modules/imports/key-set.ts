/**
 * A compact hash map from row keys (finite doubles) to the file line that first used them, for finding
 * duplicate rows in an upload: open addressing with linear probing over typed arrays, 12 bytes per slot,
 * about 24 bytes per row at the maximum load of one half — a million rows in about 24 MB, where a JS
 * Map would take several times that. Past `maxKeys` it stops adding (and says so), so memory stays
 * bounded for any file; the import's own duplicate query in the database still catches the rest.
 */
export class KeyLineMap {
  private keys: Float64Array;
  private lines: Int32Array;
  private used = 0;
  private mask: number;
  full = false;

  constructor(
    initialCapacity = 1 << 16,
    private readonly maxKeys = 8_000_000,
  ) {
    let cap = 1;
    while (cap < initialCapacity) cap <<= 1;
    this.keys = new Float64Array(cap);
    this.lines = new Int32Array(cap);
    this.mask = cap - 1;
  }

  get size(): number {
    return this.used;
  }

  private static hash(k: number): number {
    const lo = (k % 4294967296) | 0;
    const hi = (k / 4294967296) | 0;
    let h = Math.imul(lo ^ Math.imul(hi, 0x9e3779b1), 0x85ebca6b);
    h ^= h >>> 13;
    h = Math.imul(h, 0xc2b2ae35);
    return (h ^ (h >>> 16)) >>> 0;
  }

  /** Line of the row that used `key` first, or 0 when the key is new (then it is recorded with `line`). */
  addOrGet(key: number, line: number): number {
    let i = KeyLineMap.hash(key) & this.mask;
    while (this.lines[i] !== 0) {
      if (this.keys[i] === key) return this.lines[i];
      i = (i + 1) & this.mask;
    }
    if (this.full) return 0;
    this.keys[i] = key;
    this.lines[i] = line;
    this.used++;
    if (this.used * 2 > this.keys.length) this.grow();
    return 0;
  }

  /** Line that used `key`, or 0. */
  get(key: number): number {
    let i = KeyLineMap.hash(key) & this.mask;
    while (this.lines[i] !== 0) {
      if (this.keys[i] === key) return this.lines[i];
      i = (i + 1) & this.mask;
    }
    return 0;
  }

  private grow(): void {
    if (this.used >= this.maxKeys) {
      this.full = true;
      return;
    }
    const oldKeys = this.keys;
    const oldLines = this.lines;
    this.keys = new Float64Array(oldKeys.length * 2);
    this.lines = new Int32Array(oldKeys.length * 2);
    this.mask = this.keys.length - 1;
    for (let j = 0; j < oldKeys.length; j++) {
      if (oldLines[j] === 0) continue;
      let i = KeyLineMap.hash(oldKeys[j]) & this.mask;
      while (this.lines[i] !== 0) i = (i + 1) & this.mask;
      this.keys[i] = oldKeys[j];
      this.lines[i] = oldLines[j];
    }
  }
}

/** Growable parallel typed arrays of runs: start time, step, count, first line, line step. */
class Runs {
  start = new Float64Array(16);
  step = new Float64Array(16);
  count = new Int32Array(16);
  line = new Int32Array(16);
  lineStep = new Int32Array(16);
  n = 0;

  push(t: number, line: number): void {
    if (this.n === this.start.length) {
      const grow = <T extends Float64Array | Int32Array>(a: T): T => {
        const b = new (a.constructor as new (n: number) => T)(a.length * 2);
        b.set(a);
        return b;
      };
      this.start = grow(this.start);
      this.step = grow(this.step);
      this.count = grow(this.count);
      this.line = grow(this.line);
      this.lineStep = grow(this.lineStep);
    }
    this.start[this.n] = t;
    this.step[this.n] = 0;
    this.count[this.n] = 1;
    this.line[this.n] = line;
    this.lineStep[this.n] = 0;
    this.n++;
  }

  /** Line of the entry at time t, or 0. Runs are in time order (entries only ever increase). */
  lineOf(t: number): number {
    let lo = 0;
    let hi = this.n - 1;
    if (hi < 0 || t < this.start[0]) return 0;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (this.start[mid] <= t) lo = mid;
      else hi = mid - 1;
    }
    const d = t - this.start[lo];
    if (d === 0) return this.line[lo];
    const step = this.step[lo];
    if (step <= 0 || d % step !== 0) return 0;
    const k = d / step;
    return k < this.count[lo] ? this.line[lo] + k * this.lineStep[lo] : 0;
  }
}

interface GroupState {
  last: number;
  lastLine: number;
  runs: Runs;
  /** Set once a row could not be recorded (tracker full): the runs stop growing, so they never claim a time that was not there. */
  frozen: boolean;
}

/**
 * Finds rows that repeat a slot (a target and a time) in one pass, in memory that does not grow with
 * a regular series: rows arriving in time order are kept as runs of equal steps (a year of 1-minute
 * telemetry is one run), so only irregular and out-of-order rows cost memory of their own (those go
 * to a KeyLineMap). Every hit names the line of the earlier row.
 */
export class SlotTracker {
  private groups = new Map<number, GroupState>();
  private outOfOrder = new KeyLineMap(1 << 10, 4_000_000);
  private runsTotal = 0;
  /** Past this many runs (a very irregular file) the tracker stops adding and says so. */
  full = false;

  constructor(private readonly maxRuns = 4_000_000) {}

  /**
   * Records a row at `t` in `group` (with `key` identifying the slot exactly); returns the line of an
   * earlier row in the same slot, or 0 when the slot is new.
   */
  add(group: number, t: number, key: number, line: number): number {
    let g = this.groups.get(group);
    if (!g) {
      g = { last: Number.NEGATIVE_INFINITY, lastLine: 0, runs: new Runs(), frozen: false };
      this.groups.set(group, g);
    }
    if (t > g.last) {
      const r = g.runs;
      const i = r.n - 1;
      if (!g.frozen) {
        if (i >= 0 && r.count[i] === 1) {
          r.step[i] = t - r.start[i];
          r.lineStep[i] = line - r.line[i];
          r.count[i] = 2;
        } else if (i >= 0 && t - g.last === r.step[i] && line - g.lastLine === r.lineStep[i]) {
          r.count[i]++;
        } else if (!this.full) {
          r.push(t, line);
          if (++this.runsTotal >= this.maxRuns) this.full = true;
        } else g.frozen = true;
      }
      g.last = t;
      g.lastLine = line;
      return 0;
    }
    if (t === g.last) return g.lastLine;
    const earlier = g.runs.lineOf(t);
    if (earlier) return earlier;
    const first = this.outOfOrder.addOrGet(key, line);
    if (this.outOfOrder.full) this.full = true;
    return first;
  }

  /** Line of a row in `group` at `t` (slot `key`), or 0. */
  lineOf(group: number, t: number, key: number): number {
    const g = this.groups.get(group);
    if (!g) return 0;
    if (t === g.last) return g.lastLine;
    return g.runs.lineOf(t) || this.outOfOrder.get(key);
  }
}
