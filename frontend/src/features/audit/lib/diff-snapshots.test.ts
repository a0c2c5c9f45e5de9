import { describe, expect, it } from 'vitest';
import { diffSnapshots, showValue } from './diff-snapshots';

describe('diffSnapshots', () => {
  it('marks a renamed field as changed and keeps the others as same', () => {
    const rows = diffSnapshots({ name: 'Ward 4', beds: 20 }, { name: 'Ward 4 East', beds: 20 });
    expect(rows).toEqual([
      { path: 'name', kind: 'changed', before: 'Ward 4', after: 'Ward 4 East' },
      { path: 'beds', kind: 'same', before: 20, after: 20 },
    ]);
  });

  it('lists every field of a created record as added', () => {
    const rows = diffSnapshots(null, { email: 'a@b.example', roles: ['ward_lead'] });
    expect(rows.map((r) => [r.path, r.kind])).toEqual([
      ['email', 'added'],
      ['roles', 'added'],
    ]);
  });

  it('flattens arrays of objects by index and spots a removed price', () => {
    const rows = diffSnapshots({ prices: [{ priceMinor: 100 }, { priceMinor: 200 }] }, { prices: [{ priceMinor: 150 }] });
    expect(rows).toContainEqual({ path: 'prices.0.priceMinor', kind: 'changed', before: 100, after: 150 });
    expect(rows).toContainEqual({ path: 'prices.1.priceMinor', kind: 'removed', before: 200 });
  });

  it('treats a change inside an array of plain values as one changed field', () => {
    const rows = diffSnapshots({ siteIds: [1] }, { siteIds: [1, 2] });
    expect(rows).toEqual([{ path: 'siteIds', kind: 'changed', before: [1], after: [1, 2] }]);
  });
});

describe('showValue', () => {
  it('shows markup as the literal text it is', () => {
    expect(showValue('<img src=x onerror=alert(1)>')).toBe('<img src=x onerror=alert(1)>');
    expect(showValue(null)).toBe('empty');
    expect(showValue('')).toBe('(blank)');
  });
});
