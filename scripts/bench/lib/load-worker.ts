/**
 * Load generator in its own process (so it does not share the server's event loop): closed-loop users.
 * Reads {url, cookies, seconds, headers?} from the PLENUM_LOAD environment variable; sends {latencies, errors}.
 */
const { url, cookies, seconds, headers } = JSON.parse(process.env.PLENUM_LOAD ?? '{}') as {
  url: string;
  cookies: string[];
  seconds: number;
  headers?: Record<string, string>;
};
const latencies: number[] = [];
let errors = 0;
const until = Date.now() + seconds * 1000;
await Promise.all(
  cookies.map(async (cookie) => {
    while (Date.now() < until) {
      const t0 = performance.now();
      try {
        const res = await fetch(url, { headers: { ...headers, cookie } });
        await res.arrayBuffer();
        if (res.status !== 200) errors++;
      } catch {
        errors++;
      }
      latencies.push(performance.now() - t0);
    }
  }),
);
process.send!({ latencies, errors }, () => process.exit(0));
export {};
