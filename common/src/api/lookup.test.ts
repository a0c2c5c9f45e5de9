import { describe, expect, it } from 'vitest';
import { hasKey, lookup } from './lookup';

// The names every plain object answers through Object.prototype (ECMAScript, Object.prototype properties).
const PROTOTYPE_NAMES = ['__proto__', 'constructor', 'prototype', 'toString', 'hasOwnProperty', 'valueOf', 'isPrototypeOf'];

describe('lookup', () => {
  const table = { kg: 1, l: 2 };
  it('answers own keys', () => {
    expect(lookup(table, 'kg')).toBe(1);
    expect(hasKey(table, 'l')).toBe(true);
  });
  it('answers nothing for prototype names, unknown keys and non-strings', () => {
    for (const name of PROTOTYPE_NAMES) {
      if (name !== 'prototype') expect((table as Record<string, unknown>)[name], `${name} is found by plain indexing`).not.toBeUndefined();
      expect(lookup(table, name), name).toBeUndefined();
      expect(hasKey(table, name), name).toBe(false);
    }
    expect(lookup(table, 'm3')).toBeUndefined();
    expect(lookup(table, undefined)).toBeUndefined();
    expect(lookup(table, 1)).toBeUndefined();
  });
});
