import { Foundation1764650000000 } from './1764650000000-foundation';
import { Supply1764660000000 } from './1764660000000-supply';
import { Capacity1764670000000 } from './1764670000000-capacity';

/** Migrations in order. Production, start and tests run the same list. */
export const migrations = [Foundation1764650000000, Supply1764660000000, Capacity1764670000000];
