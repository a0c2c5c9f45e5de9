import { z } from 'zod';
import { listQuerySchema } from '@common/schemas/common.schema';
import type { RouteDef } from '../../http/route';
import { actorOf } from '../../http/context';
import { validate } from '../../http/validate';
import { listAudit } from './audit.service';

const auditQuerySchema = listQuerySchema.extend({ entity: z.string().max(64).optional() });

export function auditRoutes(): RouteDef[] {
  return [{ method: 'get', path: '/api/audit', access: ['administrator'], handler: (req) => listAudit(actorOf(req).user.organisationId, validate(auditQuerySchema, req.query, 'query')) }];
}
