/**
 * Every `npm run` script must point at something that exists: a file of this repository (extension-less
 * shell scripts also parse with `bash -n`), or a program that an installed package provides. A script
 * renamed or removed without its package.json entry fails here instead of in a contributor's terminal.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

const root = fileURLToPath(new URL('../../', import.meta.url));
const pkg = JSON.parse(readFileSync(path.join(root, 'package.json'), 'utf8')) as { scripts: Record<string, string> };

/** The entry of a script: its first repository file, else the program it runs. */
function entryOf(command: string): { file?: string; program?: string } {
  const words = command.split(/\s+/).filter(Boolean);
  const file = words.find((w) => /^(scripts|backend|frontend|common|tests)\//.test(w));
  if (file) return { file };
  return { program: words[0] === 'npx' ? words[1] : words[0] };
}

describe('npm run scripts', () => {
  const scripts = Object.entries(pkg.scripts);
  it('lists at least the two commands of the README', () => {
    expect(pkg.scripts.start).toBe('scripts/start');
    expect(pkg.scripts.test).toBe('scripts/test');
  });

  it.each(scripts)('%s: its entry exists', (_name, command) => {
    const { file, program } = entryOf(command);
    if (file) {
      const full = path.join(root, file);
      expect(existsSync(full), `${file} (from "${command}") does not exist`).toBe(true);
      if (!path.extname(file)) {
        const check = spawnSync('bash', ['-n', full], { encoding: 'utf8' });
        expect(check.status, check.stderr).toBe(0);
      }
    } else {
      const bin = path.join(root, 'node_modules', '.bin', program!);
      expect(existsSync(bin) || program === 'node', `"${program}" (from "${command}") is not an installed program`).toBe(true);
    }
  });

  it('calc answers with the contract error when no verb is named (the entry runs)', () => {
    let out = '';
    let status = 0;
    try {
      out = execFileSync('node', ['--import', 'tsx', 'scripts/calc.ts'], { cwd: root, encoding: 'utf8', input: '' });
    } catch (e) {
      const err = e as { status: number; stdout: string };
      status = err.status;
      out = err.stdout;
    }
    expect(status).toBe(2);
    expect(JSON.parse(out).error.code).toBe('invalid_input');
  });
});
