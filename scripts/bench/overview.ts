/**
 * The overview API for the demo organisation under 20 concurrent signed-in users (target p95 ≤ 150 ms),
 * on a private MariaDB and an in-process app; loopback only, bounded in time.
 */
import { percentile, signIn, startPrivateApp } from './lib/private-app';

const USERS = 20;
const SECONDS = 15;

export async function run(): Promise<void> {
  const app = await startPrivateApp();
  try {
    const cookies = await Promise.all(Array.from({ length: USERS }, () => signIn(app.baseUrl, 'facilities@plenum.example')));
    // Warm up (JIT, pools).
    for (let i = 0; i < 10; i++) await fetch(`${app.baseUrl}/api/overview`, { headers: { cookie: cookies[0] } }).then((r) => r.arrayBuffer());
    const { fork } = await import('node:child_process');
    const child = fork(new URL('./lib/load-worker.ts', import.meta.url), [], {
      execArgv: ['--import', 'tsx'],
      env: { ...process.env, PLENUM_LOAD: JSON.stringify({ url: `${app.baseUrl}/api/overview`, cookies, seconds: SECONDS }) },
    });
    const { latencies, errors } = await new Promise<{ latencies: number[]; errors: number }>((resolve, reject) => {
      child.once('message', (m) => resolve(m as { latencies: number[]; errors: number }));
      child.once('error', reject);
    });
    latencies.sort((a, b) => a - b);
    const p95 = percentile(latencies, 0.95);
    console.log(
      `overview_api_p50: ${percentile(latencies, 0.5).toFixed(1)} ms (${USERS} concurrent users, ${latencies.length} requests in ${SECONDS} s, ${errors} errors)`,
    );
    console.log(`overview_api_p95: ${p95.toFixed(1)} ms (target ≤ 150 ms; ratio ${(p95 / 150).toFixed(2)} of target)`);
    console.log(`overview_api_p99: ${percentile(latencies, 0.99).toFixed(1)} ms`);
    console.log(`overview_api_throughput: ${(latencies.length / SECONDS).toFixed(0)} requests/s`);
    // Load-independent figure: CPU time of this process (server and client) per sequential request.
    const N = 200;
    const cpu0 = process.cpuUsage();
    for (let i = 0; i < N; i++) await fetch(`${app.baseUrl}/api/overview`, { headers: { cookie: cookies[i % USERS] } }).then((r) => r.arrayBuffer());
    const cpu = process.cpuUsage(cpu0);
    console.log(
      `overview_api_cpu_per_request: ${((cpu.user + cpu.system) / 1000 / N).toFixed(2)} ms (server + client in one process; at 20 users the p95 target needs ≲ 7 ms)`,
    );
    console.log(
      `machine_load_average: ${(await import('node:os')).loadavg()[0].toFixed(1)} (on ${(await import('node:os')).cpus().length} cores; latency figures are only meaningful on a quiet machine)`,
    );
  } finally {
    await app.stop();
  }
}
