import { z } from 'zod';

/**
 * The one place that reads process.env. Parsed once at start-up; a bad value stops the process with a
 * list of every problem, rather than failing later in a request.
 */
const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(1).max(65535).default(8080),
  DB_HOST: z.string().default('127.0.0.1'),
  DB_PORT: z.coerce.number().int().min(1).max(65535).default(3307),
  DB_USER: z.string().default('plenum'),
  DB_PASSWORD: z.string().default('plenum-dev'),
  DB_NAME: z.string().default('plenum'),
  DB_POOL_SIZE: z.coerce.number().int().min(1).max(200).default(10),
  SESSION_SECRET: z.string().min(16, 'SESSION_SECRET must be at least 16 characters').default('plenum-development-session-secret'),
  SESSION_MAX_AGE_HOURS: z.coerce.number().positive().default(12),
  COOKIE_SECURE: z
    .enum(['true', 'false'])
    .default('false')
    .transform((v) => v === 'true'),
  /**
   * Express `trust proxy`: the address(es) of the load balancer whose X-Forwarded-For and X-Forwarded-Proto
   * are believed (e.g. 127.0.0.1, comma-separated for several). Default: no proxy is trusted, so a client
   * cannot pick the address the sign-in rate limit counts. 'true' (trust anyone) is refused.
   */
  TRUST_PROXY: z
    .string()
    .trim()
    .default('false')
    .refine((v) => v.toLowerCase() !== 'true', "list the proxy's address(es) instead of 'true' (which would trust any client's X-Forwarded-For)"),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  SMTP_SECURE: z
    .enum(['true', 'false'])
    .default('false')
    .transform((v) => v === 'true'),
  MAIL_FROM: z.string().default('Plenum <plenum@plenum.example>'),
  MAIL_CAPTURE: z
    .enum(['true', 'false'])
    .default('true')
    .transform((v) => v === 'true'),
  LOGIN_RATE_LIMIT_PER_15_MIN: z.coerce.number().int().min(1).default(50),
  /** Failed sign-ins per account (normalised e-mail, whether or not it exists) per 15 minutes, from any address. */
  LOGIN_RATE_LIMIT_PER_ACCOUNT_PER_15_MIN: z.coerce.number().int().min(1).default(10),
  /** First temporary lock after the consecutive failed sign-ins, minutes; each further lock doubles it. */
  LOGIN_LOCK_BASE_MINUTES: z.coerce
    .number()
    .positive()
    .max(24 * 60)
    .default(1),
  /** Longest temporary lock, minutes (a lock always ends by itself; an administrator can end it sooner). */
  LOGIN_LOCK_MAX_MINUTES: z.coerce
    .number()
    .positive()
    .max(24 * 60)
    .default(30),
  SERVE_FRONTEND: z
    .enum(['true', 'false'])
    .default('true')
    .transform((v) => v === 'true'),
  LOG_LEVEL: z.enum(['silent', 'error', 'info', 'debug']).default('info'),
  /** Largest CSV upload, MB (a year of 1-minute telemetry is about 20 MB). */
  UPLOAD_MAX_MB: z.coerce.number().positive().max(2048).default(100),
  /** Where uploaded files wait between upload and import (deleted after); default: the system temp folder. */
  UPLOAD_DIR: z.string().default(''),
  /**
   * Where uploads wait for their import: `disk` (UPLOAD_DIR, one process only) or `s3` (an S3-compatible
   * object store every app process reaches; scripts/start, scripts/cluster and the tests run a local one).
   */
  FILE_STORE: z.enum(['disk', 's3']).default('disk'),
  S3_ENDPOINT: z.string().url('S3_ENDPOINT must be a URL such as https://s3.eu-west-2.amazonaws.com').optional(),
  S3_REGION: z.string().default('us-east-1'),
  S3_BUCKET: z
    .string()
    .regex(/^[a-z0-9][a-z0-9.-]{1,61}[a-z0-9]$/, 'S3_BUCKET must be a valid bucket name')
    .default('plenum-uploads'),
  S3_ACCESS_KEY_ID: z.string().optional(),
  S3_SECRET_ACCESS_KEY: z.string().optional(),
  S3_FORCE_PATH_STYLE: z
    .enum(['true', 'false'])
    .default('false')
    .transform((v) => v === 'true'),
  /** Rows per bulk insert of an import. */
  IMPORT_BATCH_ROWS: z.coerce.number().int().min(100).max(100_000).default(5000),
  IMPORT_POLL_MS: z.coerce.number().int().min(50).default(1000),
  /** Local time at each site after which a ward with no report for the day gets a reminder (HH:mm). */
  REPORT_REMINDER_LOCAL_TIME: z
    .string()
    .regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'use HH:mm, e.g. 14:00')
    .default('14:00'),
  REPORT_REMINDER_POLL_MS: z.coerce.number().int().min(1000).default(60_000),
  /** Hours after filing during which a ward lead may still edit a report (then only a facilities manager). */
  REPORT_EDIT_WINDOW_HOURS: z.coerce
    .number()
    .min(0)
    .max(24 * 30)
    .default(24),
  /** How many days back a ward lead may file a missing report. */
  REPORT_BACKFILL_DAYS: z.coerce.number().int().min(0).max(31).default(3),
  /** Background jobs of this process (outbox worker, reorder scan, alerts); tests start them by hand. */
  /**
   * What the app process does to its database before it listens: nothing (production: run the migrations
   * as a release step), run the migrations, or run them and load the demo organisation once (scripts/start;
   * refused in production). Doing it in this process spares two process starts.
   */
  PREPARE_ON_START: z.enum(['none', 'migrate', 'migrate-and-seed']).default('none'),
  JOBS_ENABLED: z
    .enum(['true', 'false'])
    .default('true')
    .transform((v) => v === 'true'),
  OUTBOX_POLL_MS: z.coerce.number().int().min(50).default(5000),
  OUTBOX_BACKOFF_BASE_MS: z.coerce.number().int().min(1).default(30_000),
  OUTBOX_BACKOFF_MAX_MS: z.coerce
    .number()
    .int()
    .min(1)
    .default(15 * 60_000),
  /** Attempts after which a refused message (SMTP 5xx) is marked failed; unreachable servers are retried until they answer. */
  OUTBOX_MAX_ATTEMPTS: z.coerce.number().int().min(1).default(5),
  ORDERS_SCAN_MS: z.coerce
    .number()
    .int()
    .min(1000)
    .default(5 * 60_000),
  ALERTS_POLL_MS: z.coerce
    .number()
    .int()
    .min(1000)
    .default(10 * 60_000),
  PUBLIC_URL: z.string().default('http://127.0.0.1:8080'),
});

export type Env = z.infer<typeof envSchema>;

export function parseEnv(source: Record<string, string | undefined> = process.env): Env {
  const result = envSchema.safeParse(source);
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Configuration is invalid:\n${lines.join('\n')}`);
  }
  const env = result.data;
  if (env.NODE_ENV === 'production' && env.SESSION_SECRET === 'plenum-development-session-secret') {
    throw new Error('Configuration is invalid:\n  SESSION_SECRET: set a secret of your own in production');
  }
  if (env.COOKIE_SECURE && (env.TRUST_PROXY === '' || env.TRUST_PROXY === 'false')) {
    throw new Error(
      "Configuration is invalid:\n  TRUST_PROXY: COOKIE_SECURE needs the TLS proxy's address in TRUST_PROXY (the app sees HTTPS only through it)",
    );
  }
  return env;
}

let cached: Env | undefined;
/** The configuration of this process (parsed on first use). */
export function env(): Env {
  cached ??= parseEnv();
  return cached;
}
/** For tests: replace the configuration. */
export function setEnv(next: Env): void {
  cached = next;
}
