/**
 * Exponential back-off, the one helper for every retry loop: delay = base × 2^(attempt − 1), capped.
 * `full` jitter draws uniformly in [0, delay] (victims of one deadlock spread out at once); `spread`
 * draws in [0.75, 1.25] × delay (a retry schedule that stays readable to people, e.g. the mail outbox).
 * @param attempt 1 for the first retry
 */
export function backoffMs(attempt: number, opts: { baseMs: number; maxMs: number; jitter?: 'full' | 'spread'; random?: () => number }): number {
  const { baseMs, maxMs, jitter = 'spread', random = Math.random } = opts;
  const delay = Math.min(maxMs, baseMs * 2 ** Math.min(30, Math.max(0, attempt - 1)));
  return jitter === 'full' ? Math.round(random() * delay) : Math.min(maxMs, Math.round(delay * (0.75 + random() * 0.5)));
}
