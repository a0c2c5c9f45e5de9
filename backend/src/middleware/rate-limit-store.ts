import type { Store, Options, ClientRateLimitInfo } from 'express-rate-limit';
import { db } from '../db/db';

/**
 * express-rate-limit store in MariaDB, so that several app processes behind a load balancer share one
 * count per key (a memory store would give each process its own allowance).
 */
export class MariaDbRateLimitStore implements Store {
  windowMs = 15 * 60 * 1000;
  prefix: string;
  localKeys = false;

  constructor(prefix: string) {
    this.prefix = prefix;
  }

  init(options: Options): void {
    this.windowMs = options.windowMs;
  }

  private key(key: string): string {
    return `${this.prefix}:${key}`.slice(0, 190);
  }

  async get(key: string): Promise<ClientRateLimitInfo | undefined> {
    const rows: { hits: number; reset_at: Date }[] = await db().query('SELECT hits, reset_at FROM rate_limit_hit WHERE k = ? AND reset_at > NOW(3)', [
      this.key(key),
    ]);
    return rows[0] ? { totalHits: Number(rows[0].hits), resetTime: new Date(rows[0].reset_at) } : undefined;
  }

  async increment(key: string): Promise<ClientRateLimitInfo> {
    const k = this.key(key);
    const ms = this.windowMs * 1000; // microseconds for TIMESTAMPADD
    await db().query(
      `INSERT INTO rate_limit_hit (k, hits, reset_at) VALUES (?, 1, TIMESTAMPADD(MICROSECOND, ?, NOW(3)))
       ON DUPLICATE KEY UPDATE
         hits = IF(reset_at <= NOW(3), 1, hits + 1),
         reset_at = IF(reset_at <= NOW(3), TIMESTAMPADD(MICROSECOND, ?, NOW(3)), reset_at)`,
      [k, ms, ms],
    );
    const rows: { hits: number; reset_at: Date }[] = await db().query('SELECT hits, reset_at FROM rate_limit_hit WHERE k = ?', [k]);
    return { totalHits: Number(rows[0]?.hits ?? 1), resetTime: rows[0] ? new Date(rows[0].reset_at) : undefined };
  }

  async decrement(key: string): Promise<void> {
    await db().query('UPDATE rate_limit_hit SET hits = GREATEST(hits - 1, 0) WHERE k = ?', [this.key(key)]);
  }

  async resetKey(key: string): Promise<void> {
    await db().query('DELETE FROM rate_limit_hit WHERE k = ?', [this.key(key)]);
  }

  async resetAll(): Promise<void> {
    await db().query('DELETE FROM rate_limit_hit WHERE k LIKE ?', [`${this.prefix}:%`]);
  }
}
