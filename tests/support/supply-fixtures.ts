import type { DataSource } from 'typeorm';
import { CylinderType } from '@backend/db/entities/catalogue.entity';
import { Scenario, ScheduledDelivery, SupplySource, Ward } from '@backend/db/entities/supply.entity';
import type { TestOrg } from './test-app';
import { createOrderFixtures } from './order-fixtures';
import { uniq } from './test-app';
import { createCapacityFixtures } from './capacity-fixtures';
import { createUsageFixtures } from './usage-fixtures';

/** Supply records (sources, wards, scenarios, deliveries) of a site, keyed by the route resource name. */
export async function createSupplyFixtures(ds: DataSource, org: TestOrg, siteId: number): Promise<Record<string, number>> {
  const tag = uniq('sup');
  const cyl = await ds.getRepository(CylinderType).save(
    ds.getRepository(CylinderType).create({
      organisationId: org.organisationId,
      gasCode: 'O2',
      waterCapacityL: 50,
      fillPressureBar: 200 + Math.round(Math.random() * 30),
      tareKg: null,
      maxFillingRatioKgPerL: null,
      material: 'steel',
      valveNotes: '',
      active: true,
    }),
  );
  const source = await ds.getRepository(SupplySource).save(
    ds.getRepository(SupplySource).create({
      siteId,
      name: `Manifold ${tag}`,
      type: 'manifold',
      gasCode: 'O2',
      supplierId: null,
      cylinderTypeId: cyl.id,
      cylindersPerBank: 4,
      regulatorLMin: 1000,
      changeoverGaugeBar: 10,
      temperatureC: 15,
      reorderMode: 'none',
      forecastBasis: 'model',
      modelCorrectionFactor: 1,
      notes: '',
      active: true,
    }),
  );
  const ward = await ds
    .getRepository(Ward)
    .save(ds.getRepository(Ward).create({ siteId, name: `Ward ${tag}`, department: 'ward', beds: 20, leakagePercent: 0, active: true }));
  const scenario = await ds.getRepository(Scenario).save(
    ds.getRepository(Scenario).create({
      siteId,
      name: `Scenario ${tag}`,
      multiplier: 1.1,
      extraPatients: 0,
      extraFlowLMin: 0,
      wardId: null,
      wardChange: null,
      fromLocal: '2027-01-04T00:00',
      untilLocal: null,
      note: '',
    }),
  );
  const delivery = await ds
    .getRepository(ScheduledDelivery)
    .save(
      ds
        .getRepository(ScheduledDelivery)
        .create({ sourceId: source.id, dueAt: new Date(Date.now() + 86_400_000), kg: null, cylinders: 4, status: 'scheduled', reference: tag }),
    );
  return {
    sources: source.id,
    wards: ward.id,
    scenarios: scenario.id,
    deliveries: delivery.id,
    ...(await createCapacityFixtures(ds, org, siteId)),
    ...(await createOrderFixtures(ds, org, siteId, source.id)),
    ...(await createUsageFixtures(ds, org, siteId, ward.id)),
  };
}
