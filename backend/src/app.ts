import { existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import express, { type Express, type Request, type Response, type NextFunction } from 'express';
import helmet from 'helmet';
import compression from 'compression';
import session from 'express-session';
import MySQLStoreFactory from 'express-mysql-session';
import { env } from './config/env';
import { configurePassport } from './modules/auth/passport';
import { requestId } from './middleware/request-id';
import { requireAccess } from './middleware/require-access';
import { requireCsrf } from './middleware/csrf';
import { errorHandler } from './middleware/error-handler';
import { routeTable } from './routes';
import type { RouteDef } from './http/route';
import { notFound } from './errors/app-error';

const distDir = fileURLToPath(new URL('../../dist/', import.meta.url));
const STATE_CHANGING = new Set(['post', 'put', 'patch', 'delete']);

export interface AppHandle {
  app: Express;
  close: () => Promise<void>;
}

/** Builds the Express app (no listen): middleware → routes from the route table → error handler. */
export async function createApp(): Promise<AppHandle> {
  const e = env();
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', e.TRUST_PROXY === 'false' || e.TRUST_PROXY === '' ? false : e.TRUST_PROXY);
  app.set('query parser', 'simple');

  app.use(requestId);
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          styleSrc: ["'self'", "'unsafe-inline'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          fontSrc: ["'self'", 'data:'],
          connectSrc: ["'self'"],
          objectSrc: ["'none'"],
          frameAncestors: ["'none'"],
          baseUri: ["'self'"],
          formAction: ["'self'"],
          upgradeInsecureRequests: e.COOKIE_SECURE ? [] : null,
        },
      },
      strictTransportSecurity: e.COOKIE_SECURE,
    }),
  );
  // gzip/deflate for JSON, CSV (streamed exports too: compression keeps write/drain back-pressure) and the
  // built front end, when the client asks for it (Accept-Encoding); answers under 1 kB go as they are.
  app.use(compression());
  app.use(express.json({ limit: '1mb' }));

  const MySQLStore = MySQLStoreFactory(session as never);
  const store = new MySQLStore({
    host: e.DB_HOST,
    port: e.DB_PORT,
    user: e.DB_USER,
    password: e.DB_PASSWORD,
    database: e.DB_NAME,
    createDatabaseTable: false,
    clearExpired: true,
    checkExpirationInterval: 15 * 60 * 1000,
    connectionLimit: 5,
  } as never);
  await (store as unknown as { onReady(): Promise<void> }).onReady();

  app.use(
    '/api',
    session({
      name: 'plenum.sid',
      secret: e.SESSION_SECRET,
      store: store as never,
      resave: false,
      saveUninitialized: false,
      // Not rolling: a session lasts one shift from sign-in, and no request pays for a store write.
      rolling: false,
      cookie: { httpOnly: true, sameSite: 'lax', secure: e.COOKIE_SECURE, maxAge: e.SESSION_MAX_AGE_HOURS * 3600 * 1000, path: '/' },
    }),
  );
  const passport = configurePassport();
  app.use('/api', passport.initialize());
  app.use('/api', passport.session());
  app.use('/api', (_req: Request, res: Response, next: NextFunction) => {
    res.setHeader('Cache-Control', 'no-store');
    next();
  });

  for (const route of routeTable()) register(app, route);

  app.use('/api', (_req: Request, _res: Response, next: NextFunction) => next(notFound('API route')));

  if (e.SERVE_FRONTEND && existsSync(path.join(distDir, 'index.html'))) {
    app.use(
      express.static(distDir, {
        index: false,
        maxAge: '1h',
        setHeaders: (res, file) => file.includes(`${path.sep}assets${path.sep}`) && res.setHeader('Cache-Control', 'public, max-age=31536000, immutable'),
      }),
    );
    app.get('/{*splat}', (_req: Request, res: Response) => {
      res.setHeader('Cache-Control', 'no-cache');
      res.sendFile(path.join(distDir, 'index.html'));
    });
  }

  app.use(errorHandler);

  return {
    app,
    close: async () => {
      await (store as unknown as { close(): Promise<void> }).close();
    },
  };
}

function register(app: Express, route: RouteDef): void {
  const chain: ((req: Request, res: Response, next: NextFunction) => void)[] = [requireAccess(route.access)];
  if (STATE_CHANGING.has(route.method) && route.csrf !== false) chain.push(requireCsrf);
  if (route.before) chain.push(...route.before);
  app[route.method](route.path, ...chain, async (req: Request, res: Response) => {
    const result = await route.handler(req, res);
    if (result !== undefined && !res.headersSent) {
      // The browser may keep it, but must ask again each time: Express's ETag answers 304 when unchanged.
      if (route.revalidate) res.setHeader('Cache-Control', 'private, no-cache');
      res.json(result);
    }
  });
}
