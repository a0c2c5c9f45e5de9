import type { DataSource } from 'typeorm';

let current: DataSource | undefined;

/** The process's DataSource, set once by main.ts (or a test) before the app serves requests. */
export function db(): DataSource {
  if (!current) throw new Error('DataSource not set: call setDb() first');
  return current;
}
export function setDb(ds: DataSource): void {
  current = ds;
}
