import { idParamSchema } from '@common/schemas/common.schema';
import { organisationSchema, siteSchema } from '@common/schemas/admin.schema';
import type { RouteDef } from '../../http/route';
import { actorOf } from '../../http/context';
import { validate } from '../../http/validate';
import { createSite, getOrganisation, getSiteFor, listSites, presentSite, renameOrganisation, updateSite } from './sites.service';

export function siteRoutes(): RouteDef[] {
  return [
    { method: 'get', path: '/api/organisation', access: 'authenticated', handler: (req) => getOrganisation(actorOf(req)) },
    {
      method: 'patch',
      path: '/api/organisation',
      access: ['administrator'],
      handler: (req) => renameOrganisation(actorOf(req), validate(organisationSchema, req.body, 'organisation').name),
    },
    { method: 'get', path: '/api/sites', access: 'authenticated', handler: (req) => listSites(actorOf(req)) },
    {
      method: 'get',
      path: '/api/sites/:id',
      access: 'authenticated',
      handler: async (req) => presentSite(await getSiteFor(actorOf(req), validate(idParamSchema, req.params, 'address').id)),
    },
    { method: 'post', path: '/api/sites', access: ['administrator'], handler: (req) => createSite(actorOf(req), validate(siteSchema, req.body, 'site')) },
    {
      method: 'put',
      path: '/api/sites/:id',
      access: ['administrator'],
      handler: (req) => updateSite(actorOf(req), validate(idParamSchema, req.params, 'address').id, validate(siteSchema, req.body, 'site')),
    },
  ];
}
