/**
 * Look-ups of outside values (request fields, CSV cells, stored JSON) in constant tables. A plain object
 * answers `__proto__`, `constructor`, `toString` … through its prototype, so `TABLE[value]` on user input
 * can hand out `Object.prototype` or one of its methods. These helpers answer only the table's own keys.
 */

/** True when `key` is one of the table's own keys (never a key of its prototype). */
export function hasKey<T extends object>(table: T, key: unknown): key is keyof T {
  return typeof key === 'string' && Object.hasOwn(table, key);
}

/** The table's own value under `key`, or undefined (for a prototype name as for any unknown key). */
export function lookup<T extends object>(table: T, key: unknown): T[keyof T] | undefined {
  return hasKey(table, key) ? table[key] : undefined;
}
