import { describe, expect, it } from 'vitest';
import { batchStatement, parseTimeCell } from './import-rows';

const esc = (v: unknown) => (typeof v === 'number' ? String(v) : `'${String(v).replace(/'/g, "''")}'`);

describe('batchStatement', () => {
  it('writes columns that hold one value in the whole batch as literals and sends only the rest', () => {
    const rows = [
      [7, '2026-01-01 00:00:00.000', 'level_percent', 50, null, 5000, 'import', 3, ''],
      [7, '2026-01-01 00:01:00.000', 'level_percent', 49.9, null, 4990, 'import', 3, ''],
    ];
    const st = batchStatement('tank_readings', rows, esc);
    expect(st.sql).toBe("INSERT INTO source_reading (source_id, taken_at, kind, value, detail_json, contents, method, taken_by_user_id, note) VALUES (7, ?, 'level_percent', ?, NULL, ?, 'import', 3, '')");
    expect(st.params).toEqual([
      ['2026-01-01 00:00:00.000', 50, 4990 + 10],
      ['2026-01-01 00:01:00.000', 49.9, 4990],
    ]);
  });
  it('keeps every column a parameter for a single row, and escapes what it inlines', () => {
    const one = batchStatement('tank_readings', [[7, 't', 'kg', 1, null, 1, 'import', null, "O'Brien"]], esc);
    expect(one.sql).toMatch(/VALUES \(\?, \?, \?, \?, \?, \?, \?, \?, \?\)$/);
    const two = batchStatement('tank_readings', [
      [7, 't1', 'kg', 1, null, 1, 'import', null, "O'Brien"],
      [7, 't2', 'kg', 2, null, 2, 'import', null, "O'Brien"],
    ], esc);
    expect(two.sql).toContain("'O''Brien'");
    expect(two.sql).toContain('NULL, ?');
  });
});

describe('parseTimeCell', () => {
  it('reads local times in the site zone and offsets as written (UK Summer Time = UTC+1)', () => {
    const t = parseTimeCell('2026-07-01T10:00', 'Europe/London', 'ymd', true);
    expect(typeof t === 'object' && new Date(t.ms).toISOString()).toBe('2026-07-01T09:00:00.000Z');
    const z = parseTimeCell('2026-07-01 10:00:30.25Z', 'Europe/London', 'ymd', true);
    expect(typeof z === 'object' && new Date(z.ms).toISOString()).toBe('2026-07-01T10:00:30.250Z');
    const off = parseTimeCell('2026-07-01T10:00-05:00', 'Europe/London', 'ymd', true);
    expect(typeof off === 'object' && new Date(off.ms).toISOString()).toBe('2026-07-01T15:00:00.000Z');
    const dmy = parseTimeCell('01/07/2026 10:00', 'Europe/London', 'dmy', true);
    expect(typeof dmy === 'object' && new Date(dmy.ms).toISOString()).toBe('2026-07-01T09:00:00.000Z');
  });
  it('refuses the hour skipped when clocks go forward and offers both instants of the repeated hour', () => {
    // UK clocks: forward 29 March 2026 01:00 GMT, back 25 October 2026 02:00 BST (IANA tz database).
    expect(parseTimeCell('2026-03-29T01:30', 'Europe/London', 'ymd', true)).toMatch(/does not exist/);
    const autumn = parseTimeCell('2026-10-25T01:30', 'Europe/London', 'ymd', true);
    expect(typeof autumn === 'object' && [new Date(autumn.ms).toISOString(), new Date(autumn.altMs!).toISOString()]).toEqual(['2026-10-25T00:30:00.000Z', '2026-10-25T01:30:00.000Z']);
  });
  it('says what is wrong with a bad cell', () => {
    expect(parseTimeCell('2026-02-29 08:00', 'UTC', 'ymd', true)).toBe('not a calendar date'); // 2026 is not a leap year
    expect(parseTimeCell('2026-02-28 24:00', 'UTC', 'ymd', true)).toBe('not a time of day');
    expect(parseTimeCell('2026-01-05', 'UTC', 'ymd', true)).toMatch(/time of day/);
    expect(parseTimeCell('05/01/2026 08:00', 'UTC', 'ymd', true)).toMatch(/date order/);
    expect(parseTimeCell('yesterday', 'UTC', 'ymd', true)).toMatch(/not a date/);
  });
});
