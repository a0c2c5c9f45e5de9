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
  /**
   * A GET whose answer is cached on the server (by data version): sent as `private, no-cache` instead of
   * `no-store`, so the browser keeps it and revalidates with its ETag (a 304 when unchanged). The ETag is a
   * hash of the body, so a 304 never hands one user's answer to another.
   */
  revalidate?: boolean;
  /** Returns the JSON body (status 200), or handles `res` itself and returns undefined. */
  handler: (req: Request, res: Response) => unknown;
}
