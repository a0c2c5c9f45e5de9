/**
 * Before/after of an audit entry as a list of fields: nested objects flatten to dotted paths, so an
 * edit shows exactly which values changed.
 */
export type DiffKind = 'added' | 'removed' | 'changed' | 'same';
export interface DiffRow {
  path: string;
  kind: DiffKind;
  before?: unknown;
  after?: unknown;
}

function isPlainObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function flatten(value: unknown, prefix: string, out: Map<string, unknown>): void {
  if (isPlainObject(value) && Object.keys(value).length > 0) {
    for (const [k, v] of Object.entries(value)) flatten(v, prefix ? `${prefix}.${k}` : k, out);
    return;
  }
  // arrays of objects (a supplier's prices) flatten by index; arrays of plain values stay whole
  if (Array.isArray(value) && value.some((v) => isPlainObject(v) || Array.isArray(v))) {
    value.forEach((v, i) => flatten(v, `${prefix}.${i}`, out));
    return;
  }
  out.set(prefix || '(value)', value);
}

function same(a: unknown, b: unknown): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}

export function diffSnapshots(before: unknown, after: unknown): DiffRow[] {
  const b = new Map<string, unknown>();
  const a = new Map<string, unknown>();
  if (before !== null && before !== undefined) flatten(before, '', b);
  if (after !== null && after !== undefined) flatten(after, '', a);
  const paths = [...new Set([...b.keys(), ...a.keys()])];
  return paths.map((path) => {
    const inB = b.has(path);
    const inA = a.has(path);
    if (inB && !inA) return { path, kind: 'removed', before: b.get(path) };
    if (!inB && inA) return { path, kind: 'added', after: a.get(path) };
    return { path, kind: same(b.get(path), a.get(path)) ? 'same' : 'changed', before: b.get(path), after: a.get(path) };
  });
}

/** A value as text for the diff table (never markup). */
export function showValue(v: unknown): string {
  if (v === undefined) return '';
  if (v === null) return 'empty';
  if (typeof v === 'string') return v === '' ? '(blank)' : v;
  return JSON.stringify(v);
}
