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
    logLevel: e.LOG_LEVEL,
  });
}
