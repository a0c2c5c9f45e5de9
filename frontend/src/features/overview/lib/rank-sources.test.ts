import { describe, expect, it } from 'vitest';
import type { Overview, OverviewSource } from '../api/overview-api';
import { countByStatus, rankSources } from './rank-sources';

function source(id: number, status: OverviewSource['status'], daysOfStock: number | null, name = `S${id}`): OverviewSource {
  return {
    id,
    name,
    type: 'manifold',
    gasCode: 'O2',
    unit: 'L',
    contents: 1,
    capacity: null,
    daysOfStock,
    emptyAt: null,
    reorderAt: null,
    status,
    statusText: status,
    firstRisk: null,
    trend: [],
    leadTimeHours: 48,
    note: null,
  };
}

describe('rankSources', () => {
  const overview: Overview = {
    generatedAt: '2026-12-02T03:00:00Z',
    caution: 'Planning estimate only.',
    sites: [
      {
        id: 1,
        name: 'A',
        timeZone: 'Europe/London',
        referenceCode: '15C',
        computedAt: '2026-12-02T03:00:00Z',
        sources: [source(1, 'ok', 40), source(2, 'watch', 9), source(3, 'critical', 1.5)],
      },
      {
        id: 2,
        name: 'B',
        timeZone: 'Europe/London',
        referenceCode: '15C',
        computedAt: '2026-12-02T03:00:00Z',
        sources: [source(4, 'reorder', 3), source(5, 'critical', 0.4), source(6, 'watch', null), source(7, 'unknown', null)],
      },
    ],
  };

  it('puts critical sources first, the one running out soonest at the top, across sites', () => {
    // a source with no forecast comes after every source that needs action and before those that are fine
    expect(rankSources(overview).map((s) => s.id)).toEqual([5, 3, 4, 2, 6, 7, 1]);
  });

  it('keeps the site each source belongs to', () => {
    expect(rankSources(overview)[0]).toMatchObject({ siteId: 2, siteName: 'B' });
  });

  it('counts sources per status', () => {
    expect(countByStatus(rankSources(overview))).toEqual({ critical: 2, reorder: 1, watch: 2, unknown: 1, ok: 1 });
  });
});
