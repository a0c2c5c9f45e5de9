import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DateTime } from 'luxon';
import { batchStatement, parseTimeCell } from './import-rows';

const esc = (v: unknown) => (typeof v === 'number' ? String(v) : `'${String(v).replace(/'/g, "''")}'`);

describe('batchStatement', () => {
  it('writes columns that hold one value in the whole batch as literals and sends only the rest', () => {
    const rows = [
      [7, '2026-01-01 00:00:00.000', 'level_percent', 50, null, 5000, 'import', 3, ''],
      [7, '2026-01-01 00:01:00.000', 'level_percent', 49.9, null, 4990, 'import', 3, ''],
    ];
    const st = batchStatement('tank_readings', rows, esc);
    expect(st.sql).toBe(
      "INSERT INTO source_reading (source_id, taken_at, kind, value, detail_json, contents, method, taken_by_user_id, note) VALUES (7, ?, 'level_percent', ?, NULL, ?, 'import', 3, '')",
    );
    expect(st.params).toEqual([
      ['2026-01-01 00:00:00.000', 50, 4990 + 10],
      ['2026-01-01 00:01:00.000', 49.9, 4990],
    ]);
  });
  it('keeps every column a parameter for a single row, and escapes what it inlines', () => {
    const one = batchStatement('tank_readings', [[7, 't', 'kg', 1, null, 1, 'import', null, "O'Brien"]], esc);
    expect(one.sql).toMatch(/VALUES \(\?, \?, \?, \?, \?, \?, \?, \?, \?\)$/);
    const two = batchStatement(
      'tank_readings',
      [
        [7, 't1', 'kg', 1, null, 1, 'import', null, "O'Brien"],
        [7, 't2', 'kg', 2, null, 2, 'import', null, "O'Brien"],
      ],
      esc,
    );
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
    expect(typeof autumn === 'object' && [new Date(autumn.ms).toISOString(), new Date(autumn.altMs!).toISOString()]).toEqual([
      '2026-10-25T00:30:00.000Z',
      '2026-10-25T01:30:00.000Z',
    ]);
  });
  it('says what is wrong with a bad cell', () => {
    expect(parseTimeCell('2026-02-29 08:00', 'UTC', 'ymd', true)).toBe('not a calendar date'); // 2026 is not a leap year
    expect(parseTimeCell('2026-02-28 24:00', 'UTC', 'ymd', true)).toBe('not a time of day');
    expect(parseTimeCell('2026-01-05', 'UTC', 'ymd', true)).toMatch(/time of day/);
    expect(parseTimeCell('05/01/2026 08:00', 'UTC', 'ymd', true)).toMatch(/date order/);
    expect(parseTimeCell('yesterday', 'UTC', 'ymd', true)).toMatch(/not a date/);
  });
});

describe('parseTimeCell against luxon (property test)', () => {
  // luxon (a general-purpose date library with the IANA zone rules of the runtime) is the reference: the
  // hand-written fast reader must give the same instant for every ISO-shaped cell it accepts.
  const zones = ['UTC', 'Europe/London', 'America/New_York', 'Australia/Sydney', 'Asia/Kolkata', 'America/St_Johns'];
  const p2 = (n: number) => String(n).padStart(2, '0');
  const cell = fc.record({
    y: fc.integer({ min: 1990, max: 2060 }),
    mo: fc.integer({ min: 1, max: 12 }),
    d: fc.integer({ min: 1, max: 28 }),
    h: fc.integer({ min: 0, max: 23 }),
    mi: fc.integer({ min: 0, max: 59 }),
    s: fc.option(fc.integer({ min: 0, max: 59 })),
    ms: fc.option(fc.integer({ min: 0, max: 999 })),
    sep: fc.constantFrom('T', ' '),
    offset: fc.option(
      fc.oneof(
        fc.constant('Z'),
        fc
          .tuple(fc.constantFrom('+', '-'), fc.integer({ min: 0, max: 14 }), fc.constantFrom(0, 30, 45))
          .map(([sg, h, m]) => `${sg}${p2(h)}:${p2(h === 14 ? 0 : m)}`),
      ),
    ),
    zone: fc.constantFrom(...zones),
  });

  it('gives the instant luxon gives, for local times, UTC and offsets, across clock changes', () => {
    fc.assert(
      fc.property(cell, (c) => {
        let text = `${c.y}-${p2(c.mo)}-${p2(c.d)}${c.sep}${p2(c.h)}:${p2(c.mi)}`;
        if (c.s !== null) text += `:${p2(c.s)}${c.ms !== null ? `.${String(c.ms).padStart(3, '0')}` : ''}`;
        if (c.offset !== null) text += c.offset;
        const got = parseTimeCell(text, c.zone, 'ymd', true);
        const ref = DateTime.fromISO(text.replace(' ', 'T'), { zone: c.zone, setZone: false });
        expect(ref.isValid).toBe(true);
        if (typeof got === 'string') {
          // Only a local time skipped by a spring clock change may be refused: luxon moves it to another hour.
          expect(c.offset).toBeNull();
          expect(got).toMatch(/does not exist/);
          expect(ref.setZone(c.zone).hour).not.toBe(c.h);
          return;
        }
        // In the repeated autumn hour the reader offers both instants; luxon picks one of them.
        expect([got.ms, got.altMs]).toContain(ref.toMillis());
      }),
      { numRuns: 3000, seed: 20261203 },
    );
  });
});
