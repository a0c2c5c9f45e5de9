import { idParamSchema } from '@common/schemas/common.schema';
import {
  reconciliationQuerySchema,
  usageListQuerySchema,
  usageReportCreateSchema,
  usageReportUpdateSchema,
  usageStatusQuerySchema,
} from '@common/schemas/usage.schema';
import type { Role } from '@common/api/roles';
import type { RouteDef } from '../../http/route';
import { actorOf } from '../../http/context';
import { validate } from '../../http/validate';
import * as svc from './usage.service';
import { siteReconciliation, sourceReconciliation } from './reconciliation.service';

const id = (params: unknown) => validate(idParamSchema, params, 'address').id;
/** Ward leads file their ward's report; facilities managers file and correct any. */
const REPORTERS: Role[] = ['ward_lead', 'facilities_manager'];

export function usageRoutes(): RouteDef[] {
  return [
    {
      method: 'get',
      path: '/api/wards/:id/usage-reports',
      access: 'authenticated',
      handler: (req) => svc.openReport(actorOf(req), id(req.params), validate(usageListQuerySchema, req.query, 'query')),
    },
    {
      method: 'post',
      path: '/api/wards/:id/usage-reports',
      access: REPORTERS,
      handler: (req) => svc.createReport(actorOf(req), id(req.params), validate(usageReportCreateSchema, req.body, 'report')),
    },
    { method: 'get', path: '/api/usage-reports/:id', access: 'authenticated', handler: (req) => svc.getReport(actorOf(req), id(req.params)) },
    {
      method: 'put',
      path: '/api/usage-reports/:id',
      access: REPORTERS,
      handler: (req) => svc.updateReport(actorOf(req), id(req.params), validate(usageReportUpdateSchema, req.body, 'report')),
    },
    {
      method: 'get',
      path: '/api/sites/:id/usage-status',
      access: 'authenticated',
      handler: (req) => svc.usageStatus(actorOf(req), id(req.params), validate(usageStatusQuerySchema, req.query, 'query').date),
    },
    {
      method: 'get',
      path: '/api/sites/:id/reconciliation',
      access: 'authenticated',
      handler: (req) => siteReconciliation(actorOf(req), id(req.params), validate(reconciliationQuerySchema, req.query, 'query').days),
    },
    {
      method: 'get',
      path: '/api/sources/:id/reconciliation',
      access: 'authenticated',
      handler: (req) => sourceReconciliation(actorOf(req), id(req.params), validate(reconciliationQuerySchema, req.query, 'query').days),
    },
  ];
}
