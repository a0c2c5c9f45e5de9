import { idParamSchema } from '@common/schemas/common.schema';
import { cylinderTypeSchema, supplierSchema } from '@common/schemas/admin.schema';
import type { RouteDef } from '../../http/route';
import { actorOf } from '../../http/context';
import { validate } from '../../http/validate';
import * as svc from './catalogue.service';

const id = (params: unknown) => validate(idParamSchema, params, 'address').id;

export function catalogueRoutes(): RouteDef[] {
  return [
    { method: 'get', path: '/api/gases', access: 'authenticated', handler: () => svc.listGases() },
    { method: 'get', path: '/api/cylinder-types', access: 'authenticated', handler: (req) => svc.listCylinderTypes(actorOf(req)) },
    { method: 'get', path: '/api/cylinder-types/:id', access: 'authenticated', handler: (req) => svc.getCylinderType(actorOf(req), id(req.params)) },
    {
      method: 'post',
      path: '/api/cylinder-types',
      access: ['administrator'],
      handler: (req) => svc.createCylinderType(actorOf(req), validate(cylinderTypeSchema, req.body, 'cylinder type')),
    },
    {
      method: 'put',
      path: '/api/cylinder-types/:id',
      access: ['administrator'],
      handler: (req) => svc.updateCylinderType(actorOf(req), id(req.params), validate(cylinderTypeSchema, req.body, 'cylinder type')),
    },
    {
      method: 'get',
      path: '/api/suppliers',
      access: ['administrator', 'purchasing_officer', 'facilities_manager'],
      handler: (req) => svc.listSuppliers(actorOf(req)),
    },
    {
      method: 'get',
      path: '/api/suppliers/:id',
      access: ['administrator', 'purchasing_officer', 'facilities_manager'],
      handler: (req) => svc.getSupplier(actorOf(req), id(req.params)),
    },
    {
      method: 'post',
      path: '/api/suppliers',
      access: ['administrator'],
      handler: (req) => svc.createSupplier(actorOf(req), validate(supplierSchema, req.body, 'supplier')),
    },
    {
      method: 'put',
      path: '/api/suppliers/:id',
      access: ['administrator'],
      handler: (req) => svc.updateSupplier(actorOf(req), id(req.params), validate(supplierSchema, req.body, 'supplier')),
    },
  ];
}
