import { describe, expect, it } from 'vitest';
import { USER_SORT_KEYS } from '@common/schemas/common.schema';
import { parseListParams } from './list-params';

describe('parseListParams', () => {
  const defaults = { pageSize: 25, sort: 'name', dir: 'asc' as const, sortKeys: USER_SORT_KEYS };

  it('keeps a sort key the server knows', () => {
    expect(parseListParams(new URLSearchParams('sort=email&dir=desc'), defaults)).toMatchObject({ sort: 'email', dir: 'desc' });
  });

  it('drops any other sort key from the address (the server would refuse it) for the default', () => {
    for (const bad of ['__proto__', 'constructor', 'toString', 'roles', 'u.password_hash']) {
      expect(parseListParams(new URLSearchParams({ sort: bad }), defaults).sort, bad).toBe('name');
    }
  });

  it('reads only a whole page number from 1 up; anything else is page 1', () => {
    for (const bad of ['0', '-3', 'abc', '__proto__', '1e400', 'Infinity', 'NaN', '']) {
      expect(parseListParams(new URLSearchParams({ page: bad }), defaults).page, bad).toBe(1);
    }
    expect(parseListParams(new URLSearchParams('page=7'), defaults).page).toBe(7);
  });
});
