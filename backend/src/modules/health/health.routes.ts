import type { RouteDef } from '../../http/route';
import { db } from '../../db/db';
import { Organisation } from '../../db/entities/organisation.entity';
import { mailStatus } from '../../mail/mailer';

/**
 * The Galera `wsrep_cluster_size` seen by the node this process is connected to; undefined on a single
 * server (no wsrep status) or when the status cannot be read.
 */
async function galeraClusterSize(): Promise<number | undefined> {
  try {
    const rows = (await db().query("SHOW GLOBAL STATUS LIKE 'wsrep_cluster_size'")) as { Value?: string }[];
    const n = Number(rows[0]?.Value);
    return Number.isInteger(n) && n > 0 ? n : undefined;
  } catch {
    return undefined;
  }
}

/**
 * GET /api/health: database and mail status; 503 while the database is unreachable or the app cannot
 * read through its data layer. Besides `SELECT 1` it reads one row through a TypeORM repository, the
 * path every screen takes: a process whose shared objects were corrupted (a polluted prototype makes
 * every `find` throw) answers the database but serves nothing, and must not report ok.
 */
export function healthRoutes(): RouteDef[] {
  return [
    {
      method: 'get',
      path: '/api/health',
      access: 'public',
      handler: async (_req, res) => {
        const started = Date.now();
        let database: { ok: boolean; latencyMs?: number; message?: string; clusterSize?: number };
        try {
          await db().query('SELECT 1');
          try {
            await readThroughRepository();
            database = { ok: true, latencyMs: Date.now() - started };
            const size = await galeraClusterSize();
            if (size !== undefined) database.clusterSize = size;
          } catch (e) {
            database = { ok: false, message: `the database answers, but the app cannot read through its data layer: ${(e as Error).message}` };
          }
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

/** One small read the way services read (repository, find options, order): throws if that path is broken. */
async function readThroughRepository(): Promise<void> {
  await db()
    .getRepository(Organisation)
    .find({ select: { id: true }, order: { id: 'ASC' }, take: 1 });
}
