/**
 * Configuration, parsed once at start-up from the environment into a typed object. Nothing else in
 * Tracebay reads `process.env`: modules receive `AppConfig` through injection.
 */
import { resolve } from 'node:path';
import { z } from 'zod';

const boolean = z
  .enum(['1', '0', 'true', 'false', 'yes', 'no'])
  .transform((v) => v === '1' || v === 'true' || v === 'yes');

const EnvSchema = z.object({
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  HOST: z.string().min(1).default('127.0.0.1'),
  DATABASE_URL: z
    .string()
    .regex(/^postgres(ql)?:\/\//, 'a postgresql:// connection URL')
    .optional()
    .or(z.literal('').transform(() => undefined)),
  TRACEBAY_DATA_DIR: z.string().min(1).default('./data'),
  TRACEBAY_DEMO: boolean.default(true),
  TRACEBAY_BODY_LIMIT: z.string().regex(/^\d+(kb|mb)$/, 'a size such as 512kb or 1mb').default('1mb'),
  TRACEBAY_CONCLUDE_AT: z.coerce.number().gt(0.5).lt(1).default(0.95),
  TRACEBAY_SECURE_COOKIES: boolean.default(false),
  TRACEBAY_TRUST_PROXY: boolean.default(false),
  TRACEBAY_SESSION_HOURS: z.coerce.number().gt(0).max(720).default(12),
  TRACEBAY_TOKEN_DAYS: z.coerce.number().gt(0).max(365).default(30),
  /** Writes (POST/PATCH) one user may send per window; 0 turns the limit off. */
  TRACEBAY_WRITE_LIMIT: z.coerce.number().int().min(0).default(6000),
  TRACEBAY_WRITE_WINDOW_SECONDS: z.coerce.number().int().min(1).max(86_400).default(60),
  /** Sign-in attempts per client address and per email address per window; 0 turns the limit off. */
  TRACEBAY_SIGN_IN_LIMIT_IP: z.coerce.number().int().min(0).default(100),
  TRACEBAY_SIGN_IN_LIMIT_EMAIL: z.coerce.number().int().min(0).default(20),
  TRACEBAY_SIGN_IN_WINDOW_SECONDS: z.coerce.number().int().min(1).max(86_400).default(900),
  /** How long a stored idempotent response is kept, and how long a duplicate waits for the first to finish. */
  TRACEBAY_IDEMPOTENCY_HOURS: z.coerce.number().gt(0).max(720).default(24),
  TRACEBAY_IDEMPOTENCY_WAIT_MS: z.coerce.number().int().min(0).max(60_000).default(5000),
  /** Compiled shop fault trees kept in memory: at most this many, and about this many megabytes. */
  TRACEBAY_TREE_CACHE_TREES: z.coerce.number().int().min(1).max(10_000).default(64),
  TRACEBAY_TREE_CACHE_MB: z.coerce.number().gt(0).max(4096).default(64),
  LOG_LEVEL: z.enum(['error', 'warn', 'log', 'debug', 'verbose']).default('log'),
});

export interface AppConfig {
  readonly port: number;
  readonly host: string;
  /** PostgreSQL server; when absent the embedded database in `dataDir` is used. */
  readonly databaseUrl: string | undefined;
  readonly dataDir: string;
  readonly migrationsDir: string;
  /** Seed the invented demo shop into an empty database. */
  readonly demo: boolean;
  readonly bodyLimit: string;
  /** Posterior probability at which a diagnosis concludes. */
  readonly concludeAt: number;
  /** Mark cookies Secure even when the request reached us over plain HTTP (TLS ends at a reverse proxy). */
  readonly secureCookies: boolean;
  /** Believe X-Forwarded-Proto/-For from one proxy hop in front (so `req.secure` reflects the browser's https). */
  readonly trustProxy: boolean;
  /** Lifetime of a page session (signed in on the tablet), in hours. */
  readonly sessionHours: number;
  /** Lifetime of an API bearer token, in days. */
  readonly tokenDays: number;
  /** Shared-across-instances request budgets (0 = no limit) and their fixed windows, in seconds. */
  readonly rateLimits: {
    readonly writesPerUser: number;
    readonly writeWindowSeconds: number;
    readonly signInsPerIp: number;
    readonly signInsPerEmail: number;
    readonly signInWindowSeconds: number;
  };
  readonly idempotency: { readonly keepHours: number; readonly waitMs: number };
  /** Bounds of the compiled fault-tree cache. */
  readonly treeCache: { readonly maxTrees: number; readonly maxBytes: number };
  readonly logLevel: 'error' | 'warn' | 'log' | 'debug' | 'verbose';
}

export const APP_CONFIG = Symbol('APP_CONFIG');

export class ConfigError extends Error {
  constructor(readonly problems: string[]) {
    super(`Configuration is not valid:\n${problems.map((p) => `  - ${p}`).join('\n')}`);
    this.name = 'ConfigError';
  }
}

/** Parses the environment; throws a `ConfigError` listing every bad variable with what was expected. */
export function loadConfig(env: Record<string, string | undefined>, projectRoot = resolve(__dirname, '..', '..')): AppConfig {
  const parsed = EnvSchema.safeParse(env);
  if (!parsed.success) {
    throw new ConfigError(parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`));
  }
  const e = parsed.data;
  return Object.freeze({
    port: e.PORT,
    host: e.HOST,
    databaseUrl: e.DATABASE_URL,
    dataDir: resolve(e.TRACEBAY_DATA_DIR),
    migrationsDir: resolve(projectRoot, 'prisma', 'migrations'),
    demo: e.TRACEBAY_DEMO,
    bodyLimit: e.TRACEBAY_BODY_LIMIT,
    concludeAt: e.TRACEBAY_CONCLUDE_AT,
    secureCookies: e.TRACEBAY_SECURE_COOKIES,
    trustProxy: e.TRACEBAY_TRUST_PROXY,
    sessionHours: e.TRACEBAY_SESSION_HOURS,
    tokenDays: e.TRACEBAY_TOKEN_DAYS,
    rateLimits: Object.freeze({
      writesPerUser: e.TRACEBAY_WRITE_LIMIT,
      writeWindowSeconds: e.TRACEBAY_WRITE_WINDOW_SECONDS,
      signInsPerIp: e.TRACEBAY_SIGN_IN_LIMIT_IP,
      signInsPerEmail: e.TRACEBAY_SIGN_IN_LIMIT_EMAIL,
      signInWindowSeconds: e.TRACEBAY_SIGN_IN_WINDOW_SECONDS,
    }),
    idempotency: Object.freeze({ keepHours: e.TRACEBAY_IDEMPOTENCY_HOURS, waitMs: e.TRACEBAY_IDEMPOTENCY_WAIT_MS }),
    treeCache: Object.freeze({ maxTrees: e.TRACEBAY_TREE_CACHE_TREES, maxBytes: Math.round(e.TRACEBAY_TREE_CACHE_MB * 1024 * 1024) }),
    logLevel: e.LOG_LEVEL,
  });
}
