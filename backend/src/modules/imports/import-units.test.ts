import { describe, expect, it } from 'vitest';
import { tankUnitKind, volumeUnitFactor } from './import-rows';

// The names a plain object answers through Object.prototype (ECMAScript), in a CSV unit cell.
const PROTOTYPE_NAMES = ['__proto__', 'constructor', 'prototype', 'toString', 'hasOwnProperty', 'valueOf', 'CONSTRUCTOR', ' __proto__ '];

describe('units of an uploaded file', () => {
  it('knows the written units', () => {
    expect(tankUnitKind('%', null)).toBe('level_percent');
    expect(tankUnitKind('Kg', null)).toBe('kg');
    expect(volumeUnitFactor('m3')).toBe(1000); // 1 m³ = 1000 L (SI)
    expect(volumeUnitFactor('L')).toBe(1);
  });

  it('takes a prototype name for no unit', () => {
    for (const name of PROTOTYPE_NAMES) {
      expect(tankUnitKind(name, null), name).toBeNull();
      expect(volumeUnitFactor(name), name).toBeNull();
    }
  });
});
