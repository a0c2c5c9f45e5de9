import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { LIST_PATH, ROOT, UPDATE_COMMAND, productionDependencies, readLock, renderList, type DependencyEntry, type Lock } from './deps-list';

/** Lines only in one of the two lists, as a reviewer would read a diff. */
function lineDiff(committed: string, fresh: string): string[] {
  const a = committed.split('\n').map((l) => l.trim().replace(/,$/, ''));
  const b = fresh.split('\n').map((l) => l.trim().replace(/,$/, ''));
  const inA = new Set(a);
  const inB = new Set(b);
  return [...a.filter((l) => !inB.has(l)).map((l) => `- ${l}`), ...b.filter((l) => !inA.has(l)).map((l) => `+ ${l}`)];
}

describe('the committed list of production dependencies', () => {
  it('matches package-lock.json (a new or changed dependency is a reviewed diff)', () => {
    const fresh = renderList(productionDependencies(readLock()));
    let committed = '';
    try {
      committed = readFileSync(path.join(ROOT, LIST_PATH), 'utf8');
    } catch {
      // missing: the diff below lists every package
    }
    const diff = lineDiff(committed, fresh);
    const message = `${LIST_PATH} differs from package-lock.json:\n${diff.slice(0, 60).join('\n')}${diff.length > 60 ? `\n… and ${diff.length - 60} more lines` : ''}\n\nIf the dependency change is intended, run \`${UPDATE_COMMAND}\` and commit ${LIST_PATH} with package.json and package-lock.json (the reviewer checks each new package and its licence).`;
    expect(committed === fresh, message).toBe(true);
  });

  it('holds exactly the packages npm itself marks as not dev-only in the lock file', () => {
    // npm records "dev": true / "devOptional": true on packages that only devDependencies pull in; the
    // closure computed here must agree with npm's own.
    const lock = readLock();
    const npmProd = new Set(
      Object.entries(lock.packages as Record<string, { version?: string; dev?: boolean; devOptional?: boolean }>)
        .filter(([k, p]) => k !== '' && !p.dev && !p.devOptional && !k.startsWith('node_modules/.'))
        .map(([k, p]) => `${k.slice(k.lastIndexOf('node_modules/') + 13)}@${p.version}`),
    );
    const mine = new Set(productionDependencies(lock).map((e) => `${e.name}@${e.version}`));
    expect([...mine].filter((x) => !npmProd.has(x))).toEqual([]);
    expect([...npmProd].filter((x) => !mine.has(x))).toEqual([]);
  });

  it('pins every direct dependency to the exact version in the lock file', () => {
    const pkg = JSON.parse(readFileSync(path.join(ROOT, 'package.json'), 'utf8')) as { dependencies: Record<string, string> };
    const lock = readLock();
    const loose = Object.entries(pkg.dependencies).filter(([name, range]) => lock.packages[`node_modules/${name}`]?.version !== range);
    expect(loose, `pin these in package.json to the version in package-lock.json: ${loose.map(([n, r]) => `${n} ${r}`).join(', ')}`).toEqual([]);
  });
});

describe('productionDependencies', () => {
  // A hand-made lock file (npm lockfileVersion 3 layout): app needs a@1 and c; a needs b@2 (nested under
  // a, since the top level holds b@1 for the dev tool d); c has an optional dependency for another
  // platform (absent), a required peer (present) and an optional peer (present, but only dev needs it).
  const lock: Lock = {
    lockfileVersion: 3,
    packages: {
      '': { dependencies: { a: '1.0.0', c: '3.0.0' }, devDependencies: { d: '4.0.0' } } as never,
      'node_modules/a': { version: '1.0.0', license: 'MIT', dependencies: { b: '^2' } },
      'node_modules/a/node_modules/b': { version: '2.1.0', license: 'ISC' },
      'node_modules/b': { version: '1.5.0', license: 'MIT' },
      'node_modules/c': {
        version: '3.0.0',
        optionalDependencies: { 'c-win32': '3.0.0' },
        peerDependencies: { p: '*', q: '*' },
        peerDependenciesMeta: { q: { optional: true } },
      },
      'node_modules/p': { version: '0.1.0', license: 'Apache-2.0' },
      'node_modules/q': { version: '0.2.0', license: 'MIT' },
      'node_modules/d': { version: '4.0.0', license: 'MIT', dependencies: { b: '^1', q: '*' } },
    },
  };
  // c declares no licence in the lock; its package.json names it the old way ({ type }).
  const read = (at: string) => (at === 'node_modules/c' ? { license: { type: 'BSD-3-Clause' } } : null);

  it('follows dependencies as node resolves them, leaves dev tools out and reads licences', () => {
    const got = productionDependencies(lock, read);
    const want: DependencyEntry[] = [
      { name: 'a', version: '1.0.0', license: 'MIT', direct: true },
      { name: 'b', version: '2.1.0', license: 'ISC', direct: false },
      { name: 'c', version: '3.0.0', license: 'BSD-3-Clause', direct: true },
      { name: 'p', version: '0.1.0', license: 'Apache-2.0', direct: false },
    ];
    expect(got).toEqual(want);
  });

  it('refuses a lock file that lacks a required package', () => {
    const broken: Lock = { packages: { '': { dependencies: { a: '1.0.0' } }, 'node_modules/a': { version: '1.0.0', dependencies: { gone: '1' } } } };
    expect(() => productionDependencies(broken, () => null)).toThrow(/lacks gone \(needed by node_modules\/a\)/);
  });

  it('renders one package per line, so adding one is a one-line diff', () => {
    const before = renderList(productionDependencies(lock, read));
    const withNew: Lock = {
      packages: { ...lock.packages, '': { dependencies: { a: '1.0.0', c: '3.0.0', n: '9.0.0' } }, 'node_modules/n': { version: '9.0.0', license: 'MIT' } },
    };
    const after = renderList(productionDependencies(withNew, read));
    expect(lineDiff(before, after)).toEqual([
      '- "count": 4',
      '- "licences": "Apache-2.0: 1, BSD-3-Clause: 1, ISC: 1, MIT: 1"',
      '+ "count": 5',
      '+ "licences": "MIT: 2, Apache-2.0: 1, BSD-3-Clause: 1, ISC: 1"',
      '+ {"name":"n","version":"9.0.0","license":"MIT","direct":true}',
    ]);
  });
});
