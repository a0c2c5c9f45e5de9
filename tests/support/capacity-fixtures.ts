import type { DataSource } from 'typeorm';
import { copyRuleSet } from '@common/capacity/diversity-rules';
import { CapacitySignoff, PipeRun, PipelineZone, RuleSet } from '@backend/db/entities/capacity.entity';
import type { TestOrg } from './test-app';
import { uniq } from './test-app';

/** Capacity records of a site (zone, pipe run, rule set, sign-off), by route resource name. */
export async function createCapacityFixtures(ds: DataSource, org: TestOrg, siteId: number): Promise<Record<string, number>> {
  const tag = uniq('cap');
  const set = await ds
    .getRepository(RuleSet)
    .save(
      ds
        .getRepository(RuleSet)
        .create({ organisationId: org.organisationId, name: `Rules ${tag}`, basedOn: 'default', json: JSON.stringify(copyRuleSet('default', 'fixture')) }),
    );
  const zone = await ds.getRepository(PipelineZone).save(
    ds.getRepository(PipelineZone).create({
      siteId,
      name: `Zone ${tag}`,
      gasCode: 'O2',
      department: 'ward',
      terminalUnits: 4,
      sourceId: null,
      ruleSetId: null,
      builtinRuleSet: 'default',
      diversityMethod: 'rule_set',
      unitFlowLMin: null,
      useProbability: null,
      confidence: null,
      notes: '',
    }),
  );
  const run = await ds.getRepository(PipeRun).save(
    ds.getRepository(PipeRun).create({
      zoneId: zone.id,
      name: `Run ${tag}`,
      lengthM: 25,
      tube: '22x0.9',
      fittingsAllowancePercent: 20,
      linePressureKPa: 400,
      allowedDropKPa: null,
      gasTemperatureC: null,
      sortOrder: 0,
    }),
  );
  const signoff = await ds.getRepository(CapacitySignoff).save(
    ds.getRepository(CapacitySignoff).create({
      siteId,
      engineerName: `Engineer ${tag}`,
      userId: org.userIds.biomedical_engineer,
      signedAt: new Date(),
      inputsHash: '0'.repeat(64),
      note: '',
      summaryJson: '{}',
    }),
  );
  return { zones: zone.id, 'pipe-runs': run.id, 'rule-sets': set.id, 'capacity-signoffs': signoff.id };
}
