import { idParamSchema, userListQuerySchema } from '@common/schemas/common.schema';
import { userCreateSchema, userUpdateSchema } from '@common/schemas/admin.schema';
import type { RouteDef } from '../../http/route';
import { actorOf } from '../../http/context';
import { validate } from '../../http/validate';
import { createUser, listUsers, unlockUser, updateUser } from './users.service';

export function userRoutes(): RouteDef[] {
  return [
    { method: 'get', path: '/api/users', access: ['administrator'], handler: (req) => listUsers(actorOf(req), validate(userListQuerySchema, req.query, 'query')) },
    { method: 'post', path: '/api/users', access: ['administrator'], handler: (req) => createUser(actorOf(req), validate(userCreateSchema, req.body, 'user')) },
    {
      method: 'patch',
      path: '/api/users/:id',
      access: ['administrator'],
      handler: (req) => updateUser(actorOf(req), validate(idParamSchema, req.params, 'address').id, validate(userUpdateSchema, req.body, 'user')),
    },
    {
      method: 'post',
      path: '/api/users/:id/unlock',
      access: ['administrator'],
      handler: (req) => unlockUser(actorOf(req), validate(idParamSchema, req.params, 'address').id),
    },
  ];
}
