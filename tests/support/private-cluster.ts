import { execFile, execFileSync, spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';

const root = fileURLToPath(new URL('../../', import.meta.url));
const run = promisify(execFile);
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

export interface PrivateCluster {
  dir: string;
  /** HAProxy's SQL port (node 1 active, 2 and 3 backups); node i listens on sqlPort + i. */
  sqlPort: number;
  /** Runs SQL as root on node i through its socket; rows as tab-separated lines. */
  sql: (i: number, query: string) => string;
  /** SIGKILL to node i (a crash: no clean leave). */
  kill: (i: number) => void;
  /** Starts node i again (it rejoins by IST, or SST when the donor's cache lacks what it missed). */
  startNode: (i: number) => void;
  /** Waits until node i is Synced and sees `size` members. */
  waitSynced: (i: number, size?: number, timeoutMs?: number) => Promise<void>;
  /** HAProxy (HTTP) on a free port in front of the given app ports; resolves with its port. */
  httpProxy: (appPorts: number[]) => Promise<number>;
  /** Stops every node (cleanly, then SIGKILL) and HAProxy, and deletes the folder. */
  destroy: () => Promise<void>;
}

async function portFree(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const s = createServer();
    s.once('error', () => resolve(false));
    s.listen(port, '127.0.0.1', () => s.close(() => resolve(true)));
  });
}

/** A base port B with B … B+43 free (the layout of scripts/lib/cluster.sh). */
async function freeBase(): Promise<number> {
  for (let attempt = 0; attempt < 50; attempt++) {
    const base = 20_000 + Math.floor(Math.random() * 400) * 100;
    const ports = [base, 1, 2, 3, 11, 12, 13, 21, 22, 23, 31, 32, 33].map((d, k) => (k === 0 ? d : base + d));
    let ok = true;
    for (const p of ports) if (!(await portFree(p))) ok = false;
    if (ok) return base;
  }
  throw new Error('no free range of ports for a private cluster');
}

const alive = (pid: number) => {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
};

/**
 * A three-node Galera cluster of a test's own, in a temporary folder on free loopback ports, started with
 * the functions of scripts/lib/cluster.sh (as scripts/cluster does), with HAProxy for SQL in front and the
 * database `name` and the test user (DB_USER/DB_PASSWORD, with every privilege) created in it.
 */
export async function startPrivateCluster(name: string): Promise<PrivateCluster> {
  const base = await freeBase();
  const dir = mkdtempSync(path.join(os.tmpdir(), 'plenum-cluster-'));
  const user = process.env.DB_USER ?? 'plenum_test';
  const password = process.env.DB_PASSWORD ?? 'plenum-test';
  const extra: ChildProcess[] = [];
  const nodePid = (i: number) => {
    try {
      return Number(readFileSync(path.join(dir, `node${i}`, 'mysqld.pid'), 'utf8').trim());
    } catch {
      return 0;
    }
  };
  const sql = (i: number, query: string) =>
    execFileSync('mariadb', ['--no-defaults', `--socket=${path.join(dir, `node${i}`, 'mysqld.sock')}`, '-uroot', '-N', '-B', '-e', query], {
      encoding: 'utf8',
      stdio: ['ignore', 'pipe', 'pipe'],
    });
  const script = `
    set -e
    ROOT=${JSON.stringify(root)}; . "$ROOT/scripts/lib/setup.sh"; . "$ROOT/scripts/lib/cluster.sh"
    ensure_cluster_packages >/dev/null
    cluster_start ${JSON.stringify(dir)} ${base}
    haproxy_config ${JSON.stringify(dir)}/sql.cfg ${JSON.stringify(dir)} ${base} 0
    haproxy_start ${JSON.stringify(dir)}/sql.cfg
    echo $HAPROXY_PID > ${JSON.stringify(dir)}/sql-haproxy.pid
    MARIADB_SOCK=${JSON.stringify(dir)}/node1/mysqld.sock
    create_database ${name} ${user} ${JSON.stringify(password)} >/dev/null
    grant_all ${user} >/dev/null
  `;
  const destroy = async () => {
    for (const c of extra) c.kill('SIGKILL');
    try {
      process.kill(Number(readFileSync(path.join(dir, 'sql-haproxy.pid'), 'utf8')), 'SIGKILL');
    } catch {
      /* not running */
    }
    const pids = [1, 2, 3].map(nodePid).filter(alive);
    for (const p of pids) process.kill(p, 'SIGTERM');
    for (let t = 0; t < 150 && pids.some(alive); t++) await sleep(200);
    for (const p of pids.filter(alive)) process.kill(p, 'SIGKILL');
    rmSync(dir, { recursive: true, force: true });
  };
  try {
    await run('bash', ['-c', script], { maxBuffer: 1 << 20 });
  } catch (e) {
    const err = e as { stdout?: string; stderr?: string };
    await destroy();
    throw new Error(`the private cluster did not start:\n${err.stdout ?? ''}${err.stderr ?? ''}`);
  }
  const status = (i: number, v: string) => {
    try {
      return sql(i, `SHOW GLOBAL STATUS LIKE '${v}'`).split('\t')[1]?.trim();
    } catch {
      return undefined;
    }
  };
  return {
    dir,
    sqlPort: base,
    sql,
    kill: (i) => {
      const p = nodePid(i);
      if (p) process.kill(p, 'SIGKILL');
    },
    startNode: (i) => {
      // As scripts/lib/cluster.sh starts a node (after a crash: recover the position first, then IST).
      const start = `ROOT=${JSON.stringify(root)}; . "$ROOT/scripts/lib/setup.sh"; . "$ROOT/scripts/lib/cluster.sh"; ensure_mariadb; cluster_start_node ${JSON.stringify(dir)} ${i}`;
      execFileSync('bash', ['-c', start], { stdio: 'ignore' });
    },
    waitSynced: async (i, size = 3, timeoutMs = 90_000) => {
      const deadline = Date.now() + timeoutMs;
      while (!(status(i, 'wsrep_local_state') === '4' && status(i, 'wsrep_cluster_size') === String(size))) {
        if (Date.now() > deadline)
          throw new Error(`node ${i} not synced in ${timeoutMs} ms:\n${readFileSync(path.join(dir, `node${i}`, 'error.log'), 'utf8').slice(-3000)}`);
        await sleep(250);
      }
    },
    httpProxy: async (appPorts) => {
      let port = 0;
      for (let t = 0; t < 50 && !port; t++) {
        const p = 20_000 + Math.floor(Math.random() * 40_000);
        if (await portFree(p)) port = p;
      }
      const cfg = path.join(dir, `http-${port}.cfg`);
      const write = `ROOT=${JSON.stringify(root)}; . "$ROOT/scripts/lib/setup.sh"; . "$ROOT/scripts/lib/cluster.sh"; HAPROXY=$(command -v haproxy || echo /usr/sbin/haproxy); haproxy_config ${JSON.stringify(cfg)} ${JSON.stringify(dir)} 0 ${port} ${appPorts.join(' ')}`;
      execFileSync('bash', ['-c', write]);
      const hp = spawn('/usr/sbin/haproxy', ['-db', '-f', cfg], { stdio: 'ignore' });
      extra.push(hp);
      for (let t = 0; t < 100 && (await portFree(port)); t++) await sleep(50);
      return port;
    },
    destroy,
  };
}
