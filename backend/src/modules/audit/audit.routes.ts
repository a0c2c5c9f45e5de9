import { auditListQuerySchema } from '@common/schemas/common.schema';
import type { RouteDef } from '../../http/route';
import { actorOf } from '../../http/context';
import { validate } from '../../http/validate';
import { listAudit } from './audit.service';

export function auditRoutes(): RouteDef[] {
  return [
    {
      method: 'get',
      path: '/api/audit',
      access: ['administrator'],
      handler: (req) => listAudit(actorOf(req).user.organisationId, validate(auditListQuerySchema, req.query, 'query')),
    },
  ];
}
