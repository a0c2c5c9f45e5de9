/**
 * The committed list of production dependencies: every package that `dependencies` in package.json
 * pulls in (the transitive closure, dev tools left out), with its version and licence, read from
 * package-lock.json. A unit test (scripts/deps-list.test.ts) builds the list again from the lock file and
 * fails when it differs from the committed one, so a new or changed dependency is a reviewed diff even
 * where no advisory service can be reached.
 *
 *   npm run deps:list          writes scripts/dependencies.json (run after adding or updating a package)
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
export const LIST_PATH = 'scripts/dependencies.json';
export const UPDATE_COMMAND = 'npm run deps:list';

interface LockPackage {
  version?: string;
  license?: string;
  dependencies?: Record<string, string>;
  optionalDependencies?: Record<string, string>;
  peerDependencies?: Record<string, string>;
  peerDependenciesMeta?: Record<string, { optional?: boolean }>;
  link?: boolean;
  resolved?: string;
}
export interface Lock {
  lockfileVersion?: number;
  packages: Record<string, LockPackage>;
}
export interface DependencyEntry {
  name: string;
  version: string;
  license: string;
  /** Named in package.json `dependencies` (the rest come with them). */
  direct: boolean;
}

const nameOf = (lockPath: string) => lockPath.slice(lockPath.lastIndexOf('node_modules/') + 'node_modules/'.length);

/** Where node would find `name` from the package at `from` (its own node_modules, then each parent's). */
function resolve(lock: Lock, from: string, name: string): string | null {
  let dir = from;
  for (;;) {
    const candidate = `${dir ? `${dir}/` : ''}node_modules/${name}`;
    if (Object.hasOwn(lock.packages, candidate)) return candidate;
    if (!dir) return null;
    const cut = dir.lastIndexOf('/node_modules/');
    dir = cut < 0 ? '' : dir.slice(0, cut);
  }
}

/** A package's licence: the lock file's `license`, else its package.json in node_modules, else UNKNOWN. */
function licenceOf(lockPath: string, p: LockPackage, readPackageJson: (lockPath: string) => unknown): string {
  if (typeof p.license === 'string' && p.license) return p.license;
  const pj = readPackageJson(lockPath) as { license?: unknown; licenses?: unknown } | null;
  const l = pj?.license;
  if (typeof l === 'string' && l) return l;
  if (l && typeof l === 'object' && typeof (l as { type?: unknown }).type === 'string') return (l as { type: string }).type;
  if (Array.isArray(pj?.licenses)) return pj.licenses.map((x: { type?: string }) => x?.type ?? '?').join(' OR ');
  return 'UNKNOWN';
}

export function readInstalledPackageJson(lockPath: string): unknown {
  const file = path.join(ROOT, lockPath, 'package.json');
  return existsSync(file) ? JSON.parse(readFileSync(file, 'utf8')) : null;
}

/**
 * The production closure of a lock file: the root's `dependencies` and `optionalDependencies`, then each
 * package's dependencies, optional dependencies and peers, resolved as node resolves them. An
 * optional dependency or peer absent from the lock (another platform's build) is skipped; a required one absent
 * is an error, since the lock file would then be incomplete.
 */
export function productionDependencies(lock: Lock, readPackageJson: (lockPath: string) => unknown = readInstalledPackageJson): DependencyEntry[] {
  if (!lock.packages || !Object.hasOwn(lock.packages, ''))
    throw new Error('package-lock.json has no "packages" section with the root package: regenerate it with npm 7 or later');
  const root = lock.packages[''];
  const direct = new Set(Object.keys(root.dependencies ?? {}));
  const seen = new Set<string>();
  const queue: [from: string, name: string, optional: boolean][] = [
    ...Object.keys(root.dependencies ?? {}).map((n): [string, string, boolean] => ['', n, false]),
    ...Object.keys(root.optionalDependencies ?? {}).map((n): [string, string, boolean] => ['', n, true]),
  ];
  while (queue.length) {
    const [from, name, optional] = queue.shift()!;
    let at = resolve(lock, from, name);
    if (at === null) {
      if (optional) continue;
      throw new Error(`package-lock.json lacks ${name} (needed by ${from || 'package.json'}): run npm install`);
    }
    // A linked package (a workspace or file: dependency) is read where it points.
    const linked = lock.packages[at];
    if (linked.link && linked.resolved && Object.hasOwn(lock.packages, linked.resolved)) at = linked.resolved;
    if (seen.has(at)) continue;
    seen.add(at);
    const p = lock.packages[at];
    for (const n of Object.keys(p.dependencies ?? {})) queue.push([at, n, false]);
    for (const n of Object.keys(p.optionalDependencies ?? {})) queue.push([at, n, true]);
    // An optional peer (peerDependenciesMeta) is the user's choice, not a dependency.
    for (const n of Object.keys(p.peerDependencies ?? {})) if (!p.peerDependenciesMeta?.[n]?.optional) queue.push([at, n, true]);
  }
  const byKey = new Map<string, DependencyEntry>();
  for (const at of seen) {
    const p = lock.packages[at];
    const name = nameOf(at);
    const version = p.version ?? '?';
    const key = `${name}@${version}`;
    if (byKey.has(key)) continue;
    byKey.set(key, { name, version, license: licenceOf(at, p, readPackageJson), direct: direct.has(name) && at === `node_modules/${name}` });
  }
  return [...byKey.values()].sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : a.version < b.version ? -1 : a.version > b.version ? 1 : 0));
}

/** The committed file: one package per line, so a change reads as a one-line diff. */
export function renderList(entries: DependencyEntry[]): string {
  const licences = new Map<string, number>();
  for (const e of entries) licences.set(e.license, (licences.get(e.license) ?? 0) + 1);
  const summary = [...licences]
    .sort((a, b) => b[1] - a[1] || (a[0] < b[0] ? -1 : 1))
    .map(([l, n]) => `${l}: ${n}`)
    .join(', ');
  const lines = entries.map((e) => `    ${JSON.stringify(e)}`);
  return [
    '{',
    `  "about": ${JSON.stringify(`Production dependencies of package.json (transitive), from package-lock.json. Generated by \`${UPDATE_COMMAND}\`: do not edit by hand.`)},`,
    `  "count": ${entries.length},`,
    `  "licences": ${JSON.stringify(summary)},`,
    '  "packages": [',
    lines.join(',\n'),
    '  ]',
    '}',
    '',
  ].join('\n');
}

export function readLock(): Lock {
  return JSON.parse(readFileSync(path.join(ROOT, 'package-lock.json'), 'utf8')) as Lock;
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const entries = productionDependencies(readLock());
  writeFileSync(path.join(ROOT, LIST_PATH), renderList(entries));
  const unknown = entries.filter((e) => e.license === 'UNKNOWN');
  console.log(`${LIST_PATH}: ${entries.length} production packages${unknown.length ? `; no licence found for ${unknown.map((e) => e.name).join(', ')}` : ''}`);
}
