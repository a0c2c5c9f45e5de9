import { idParamSchema, userListQuerySchema } from '@common/schemas/common.schema';
import { userCreateSchema, userUpdateSchema, userWardsSchema } from '@common/schemas/admin.schema';
import type { RouteDef } from '../../http/route';
import { actorOf } from '../../http/context';
import { validate } from '../../http/validate';
import { createUser, getUserWards, listUsers, setUserWards, unlockUser, updateUser } from './users.service';
import { keepSessionSignedIn } from '../auth/passport';

export function userRoutes(): RouteDef[] {
  return [
    {
      method: 'get',
      path: '/api/users',
      access: ['administrator'],
      handler: (req) => listUsers(actorOf(req), validate(userListQuerySchema, req.query, 'query')),
    },
    { method: 'post', path: '/api/users', access: ['administrator'], handler: (req) => createUser(actorOf(req), validate(userCreateSchema, req.body, 'user')) },
    {
      method: 'patch',
      path: '/api/users/:id',
      access: ['administrator'],
      handler: async (req) => {
        const actor = actorOf(req);
        const id = validate(idParamSchema, req.params, 'address').id;
        const input = validate(userUpdateSchema, req.body, 'user');
        const row = await updateUser(actor, id, input);
        // A new password ends the user's sessions; an administrator resetting their own keeps this one.
        if (input.password && id === actor.user.id) await keepSessionSignedIn(req, id);
        return row;
      },
    },
    {
      method: 'post',
      path: '/api/users/:id/unlock',
      access: ['administrator'],
      handler: (req) => unlockUser(actorOf(req), validate(idParamSchema, req.params, 'address').id),
    },
    // Ward grants: the wards a ward lead sees and reports for (the whole set on PUT: grants and revokes).
    {
      method: 'get',
      path: '/api/users/:id/wards',
      access: ['administrator'],
      handler: (req) => getUserWards(actorOf(req), validate(idParamSchema, req.params, 'address').id),
    },
    {
      method: 'put',
      path: '/api/users/:id/wards',
      access: ['administrator'],
      handler: (req) => setUserWards(actorOf(req), validate(idParamSchema, req.params, 'address').id, validate(userWardsSchema, req.body, 'ward grants')),
    },
  ];
}
