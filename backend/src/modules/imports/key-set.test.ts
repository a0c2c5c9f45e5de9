import { describe, expect, it } from 'vitest';
import { mulberry32 } from '@common/forecast/monte-carlo';
import { KeyLineMap, SlotTracker } from './key-set';

/**
 * The duplicate finders are checked against a plain JavaScript Map doing the same job (the obvious
 * reference implementation) over regular, irregular and shuffled series.
 */
function reference(rows: { group: number; t: number; line: number }[]) {
  const seen = new Map<string, number>();
  return rows.map((r) => {
    const k = `${r.group}|${r.t}`;
    const first = seen.get(k);
    if (first !== undefined) return first;
    seen.set(k, r.line);
    return 0;
  });
}

describe('KeyLineMap', () => {
  it('answers like a Map over 200,000 random keys with repeats, through several growths', () => {
    const rnd = mulberry32(9);
    const m = new KeyLineMap(16);
    const ref = new Map<number, number>();
    const got: number[] = [];
    const want: number[] = [];
    for (let line = 2; line < 200_002; line++) {
      const key = Math.floor(rnd() * 150_000) * 1024 + 3;
      const first = ref.get(key) ?? 0;
      if (!first) ref.set(key, line);
      want.push(first);
      got.push(m.addOrGet(key, line));
    }
    // One assertion over the whole run (200,000 expect calls took seconds under load).
    expect(got).toEqual(want);
    expect(m.size).toBe(ref.size);
  });
});

describe('SlotTracker', () => {
  const run = (rows: { group: number; t: number; line: number }[]) => {
    const s = new SlotTracker();
    return { got: rows.map((r) => s.add(r.group, r.t, r.t * 1024 + r.group, r.line)), tracker: s };
  };

  it('keeps a regular series of 100,000 rows as one run and still names the line of a late repeat', () => {
    const rows = Array.from({ length: 100_000 }, (_, i) => ({ group: 0, t: 1_700_000_000_000 + i * 60_000, line: i + 2 }));
    rows.push({ group: 0, t: 1_700_000_000_000 + 500 * 60_000, line: 100_002 });
    const { got, tracker } = run(rows);
    expect(got).toEqual(reference(rows));
    expect(got[100_000]).toBe(502);
    expect(tracker.lineOf(0, 1_700_000_000_000 + 777 * 60_000, 0)).toBe(779);
    expect(tracker.lineOf(0, 1_700_000_000_000 + 777 * 60_000 + 1, 0)).toBe(0);
  });

  it('agrees with a Map on interleaved targets, gaps, adjacent repeats and shuffled rows', () => {
    const rnd = mulberry32(4);
    const rows: { group: number; t: number; line: number }[] = [];
    let line = 2;
    for (let i = 0; i < 20_000; i++) {
      const group = i % 3;
      const t = Math.floor(i / 3) * 60_000 + (rnd() < 0.05 ? 30_000 : 0);
      rows.push({ group, t, line: line++ });
      if (rnd() < 0.01) rows.push({ group, t, line: line++ });
    }
    for (let i = 0; i < 3000; i++) rows.push({ group: Math.floor(rnd() * 3), t: Math.floor(rnd() * 7000) * 60_000, line: line++ });
    const { got } = run(rows);
    expect(got).toEqual(reference(rows));
  });
});
