/**
 * The source detail of the demo's bulk tank against the overview, in the same run: 20 concurrent
 * signed-in users each (one after the other, same app, same database), on a private MariaDB and an
 * in-process app; loopback only, bounded in time. The load asks for gzip, as a browser does.
 *
 * Targets (from the issue on hot paths at health-system scale): source detail p95 ≤ 60 ms, its throughput
 * at least a third of the overview's, and ≤ 40 kB on the wire (gzip).
 */
import { request as httpRequest } from 'node:http';
import os from 'node:os';
import { percentile, signIn, startPrivateApp } from './lib/private-app';

const USERS = 20;
const SECONDS = 15;
const P95_TARGET_MS = 60;
const WIRE_TARGET_KB = 40;

async function load(url: string, cookies: string[]): Promise<{ latencies: number[]; errors: number }> {
  const { fork } = await import('node:child_process');
  const child = fork(new URL('./lib/load-worker.ts', import.meta.url), [], {
    execArgv: ['--import', 'tsx'],
    env: { ...process.env, PLENUM_LOAD: JSON.stringify({ url, cookies, seconds: SECONDS, headers: { 'accept-encoding': 'gzip' } }) },
  });
  const out = await new Promise<{ latencies: number[]; errors: number }>((resolve, reject) => {
    child.once('message', (m) => resolve(m as { latencies: number[]; errors: number }));
    child.once('error', reject);
  });
  out.latencies.sort((a, b) => a - b);
  return out;
}

/** Bytes of the body as sent (no decoding), with and without gzip. */
function wireBytes(url: string, cookie: string, encoding: string): Promise<{ bytes: number; encoding: string }> {
  const u = new URL(url);
  return new Promise((resolve, reject) => {
    const req = httpRequest({ host: u.hostname, port: u.port, path: u.pathname + u.search, headers: { cookie, 'accept-encoding': encoding } }, (res) => {
      let bytes = 0;
      res.on('data', (d: Buffer) => (bytes += d.length));
      res.on('end', () => resolve({ bytes, encoding: String(res.headers['content-encoding'] ?? 'identity') }));
      res.on('error', reject);
    });
    req.on('error', reject);
    req.end();
  });
}

export async function run(): Promise<void> {
  const app = await startPrivateApp();
  try {
    const cookies = await Promise.all(Array.from({ length: USERS }, () => signIn(app.baseUrl, 'facilities@plenum.example')));
    const get = async <T>(path: string): Promise<T> => (await fetch(app.baseUrl + path, { headers: { cookie: cookies[0] } })).json() as Promise<T>;
    const overview = await get<{ sites: { sources: { id: number; type: string; name: string }[] }[] }>('/api/overview');
    const tank = overview.sites.flatMap((s) => s.sources).find((s) => s.type === 'bulk_liquid');
    if (!tank) throw new Error('the demo organisation has no bulk tank');
    const detailUrl = `${app.baseUrl}/api/sources/${tank.id}`;
    const overviewUrl = `${app.baseUrl}/api/overview`;
    // Warm up (JIT, pools).
    for (let i = 0; i < 10; i++) {
      await fetch(overviewUrl, { headers: { cookie: cookies[0] } }).then((r) => r.arrayBuffer());
      await fetch(detailUrl, { headers: { cookie: cookies[0] } }).then((r) => r.arrayBuffer());
    }
    const ov = await load(overviewUrl, cookies);
    const sd = await load(detailUrl, cookies);
    const ovRate = ov.latencies.length / SECONDS;
    const sdRate = sd.latencies.length / SECONDS;
    const p95 = percentile(sd.latencies, 0.95);
    console.log(
      `overview_p50_p95: ${percentile(ov.latencies, 0.5).toFixed(1)} / ${percentile(ov.latencies, 0.95).toFixed(1)} ms (${USERS} concurrent users, ${ov.latencies.length} requests in ${SECONDS} s, ${ov.errors} errors)`,
    );
    console.log(`overview_throughput: ${ovRate.toFixed(0)} requests/s`);
    console.log(
      `source_detail_p50: ${percentile(sd.latencies, 0.5).toFixed(1)} ms (${USERS} concurrent users, ${sd.latencies.length} requests in ${SECONDS} s, ${sd.errors} errors; ${tank.name})`,
    );
    console.log(`source_detail_p95: ${p95.toFixed(1)} ms (target ≤ ${P95_TARGET_MS} ms; ratio ${(p95 / P95_TARGET_MS).toFixed(2)} of target)`);
    console.log(
      `source_detail_throughput: ${sdRate.toFixed(0)} requests/s (target ≥ a third of the overview's, ${(ovRate / 3).toFixed(0)}; ratio ${(ovRate / 3 / sdRate).toFixed(2)} of target)`,
    );
    const gz = await wireBytes(detailUrl, cookies[0], 'gzip');
    const plain = await wireBytes(detailUrl, cookies[0], 'identity');
    console.log(
      `source_detail_wire: ${(gz.bytes / 1024).toFixed(1)} kB (${gz.encoding}; ${(plain.bytes / 1024).toFixed(1)} kB uncompressed; target ≤ ${WIRE_TARGET_KB} kB; ratio ${(gz.bytes / 1024 / WIRE_TARGET_KB).toFixed(2)} of target)`,
    );
    console.log(
      `machine_load_average: ${os
        .loadavg()
        .map((x) => x.toFixed(1))
        .join(' ')} (1/5/15 min, on ${os.cpus().length} cores shared with other work; latency figures are only meaningful on a quiet machine)`,
    );
    if (ov.errors + sd.errors > 0) throw new Error(`errors under load: overview ${ov.errors}, source detail ${sd.errors}`);
  } finally {
    await app.stop();
  }
}
