import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '@backend/db/seed/seed-demo';
import { SupplySource } from '@backend/db/entities/supply.entity';
import { Site } from '@backend/db/entities/site.entity';
import { loadSiteModels } from '@backend/modules/forecast/site-model';
import { measuredDemandCv, outlookFor } from '@backend/modules/forecast/forecast.service';
import { forecastSource } from '@common/forecast/forecast-source';
import type { ForecastInput } from '@common/forecast/forecast-input.schema';
import { startTestApp, type TestApp } from '../support/test-app';

/**
 * The Monte Carlo persistence fitted on the demo's measured tank history (60 days of hourly telemetry,
 * seeded). The demo draws a fresh use factor every 24 h counted back from the seeding hour, not at local
 * midnight, so each local day averages two neighbouring factors: a moving average whose lag-1
 * correlation is a·b/(a² + b²) ≤ 0.5 for the a + b = 24 hours of the two (Box & Jenkins, MA(1)). The fit
 * must land in [0, 0.5] within its sampling error (Bartlett: about 1/√n for n days).
 */
let app: TestApp;

beforeAll(async () => {
  app = await startTestApp();
  await seedDemo(app.ds);
}, 180_000);
afterAll(async () => {
  await app.close();
});

describe('Monte Carlo persistence on the demo history', () => {
  it('fits the persistence of the demo tank from its measured days, and the band shows the model in use', async () => {
    const vie = await app.ds.getRepository(SupplySource).findOneByOrFail({ name: 'Main VIE — liquid oxygen' });
    const site = await app.ds.getRepository(Site).findOneByOrFail({ id: vie.siteId });
    const [model] = await loadSiteModels([site.id], site.organisationId);
    const s = model.sources.find((x) => x.id === vie.id)!;
    const mc = measuredDemandCv(model, s);
    expect(mc.persistenceMeasured).toBe(true);
    expect(mc.days).toBeGreaterThanOrEqual(14);
    // independent days by construction: |φ̂| within about 2.5 standard errors (1/√days) of 0
    expect(mc.persistence).toBeGreaterThanOrEqual(0);
    expect(mc.persistence).toBeLessThan(0.5 + 2.5 / Math.sqrt(mc.days));
    const o = outlookFor(model, s, { draws: 500 });
    expect(o.input?.demand_persistence).toBe(mc.persistence);
    const f = o.forecast!;
    expect(f.monteCarlo).toEqual({ demandCv: mc.cv, persistence: mc.persistence });
    // measurement for the record: the empty-time band of the tank without its reorder rule and deliveries,
    // over 30 days, with the fitted persistence against independent days
    const bare = {
      ...o.input!,
      horizon_days: 30,
      deliveries: [],
      draws: 2000,
      source: { ...o.input!.source, reorder_level_kg: undefined, reorder_level_percent: undefined, reorder_level_days: undefined, order_up_to_kg: undefined },
    } as ForecastInput;
    const rel = (phi: number) => {
      const b = forecastSource({ ...bare, demand_persistence: phi }).bands!;
      return { p10Below: 1 - b.p10! / b.p50!, p90Above: b.p90! / b.p50! - 1, p50: b.p50! };
    };
    const fitted = rel(mc.persistence);
    const independent = rel(0);
    console.log(
      `demo VIE: cv ${mc.cv.toFixed(3)}, fitted φ ${mc.persistence.toFixed(3)} over ${mc.days} days; P10 ${(fitted.p10Below * 100).toFixed(2)} % below P50 (independent days: ${(independent.p10Below * 100).toFixed(2)} %), P90 ${(fitted.p90Above * 100).toFixed(2)} % above (independent ${(independent.p90Above * 100).toFixed(2)} %), median ${fitted.p50.toFixed(0)} h`,
    );
    expect(fitted.p10Below).toBeGreaterThanOrEqual(independent.p10Below);
  }, 120_000);
});
