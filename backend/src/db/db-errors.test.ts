import { describe, expect, it } from 'vitest';
import { dbErrorCode, isDatabaseDown, isDuplicateKey, isLockConflict } from './db-errors';

// Shapes as the drivers throw them: TypeORM's QueryFailedError keeps the mysql2 error as driverError and
// copies its code; the mariadb connector's SqlError carries code itself; Node's net errors carry code.
const typeormDeadlock = Object.assign(new Error('Deadlock found'), { code: 'ER_LOCK_DEADLOCK', driverError: { code: 'ER_LOCK_DEADLOCK', errno: 1213 } });
const wrappedOnly = Object.assign(new Error('x'), { driverError: { code: 'ER_DUP_ENTRY' } });
const mariadbDup = Object.assign(new Error('(conn:1, no: 1062, SQLState: 23000) Duplicate entry'), { code: 'ER_DUP_ENTRY', errno: 1062 });
const refused = Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:3307'), { code: 'ECONNREFUSED' });

describe('database error codes', () => {
  it('reads the code from TypeORM, mysql2 and mariadb errors alike, preferring the driver’s', () => {
    expect(dbErrorCode(typeormDeadlock)).toBe('ER_LOCK_DEADLOCK');
    expect(dbErrorCode(wrappedOnly)).toBe('ER_DUP_ENTRY');
    expect(dbErrorCode(mariadbDup)).toBe('ER_DUP_ENTRY');
    expect(dbErrorCode({ driverError: { code: 'ER_LOCK_WAIT_TIMEOUT' }, code: 'OTHER' })).toBe('ER_LOCK_WAIT_TIMEOUT');
  });
  it('classifies without throwing on anything thrown', () => {
    for (const odd of [undefined, null, 'text', 42, {}, { code: 5 }, Object.create(null)]) {
      expect(dbErrorCode(odd)).toBeUndefined();
      expect(isLockConflict(odd) || isDuplicateKey(odd) || isDatabaseDown(odd)).toBe(false);
    }
    expect(isLockConflict(typeormDeadlock)).toBe(true);
    expect(isDuplicateKey(mariadbDup) && isDuplicateKey(wrappedOnly)).toBe(true);
    expect(isDatabaseDown(refused) && isDatabaseDown(new Error('Pool is closed.'))).toBe(true);
    expect(isDatabaseDown(typeormDeadlock)).toBe(false);
  });
});
