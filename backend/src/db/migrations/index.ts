import { Foundation1764650000000 } from './1764650000000-foundation';

/** Migrations in order. Production, start and tests run the same list. */
export const migrations = [Foundation1764650000000];
