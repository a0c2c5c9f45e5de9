import type { DataSource } from 'typeorm';
import { ImportFile, ImportJob, UsageReport } from '@backend/db/entities/usage.entity';
import type { TestOrg } from './test-app';
import { uniq } from './test-app';

/** A usage report (of the given ward) and an upload of a site, keyed by the route resource name. */
export async function createUsageFixtures(ds: DataSource, org: TestOrg, siteId: number, wardId: number): Promise<Record<string, number>> {
  const tag = uniq('use');
  const report = await ds.getRepository(UsageReport).save(
    ds.getRepository(UsageReport).create({
      siteId,
      wardId,
      reportDate: '2026-01-05',
      note: tag,
      submittedByUserId: org.userIds.ward_lead,
      submittedAt: new Date(),
      updatedByUserId: org.userIds.ward_lead,
    }),
  );
  const file = await ds.getRepository(ImportFile).save(
    ds.getRepository(ImportFile).create({
      organisationId: org.organisationId,
      siteId,
      sha256: tag.padEnd(64, '0').slice(0, 64),
      originalName: `${tag}.csv`,
      sizeBytes: '10',
      lineCount: 2,
      storagePath: null,
      uploadedByUserId: org.userIds.facilities_manager,
    }),
  );
  const job = await ds.getRepository(ImportJob).save(
    ds.getRepository(ImportJob).create({
      organisationId: org.organisationId,
      siteId,
      fileId: file.id,
      kind: 'tank_readings',
      status: 'mapping',
      optionsJson: JSON.stringify({ sourceId: null, wardId: null, unit: null, headerUnit: null, dateOrder: 'ymd', separator: ',', mapping: {} }),
      headerJson: '["time","level"]',
      sampleJson: '[]',
      message: tag,
      createdByUserId: org.userIds.facilities_manager,
    }),
  );
  return { 'usage-reports': report.id, imports: job.id };
}
