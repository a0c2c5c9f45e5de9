import { calcVerbs } from '@common/calc/verbs';
import type { RouteDef } from '../../http/route';

/** POST /api/calc/VERB: the same pure verbs as `npm run calc -- VERB`, for signed-in users. */
export function calcRoutes(): RouteDef[] {
  return Object.entries(calcVerbs).map(([verb, fn]) => ({
    method: 'post' as const,
    path: `/api/calc/${verb}`,
    access: 'authenticated' as const,
    handler: (req) => fn(req.body),
  }));
}
