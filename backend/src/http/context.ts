import type { Request } from 'express';
import type { Role } from '@common/api/roles';
import { unauthorised } from '../errors/app-error';

/** The signed-in user as every service sees it: organisation, roles and the sites granted. */
export interface AuthUser {
  id: number;
  organisationId: number;
  email: string;
  name: string;
  roles: Role[];
  siteIds: number[];
}

/** What a service needs of a request: the actor and a request id for the audit log. */
export interface Actor {
  user: AuthUser;
  requestId: string;
}

declare global {
  // Express and passport type req.user through this global namespace: merging into it is the only way.
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends AuthUser {}
    interface Request {
      id: string;
    }
  }
}

declare module 'express-session' {
  interface SessionData {
    csrfToken?: string;
  }
}

export function actorOf(req: Request): Actor {
  if (!req.user) throw unauthorised();
  return { user: req.user, requestId: String(req.id) };
}
