import { z } from 'zod';
import { idParamSchema, listQuerySchema } from '@common/schemas/common.schema';
import {
  deliverySchema,
  deviceFlowsSchema,
  readingInputSchema,
  scenarioSchema,
  sourceSchema,
  therapyLinesSchema,
  wardFeedsSchema,
  wardSchema,
} from '@common/schemas/supply.schema';
import type { DeviceFlowView, TherapyDevice } from '@common/schemas/supply.schema';
import { DEVICE_DEFAULTS } from '@common/forecast/demand-model';
import type { Role } from '@common/api/roles';
import type { RouteDef } from '../../http/route';
import { actorOf } from '../../http/context';
import { validate } from '../../http/validate';
import * as svc from './supply.service';
import { raiseRequestsForCrossings } from '../orders/requests.service';
import { logger } from '../../logger';

const id = (params: unknown) => validate(idParamSchema, params, 'address').id;
const FM: Role[] = ['facilities_manager'];
const READERS = 'authenticated' as const;
/** Who may enter readings: facilities staff, and ward leads at the store round. */
const READING_WRITERS: Role[] = ['facilities_manager', 'ward_lead'];

export function supplyRoutes(): RouteDef[] {
  return [
    // sources
    { method: 'get', path: '/api/sites/:id/sources', access: READERS, handler: (req) => svc.listSources(actorOf(req), id(req.params)) },
    {
      method: 'post',
      path: '/api/sites/:id/sources',
      access: FM,
      handler: (req) => svc.createSource(actorOf(req), id(req.params), validate(sourceSchema, req.body, 'source')),
    },
    {
      method: 'put',
      path: '/api/sources/:id',
      access: FM,
      handler: (req) => svc.updateSource(actorOf(req), id(req.params), validate(sourceSchema, req.body, 'source')),
    },
    {
      method: 'post',
      path: '/api/sources/:id/correction',
      access: FM,
      handler: (req) => {
        const body = validate(
          z.object({ factor: z.number().gt(0, 'must be above 0').max(5, 'above 5× — check the data'), basis: z.enum(['model', 'measured', 'scaled']) }),
          req.body,
          'correction',
        );
        return svc.setCorrection(actorOf(req), id(req.params), body.factor, body.basis);
      },
    },
    // readings
    {
      method: 'get',
      path: '/api/sources/:id/readings',
      access: READERS,
      handler: (req) => {
        const q = validate(listQuerySchema, req.query, 'query');
        return svc.listReadings(actorOf(req), id(req.params), q.page, q.pageSize);
      },
    },
    {
      method: 'post',
      path: '/api/sources/:id/readings',
      access: READING_WRITERS,
      handler: async (req) => {
        const reading = await svc.addReading(actorOf(req), id(req.params), validate(readingInputSchema, req.body, 'reading'));
        // A reading can push a source across its reorder point: raise the request now, not at the next scan.
        const source = await svc.sourceFor(actorOf(req), id(req.params));
        await raiseRequestsForCrossings([source.siteId]).catch((e: Error) => logger.error(`reorder scan after a reading failed: ${e.message}`));
        return reading;
      },
    },
    // deliveries
    { method: 'get', path: '/api/sources/:id/deliveries', access: READERS, handler: (req) => svc.listDeliveries(actorOf(req), id(req.params)) },
    {
      method: 'post',
      path: '/api/sources/:id/deliveries',
      access: ['facilities_manager', 'purchasing_officer'],
      handler: (req) => svc.scheduleDelivery(actorOf(req), id(req.params), validate(deliverySchema, req.body, 'delivery')),
    },
    {
      method: 'post',
      path: '/api/deliveries/:id/cancel',
      access: ['facilities_manager', 'purchasing_officer'],
      handler: (req) => svc.cancelDelivery(actorOf(req), id(req.params)),
    },
    // wards
    { method: 'get', path: '/api/sites/:id/wards', access: READERS, handler: (req) => svc.listWards(actorOf(req), id(req.params)) },
    {
      method: 'post',
      path: '/api/sites/:id/wards',
      access: FM,
      handler: (req) => svc.createWard(actorOf(req), id(req.params), validate(wardSchema, req.body, 'ward')),
    },
    {
      method: 'put',
      path: '/api/wards/:id',
      access: FM,
      handler: (req) => svc.updateWard(actorOf(req), id(req.params), validate(wardSchema, req.body, 'ward')),
    },
    {
      method: 'put',
      path: '/api/wards/:id/therapy',
      access: ['facilities_manager', 'ward_lead'],
      handler: (req) => svc.replaceTherapy(actorOf(req), id(req.params), validate(therapyLinesSchema, req.body, 'therapy lines').lines),
    },
    {
      method: 'put',
      path: '/api/wards/:id/feeds',
      access: FM,
      handler: (req) => svc.replaceFeeds(actorOf(req), id(req.params), validate(wardFeedsSchema, req.body, 'feeds').feeds),
    },
    // scenarios
    { method: 'get', path: '/api/sites/:id/scenarios', access: READERS, handler: (req) => svc.listScenarios(actorOf(req), id(req.params)) },
    {
      method: 'post',
      path: '/api/sites/:id/scenarios',
      access: FM,
      handler: (req) => svc.createScenario(actorOf(req), id(req.params), validate(scenarioSchema, req.body, 'scenario')),
    },
    {
      method: 'put',
      path: '/api/scenarios/:id',
      access: FM,
      handler: (req) => svc.updateScenario(actorOf(req), id(req.params), validate(scenarioSchema, req.body, 'scenario')),
    },
    { method: 'delete', path: '/api/scenarios/:id', access: FM, handler: (req) => svc.deleteScenario(actorOf(req), id(req.params)) },
    // device flows (organisation-wide editable defaults)
    {
      method: 'get',
      path: '/api/device-flows',
      access: READERS,
      handler: async (req) => {
        const own = await svc.getDeviceFlows(actorOf(req));
        return Object.entries(DEVICE_DEFAULTS).map(
          ([device, d]) =>
            ({
              device: device as TherapyDevice,
              label: d.label,
              defaultFlowLMin: d.flowLMin,
              rangeLMin: d.rangeLMin,
              source: d.source,
              flowLMin: own.find((o) => o.device === device)?.flowLMin ?? d.flowLMin,
              edited: own.some((o) => o.device === device),
            }) satisfies DeviceFlowView,
        );
      },
    },
    {
      method: 'put',
      path: '/api/device-flows',
      access: ['facilities_manager', 'administrator'],
      handler: (req) => svc.setDeviceFlows(actorOf(req), validate(deviceFlowsSchema, req.body, 'device flows').flows),
    },
  ];
}
