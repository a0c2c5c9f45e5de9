import type { DataSource } from 'typeorm';
import { Organisation } from '../entities/organisation.entity';
import { DEMO_ORGANISATION, seedFoundation } from './demo-foundation';
import { seedSupply } from './demo-supply';
import { seedOrders } from './demo-orders';
import { seedCapacity } from './demo-capacity';
import { seedUsage } from './demo-usage';

/** Creates the whole demo organisation in one transaction; returns false when it exists already. */
export async function seedDemo(ds: DataSource): Promise<boolean> {
  return ds.transaction(async (m) => {
    const existing = await m.getRepository(Organisation).findOneBy({ name: DEMO_ORGANISATION });
    if (existing) return false;
    const ids = await seedFoundation(m);
    await seedSupply(m, ids);
    await seedUsage(m, ids);
    await seedOrders(m, ids);
    await seedCapacity(m, ids);
    return true;
  });
}
