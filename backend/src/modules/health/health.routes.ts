import type { RouteDef } from '../../http/route';
import { db } from '../../db/db';
import { mailStatus } from '../../mail/mailer';

/** GET /api/health: database and mail status; 503 while the database is unreachable. */
export function healthRoutes(): RouteDef[] {
  return [
    {
      method: 'get',
      path: '/api/health',
      access: 'public',
      handler: async (_req, res) => {
        const started = Date.now();
        let database: { ok: boolean; latencyMs?: number; message?: string };
        try {
          await db().query('SELECT 1');
          database = { ok: true, latencyMs: Date.now() - started };
        } catch (e) {
          database = { ok: false, message: (e as Error).message };
        }
        const mail = await mailStatus();
        const body = { status: database.ok ? (mail.ok ? 'ok' : 'degraded') : 'down', database, mail, time: new Date().toISOString() };
        res.status(database.ok ? 200 : 503).json(body);
        return undefined;
      },
    },
  ];
}
