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
    const lo = k % 4294967296 | 0;
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
