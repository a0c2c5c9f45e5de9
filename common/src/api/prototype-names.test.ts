import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { InvalidInputError } from './errors';
import { convertVolume, type VolumeUnit } from '../gas/units';
import { lookupViscosityPaS } from '../capacity/pipe-hydraulics';
import { copyRuleSet } from '../capacity/diversity-rules';
import { buildDemandLinesFromTherapy, type TherapyLine } from '../forecast/demand-model';

/**
 * The names a plain object answers through Object.prototype (ECMAScript: Object.prototype and its
 * properties), sent where the engines take a name: each must be refused as unknown like any other
 * unknown name, never taken for a unit, gas, rule set, device or verb.
 */
const PROTOTYPE_NAMES = ['__proto__', 'constructor', 'prototype', 'toString', 'hasOwnProperty', 'valueOf'];
const repoRoot = fileURLToPath(new URL('../../../', import.meta.url));

describe('prototype names are unknown names', () => {
  it('volume units', () => {
    for (const name of PROTOTYPE_NAMES) {
      expect(() => convertVolume(1, name as VolumeUnit, 'L'), name).toThrow(InvalidInputError);
      expect(() => convertVolume(1, 'L', name as VolumeUnit), name).toThrow(InvalidInputError);
    }
  });

  it('gas viscosities', () => {
    for (const name of PROTOTYPE_NAMES) expect(() => lookupViscosityPaS(name), name).toThrow(InvalidInputError);
  });

  it('shipped rule sets to copy', () => {
    for (const name of PROTOTYPE_NAMES) expect(() => copyRuleSet(name, 'copy'), name).toThrow(InvalidInputError);
  });

  it('oxygen devices of a therapy line', () => {
    for (const name of PROTOTYPE_NAMES) {
      expect(() => buildDemandLinesFromTherapy([{ device: name as TherapyLine['device'], patients: 2 }]), name).toThrow(InvalidInputError);
    }
  });

  it('calc verbs on the command line: exit 2 naming the known verbs', () => {
    for (const name of PROTOTYPE_NAMES) {
      const r = spawnSync(process.execPath, ['--import', 'tsx', 'scripts/calc.ts', name], { cwd: repoRoot, input: '{}', encoding: 'utf8', timeout: 60_000 });
      expect(r.status, `${name}: ${r.stdout}`).toBe(2);
      const body = JSON.parse(r.stdout);
      expect(body.error.code).toBe('invalid_input');
      expect(body.error.details[0].path).toBe('verb');
    }
  }, 120_000);
});
