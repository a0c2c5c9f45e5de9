import type { DataSource } from 'typeorm';
import type { TestOrg } from './test-app';
import { createCapacityFixtures } from './capacity-fixtures';

/** Supply records (sources, wards, …) of a site, by route resource name. Filled as those resources exist. */
export async function createSupplyFixtures(ds: DataSource, org: TestOrg, siteId: number): Promise<Record<string, number>> {
  return { ...(await createCapacityFixtures(ds, org, siteId)) };
}
