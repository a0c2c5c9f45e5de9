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
    const latencies: number[] = [];
    let errors = 0;
    const until = Date.now() + SECONDS * 1000;
    await Promise.all(
      cookies.map(async (cookie) => {
        while (Date.now() < until) {
          const t0 = performance.now();
          const res = await fetch(`${app.baseUrl}/api/overview`, { headers: { cookie } });
          await res.arrayBuffer();
          latencies.push(performance.now() - t0);
          if (res.status !== 200) errors++;
        }
      }),
    );
    latencies.sort((a, b) => a - b);
    const p95 = percentile(latencies, 0.95);
    console.log(`overview_api_p50: ${percentile(latencies, 0.5).toFixed(1)} ms (${USERS} concurrent users, ${latencies.length} requests in ${SECONDS} s, ${errors} errors)`);
    console.log(`overview_api_p95: ${p95.toFixed(1)} ms (target ≤ 150 ms; ratio ${(p95 / 150).toFixed(2)} of target)`);
    console.log(`overview_api_p99: ${percentile(latencies, 0.99).toFixed(1)} ms`);
    console.log(`overview_api_throughput: ${(latencies.length / SECONDS).toFixed(0)} requests/s`);
  } finally {
    await app.stop();
  }
}
