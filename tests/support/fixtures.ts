import type { DataSource } from 'typeorm';
import { CylinderType, Supplier } from '@backend/db/entities/catalogue.entity';
import { MailMessage } from '@backend/db/entities/mail.entity';
import type { TestOrg } from './test-app';
import { uniq } from './test-app';
import { createSupplyFixtures } from './supply-fixtures';

/**
 * One record of each resource that routes address by id, owned by a given organisation. The role
 * matrix fills path parameters from it; the site-isolation test asks another organisation's user for
 * these ids. `resourceOf` maps every `:param` route to its resource: a route missing here fails the tests.
 */
export interface IdFixtures {
  byResource: Record<string, number>;
  forParam(path: string, param: string): number;
}

/** Which resource a route's `:id` (or other parameter) names. */
export function resourceOf(path: string, param: string): string {
  if (param === 'attachmentId') return 'mail_attachment';
  const m = path.match(/^\/api\/([\w-]+)\/:\w+/);
  if (!m) throw new Error(`No resource known for ${path} :${param}: add it to tests/support/fixtures.ts`);
  return m[1];
}

export async function idFixtures(ds: DataSource, org: TestOrg): Promise<IdFixtures> {
  const tag = uniq('fx');
  const cyl = await ds.getRepository(CylinderType).save(
    ds.getRepository(CylinderType).create({
      organisationId: org.organisationId,
      gasCode: 'O2',
      waterCapacityL: 10 + Math.random(),
      fillPressureBar: 200,
      tareKg: null,
      maxFillingRatioKgPerL: null,
      material: 'steel',
      valveNotes: '',
      active: true,
    }),
  );
  const sup = await ds.getRepository(Supplier).save(
    ds.getRepository(Supplier).create({
      organisationId: org.organisationId,
      name: `Supplier ${tag}`,
      orderEmail: `orders-${tag}@test.example`,
      phone: '',
      leadTimeHours: 24,
      rentalMinorPerCylinderDay: 10,
      minBulkDropKg: 0,
      currency: 'GBP',
      active: true,
    }),
  );
  const mail = await ds
    .getRepository(MailMessage)
    .save(
      ds
        .getRepository(MailMessage)
        .create({ mailFrom: 'a@test.example', mailTo: 'b@test.example', subject: tag, textBody: 'x', htmlBody: null, messageId: null, sizeBytes: 1 }),
    );
  const supply = await createSupplyFixtures(ds, org, org.siteIds[0]);
  const byResource: Record<string, number> = {
    sites: org.siteIds[0],
    users: org.userIds.ward_lead,
    'cylinder-types': cyl.id,
    suppliers: sup.id,
    mail: mail.id,
    mail_attachment: 1,
    ...supply,
  };
  return {
    byResource,
    forParam(path, param) {
      const r = resourceOf(path, param);
      if (!(r in byResource)) throw new Error(`No fixture for resource "${r}" (${path}): add one to tests/support/fixtures.ts`);
      return byResource[r];
    },
  };
}
