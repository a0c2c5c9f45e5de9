import type { DataSource } from 'typeorm';
import type { TestOrg } from './test-app';

/** Supply records (sources, wards, …) of a site, by route resource name. Filled as those resources exist. */
export async function createSupplyFixtures(_ds: DataSource, _org: TestOrg, _siteId: number): Promise<Record<string, number>> {
  return {};
}
