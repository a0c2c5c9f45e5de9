import { idParamSchema } from '@common/schemas/common.schema';
import { capacityQuerySchema, pipeRunSchema, ruleSetCreateSchema, ruleSetUpdateSchema, signoffSchema, zoneSchema } from '@common/schemas/capacity.schema';
import type { Role } from '@common/api/roles';
import type { RouteDef } from '../../http/route';
import { actorOf } from '../../http/context';
import { validate } from '../../http/validate';
import { getSiteFor } from '../sites/sites.service';
import * as svc from './capacity.service';

const id = (params: unknown) => validate(idParamSchema, params, 'address').id;

/**
 * Who reads the capacity check: the biomedical engineer who owns it, the facilities manager who keeps
 * the sources it checks, and administrators. Ward leads and purchasing officers have no use for it.
 */
const READERS: Role[] = ['biomedical_engineer', 'facilities_manager', 'administrator'];
/**
 * Who writes zones, pipe runs and rule sets, and signs off: the biomedical engineer alone. The
 * sign-off attests to these inputs, so they change only in the hands of the person who signs.
 */
const ENGINEER: Role[] = ['biomedical_engineer'];

export function capacityRoutes(): RouteDef[] {
  return [
    // zones and their pipe runs
    { method: 'get', path: '/api/sites/:id/zones', access: READERS, handler: (req) => svc.listZones(actorOf(req), id(req.params)) },
    {
      method: 'post',
      path: '/api/sites/:id/zones',
      access: ENGINEER,
      handler: async (req) => {
        const siteId = id(req.params);
        await getSiteFor(actorOf(req), siteId);
        return svc.createZone(actorOf(req), siteId, validate(zoneSchema, req.body, 'zone'));
      },
    },
    { method: 'get', path: '/api/zones/:id', access: READERS, handler: (req) => svc.getZone(actorOf(req), id(req.params)) },
    {
      method: 'put',
      path: '/api/zones/:id',
      access: ENGINEER,
      handler: async (req) => {
        const zoneId = id(req.params);
        await svc.zoneFor(actorOf(req), zoneId);
        return svc.updateZone(actorOf(req), zoneId, validate(zoneSchema, req.body, 'zone'));
      },
    },
    { method: 'delete', path: '/api/zones/:id', access: ENGINEER, handler: (req) => svc.deleteZone(actorOf(req), id(req.params)) },
    {
      method: 'post',
      path: '/api/zones/:id/pipe-runs',
      access: ENGINEER,
      handler: async (req) => {
        const zoneId = id(req.params);
        await svc.zoneFor(actorOf(req), zoneId);
        return svc.createPipeRun(actorOf(req), zoneId, validate(pipeRunSchema, req.body, 'pipe run'));
      },
    },
    { method: 'get', path: '/api/pipe-runs/:id', access: READERS, handler: (req) => svc.getPipeRun(actorOf(req), id(req.params)) },
    {
      method: 'put',
      path: '/api/pipe-runs/:id',
      access: ENGINEER,
      handler: async (req) => {
        const runId = id(req.params);
        await svc.pipeRunFor(actorOf(req), runId);
        return svc.updatePipeRun(actorOf(req), runId, validate(pipeRunSchema, req.body, 'pipe run'));
      },
    },
    { method: 'delete', path: '/api/pipe-runs/:id', access: ENGINEER, handler: (req) => svc.deletePipeRun(actorOf(req), id(req.params)) },
    // diversity rule sets (the shipped ones read-only; the organisation's own copies editable)
    { method: 'get', path: '/api/rule-sets', access: READERS, handler: (req) => svc.listRuleSets(actorOf(req)) },
    { method: 'get', path: '/api/rule-sets/:id', access: READERS, handler: (req) => svc.getRuleSet(actorOf(req), id(req.params)) },
    {
      method: 'post',
      path: '/api/rule-sets',
      access: ENGINEER,
      handler: (req) => svc.createRuleSet(actorOf(req), validate(ruleSetCreateSchema, req.body, 'rule set')),
    },
    {
      method: 'put',
      path: '/api/rule-sets/:id',
      access: ENGINEER,
      handler: async (req) => {
        const setId = id(req.params);
        await svc.getRuleSet(actorOf(req), setId);
        return svc.updateRuleSet(actorOf(req), setId, validate(ruleSetUpdateSchema, req.body, 'rule set'));
      },
    },
    { method: 'delete', path: '/api/rule-sets/:id', access: ENGINEER, handler: (req) => svc.deleteRuleSet(actorOf(req), id(req.params)) },
    // the check, and the engineer's sign-off
    {
      method: 'get',
      path: '/api/sites/:id/capacity',
      access: READERS,
      handler: (req) => svc.getCapacity(actorOf(req), id(req.params), validate(capacityQuerySchema, req.query, 'capacity inputs')),
    },
    { method: 'get', path: '/api/sites/:id/capacity/signoffs', access: READERS, handler: (req) => svc.listSignoffs(actorOf(req), id(req.params)) },
    {
      method: 'post',
      path: '/api/sites/:id/capacity/signoffs',
      access: ENGINEER,
      handler: async (req) => {
        const siteId = id(req.params);
        await getSiteFor(actorOf(req), siteId);
        return svc.signOff(actorOf(req), siteId, validate(signoffSchema, req.body, 'sign-off'));
      },
    },
    { method: 'get', path: '/api/capacity-signoffs/:id', access: READERS, handler: (req) => svc.getSignoff(actorOf(req), id(req.params)) },
  ];
}
