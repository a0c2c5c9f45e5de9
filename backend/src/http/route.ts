import type { Request, Response } from 'express';
import type { Role } from '@common/api/roles';

/** Who may call a route: anyone, any signed-in user, or holders of one of the listed roles. */
export type Access = 'public' | 'authenticated' | readonly Role[];

export interface RouteDef {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  path: string;
  access: Access;
  /** State-changing routes check the CSRF token unless this is false (only sign-in). */
  csrf?: boolean;
  /** Extra middleware (rate limiters, uploads), run after auth and CSRF. */
  before?: ((req: Request, res: Response, next: (err?: unknown) => void) => void)[];
  /** Returns the JSON body (status 200), or handles `res` itself and returns undefined. */
  handler: (req: Request, res: Response) => unknown;
}
