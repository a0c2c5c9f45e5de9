import { env } from '../../config/env';
import { db } from '../../db/db';
import { logger } from '../../logger';
import { startOutboxWorker, type OutboxWorker } from './outbox.service';
import { raiseRequestsForCrossings } from './requests.service';
import { runAlertPass, runDigestPass } from './alerts.service';

export interface OrderJobs {
  stop: () => Promise<void>;
}

/** A timer that runs `task` every `everyMs`, never two at once, and waits for the current run on stop. */
function every(name: string, everyMs: number, task: () => Promise<unknown>) {
  let stopped = false;
  let timer: NodeJS.Timeout | undefined;
  let running: Promise<void> = Promise.resolve();
  const tick = () => {
    if (stopped) return;
    running = task()
      .then(() => undefined)
      .catch((e: Error) => logger.error(`${name}: ${e.message}`))
      .finally(() => {
        if (!stopped) timer = setTimeout(tick, everyMs);
      });
  };
  timer = setTimeout(tick, Math.min(everyMs, 5_000));
  return async () => {
    stopped = true;
    if (timer) clearTimeout(timer);
    await running;
  };
}

/**
 * The background work of orders, started by main.ts (not by createApp, so tests drive it by hand): the
 * outbox worker, the reorder scan that raises requests on forecast crossings, alerts and digests, and the
 * clean-up of old idempotency keys. Safe to run in several processes at once.
 */
export function startOrderJobs(): OrderJobs {
  const e = env();
  const worker: OutboxWorker = startOutboxWorker({ pollMs: e.OUTBOX_POLL_MS });
  const stops = [
    every('reorder scan', e.ORDERS_SCAN_MS, async () => {
      const ids = await raiseRequestsForCrossings();
      if (ids.length) logger.info(`reorder scan raised ${ids.length} request(s)`);
    }),
    every('alerts', e.ALERTS_POLL_MS, async () => {
      await runAlertPass();
      await runDigestPass();
    }),
    every('idempotency clean-up', 3_600_000, () => db().query('DELETE FROM idempotency_key WHERE created_at < NOW(3) - INTERVAL 1 DAY')),
  ];
  return {
    stop: async () => {
      await Promise.all([worker.stop(), ...stops.map((s) => s())]);
    },
  };
}
