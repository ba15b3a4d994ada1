import path from 'node:path';
import { z } from 'zod';

// The only place that reads process.env. Everything else receives a typed AppConfig.
const bool = z
  .enum(['true', 'false', '1', '0', 'yes', 'no'])
  .transform((v) => v === 'true' || v === '1' || v === 'yes');

const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  /** Tests only (NODE_ENV=test): the named crash point (server/lib/crash-point.ts) where the server waits to be killed. */
  TEST_CRASH_POINT: z
    .string()
    .regex(/^[a-z0-9_.]+$/)
    .optional(),
  APP_MODE: z.enum(['demo', 'production']).optional(),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  /** Serving processes (node:cluster); 1 serves from the starting process itself. */
  WEB_CONCURRENCY: z.coerce.number().int().min(1).max(64).default(1),
  PUBLIC_URL: z.url().optional(),
  DATABASE_URL: z.string().optional(),
  /** Read replicas of DATABASE_URL, comma-separated mysql:// URLs (server/db/data-source.ts). */
  DATABASE_REPLICA_URLS: z
    .string()
    .optional()
    .transform((v) =>
      (v ?? '')
        .split(',')
        .map((u) => u.trim())
        .filter(Boolean),
    )
    .pipe(z.array(z.string().regex(/^(mysql|mariadb):\/\//, 'each replica URL starts with mysql://'))),
  /** A client that wrote in the last this many seconds reads from the primary (server/db/read-routing.ts). */
  READ_YOUR_WRITES_SECONDS: z.coerce.number().int().min(0).max(3600).default(10),
  DB_PORT: z.coerce.number().int().min(1).max(65535).default(3307),
  SESSION_SECRET: z.string().min(32).optional(),
  TRUST_PROXY: bool.default(false),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  SMTP_SECURE: bool.default(false),
  MAIL_FROM: z.string().default('Lumenproof <no-reply@lumenproof.test>'),
  MAILBOX_DIR: z.string().optional(),
  DATA_DIR: z.string().default('.data'),
  STORAGE_DRIVER: z.enum(['disk', 's3']).default('disk'),
  STORAGE_DIR: z.string().optional(),
  S3_ENDPOINT: z.string().optional(),
  S3_REGION: z.string().default('us-east-1'),
  S3_BUCKET: z.string().optional(),
  S3_ACCESS_KEY_ID: z.string().optional(),
  S3_SECRET_ACCESS_KEY: z.string().optional(),
  /** Unreferenced stored objects younger than this are kept (uploads in flight); server/lib/storage-sweep.ts. */
  STORAGE_SWEEP_GRACE_MINUTES: z.coerce
    .number()
    .int()
    .min(5)
    .max(7 * 24 * 60)
    .default(60),
  /** How often the server sweeps after the sweep at start-up; 0 sweeps only at start-up. */
  STORAGE_SWEEP_INTERVAL_MINUTES: z.coerce
    .number()
    .int()
    .min(0)
    .max(7 * 24 * 60)
    .default(60),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  /** A database statement slower than this many milliseconds is logged as a warning; 0 logs none. */
  SLOW_QUERY_MS: z.coerce.number().int().min(0).max(600_000).default(500),
  OUTBOX_WORKER: bool.default(true),
  /**
   * Accountants and administrators of manufacturers must have a second factor. On by default in production mode,
   * off in demo mode (the demo accounts sign in with the password alone unless they enrol).
   */
  SECOND_FACTOR_FOR_ROLES: bool.optional(),
  /** Run the webhook delivery worker in the server process (default: yes, except under NODE_ENV=test). */
  WEBHOOK_WORKER: bool.optional(),
  /** Requests one API token may make per minute (server/modules/api-tokens). */
  API_TOKEN_RATE_PER_MINUTE: z.coerce.number().int().min(1).max(100_000).default(600),
});

export type AppConfig = {
  env: 'development' | 'test' | 'production';
  /** null unless NODE_ENV=test arms a crash point. */
  testCrashPoint: string | null;
  mode: 'demo' | 'production';
  host: string;
  port: number;
  workers: number;
  publicUrl: string | undefined;
  databaseUrl: string | undefined;
  /** Read replicas of databaseUrl; empty: every read goes to the primary. */
  databaseReplicaUrls: string[];
  /** Seconds after its own write during which a client's reads go to the primary. */
  readYourWritesSeconds: number;
  dbPort: number;
  sessionSecret: string;
  trustProxy: boolean;
  smtp: { host: string; port: number; user?: string; password?: string; secure: boolean; from: string };
  mailboxDir: string;
  dataDir: string;
  storage: {
    driver: 'disk' | 's3';
    dir: string;
    s3: {
      endpoint?: string;
      region: string;
      bucket?: string;
      accessKeyId?: string;
      secretAccessKey?: string;
    };
    sweep: { graceMs: number; intervalMs: number };
  };
  logLevel: string;
  slowQueryMs: number;
  outboxWorker: boolean;
  /** Accountants and administrators of manufacturers must have a second factor (SECOND_FACTOR_FOR_ROLES). */
  secondFactorForRoles: boolean;
  apiTokenRatePerMinute: number;
  webhookWorker: boolean;
};

export class ConfigError extends Error {}

export function loadConfig(source: NodeJS.ProcessEnv = process.env): AppConfig {
  const parsed = envSchema.safeParse(source);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new ConfigError(`Invalid environment:\n${lines.join('\n')}`);
  }
  const e = parsed.data;
  const mode = e.APP_MODE ?? (e.NODE_ENV === 'production' ? 'production' : 'demo');
  if (e.NODE_ENV === 'production' && !e.SESSION_SECRET) {
    throw new ConfigError('SESSION_SECRET (32 characters or more) is required in production.');
  }
  if (e.STORAGE_DRIVER === 's3' && !e.S3_BUCKET) {
    throw new ConfigError('S3_BUCKET is required when STORAGE_DRIVER=s3.');
  }
  const dataDir = path.resolve(e.DATA_DIR);
  return {
    env: e.NODE_ENV,
    testCrashPoint: e.NODE_ENV === 'test' ? (e.TEST_CRASH_POINT ?? null) : null,
    mode,
    host: e.HOST,
    port: e.PORT,
    workers: e.WEB_CONCURRENCY,
    publicUrl: e.PUBLIC_URL,
    databaseUrl: e.DATABASE_URL,
    databaseReplicaUrls: e.DATABASE_REPLICA_URLS,
    readYourWritesSeconds: e.READ_YOUR_WRITES_SECONDS,
    dbPort: e.DB_PORT,
    // Outside production a fixed development secret keeps sessions across restarts of the demo.
    sessionSecret: e.SESSION_SECRET ?? 'lumenproof-development-secret-not-for-production',
    trustProxy: e.TRUST_PROXY,
    smtp: {
      host: e.SMTP_HOST,
      port: e.SMTP_PORT,
      user: e.SMTP_USER,
      password: e.SMTP_PASSWORD,
      secure: e.SMTP_SECURE,
      from: e.MAIL_FROM,
    },
    mailboxDir: path.resolve(e.MAILBOX_DIR ?? path.join(dataDir, 'mailbox')),
    dataDir,
    storage: {
      driver: e.STORAGE_DRIVER,
      dir: path.resolve(e.STORAGE_DIR ?? path.join(dataDir, 'uploads')),
      s3: {
        endpoint: e.S3_ENDPOINT,
        region: e.S3_REGION,
        bucket: e.S3_BUCKET,
        accessKeyId: e.S3_ACCESS_KEY_ID,
        secretAccessKey: e.S3_SECRET_ACCESS_KEY,
      },
      sweep: {
        graceMs: e.STORAGE_SWEEP_GRACE_MINUTES * 60_000,
        intervalMs: e.STORAGE_SWEEP_INTERVAL_MINUTES * 60_000,
      },
    },
    logLevel: e.LOG_LEVEL,
    slowQueryMs: e.SLOW_QUERY_MS,
    outboxWorker: e.OUTBOX_WORKER,
    secondFactorForRoles: e.SECOND_FACTOR_FOR_ROLES ?? mode === 'production',
    apiTokenRatePerMinute: e.API_TOKEN_RATE_PER_MINUTE,
    // Test servers never send webhooks unless asked: the tests drive deliveries themselves.
    webhookWorker: e.WEBHOOK_WORKER ?? e.NODE_ENV !== 'test',
  };
}
