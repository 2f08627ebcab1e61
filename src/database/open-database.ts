// One entry point for both back ends: a PostgreSQL server when a URL is given, otherwise an
// embedded PostgreSQL (PGlite) persisted in the data folder. Same schema, same migrations.
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import type { PGlite } from '@electric-sql/pglite';
import { PrismaPg } from '@prisma/adapter-pg';
import { PrismaClient } from '../generated/prisma/client';
import type { RawSql } from '../common/database/database.tokens';
import { lockDataDir } from './data-dir-lock';
import { DatabaseError, describeDriverError } from './errors';
import { PgliteMigrationRunner, PgMigrationRunner, type DatabaseKind, type MigrationRunner } from './migration-runner';
import {
  applyMigrations,
  readMigrationState,
  silentLogger,
  type DatabaseLogger,
  type MigrationReport,
  type MigrationState,
} from './migrator';
import { connect, createPool, parseDatabaseUrl } from './pg-connection';

export interface OpenDatabaseOptions {
  /** PostgreSQL server URL; when unset, the embedded database in `dataDir` is used. */
  databaseUrl?: string;
  /** Folder of the embedded database (created if missing); unused with `databaseUrl`. */
  dataDir: string;
  migrationsDir: string;
  /** Apply pending migrations while opening (default true). */
  applyMigrations?: boolean;
  logger?: DatabaseLogger;
  /** PostgreSQL pool size (default 10). */
  poolSize?: number;
  /** PostgreSQL connect timeout (default 5000 ms). */
  connectTimeoutMs?: number;
  /** Wait this long for another migrator's advisory lock (default 10 000 ms). */
  migrationLockTimeoutMs?: number;
}

export interface Database {
  readonly prisma: PrismaClient;
  /** One parameterised statement through the driver, without Prisma (see RawSql). */
  readonly sql: RawSql;
  readonly kind: DatabaseKind;
  /** What opening applied; null when opened with `applyMigrations: false`. */
  readonly migrationReport: MigrationReport | null;
  migrationState(): Promise<MigrationState>;
  /** Disconnects Prisma, then the pool or PGlite, then frees the data folder. Idempotent. */
  close(): Promise<void>;
}

/** The embedded PostgreSQL files live in this sub-folder; the lock file sits beside it. */
export const EMBEDDED_PGDATA = 'pglite';

export async function openDatabase(options: OpenDatabaseOptions): Promise<Database> {
  return options.databaseUrl ? openServer(options, options.databaseUrl) : openEmbedded(options);
}

async function openServer(options: OpenDatabaseOptions, databaseUrl: string): Promise<Database> {
  const logger = options.logger ?? silentLogger;
  const target = parseDatabaseUrl(databaseUrl);
  const pool = createPool(target, { databaseUrl, poolSize: options.poolSize, connectTimeoutMs: options.connectTimeoutMs, logger });
  let report: MigrationReport | null = null;
  try {
    const client = await connect(pool, target);
    let broken = false;
    try {
      if (target.schema) await client.query(`CREATE SCHEMA IF NOT EXISTS "${target.schema}"`);
      if (options.applyMigrations !== false) {
        const runner = new PgMigrationRunner(client, { lockTimeoutMs: options.migrationLockTimeoutMs });
        report = await applyMigrations(runner, options.migrationsDir, logger);
      }
    } catch (error) {
      broken = !(error instanceof DatabaseError);
      throw error;
    } finally {
      client.release(broken);
    }
  } catch (error) {
    await pool.end().catch(() => {});
    throw error;
  }
  const prisma = new PrismaClient({ adapter: new PrismaPg(pool, target.schema ? { schema: target.schema } : undefined) });
  const sql: RawSql = async <T>(text: string, params: readonly unknown[]) => (await pool.query(text, params as unknown[])).rows as T[];
  return handle('postgresql', prisma, sql, report, {
    state: async () => {
      const client = await connect(pool, target);
      try {
        return await readMigrationState(new PgMigrationRunner(client), options.migrationsDir);
      } finally {
        client.release();
      }
    },
    close: () => pool.end(),
  });
}

async function openEmbedded(options: OpenDatabaseOptions): Promise<Database> {
  const logger = options.logger ?? silentLogger;
  const { dataDir } = options;
  try {
    mkdirSync(dataDir, { recursive: true });
  } catch (error) {
    throw new DatabaseError(
      'DATA_DIR_UNUSABLE',
      `Cannot create the data folder ${dataDir}: ${describeDriverError(error)}`,
      { dataDir },
      { cause: error },
    );
  }
  const lock = lockDataDir(dataDir);
  let db: PGlite | undefined;
  try {
    // Loaded here so that server deployments never load the WASM build.
    const { PGlite } = await import('@electric-sql/pglite');
    const pgdata = join(dataDir, EMBEDDED_PGDATA);
    try {
      db = await PGlite.create(pgdata);
    } catch (error) {
      throw new DatabaseError(
        'DATA_DIR_UNUSABLE',
        `Cannot open the embedded database in ${pgdata}: ${describeDriverError(error)}`,
        { dataDir, pgdata },
        { cause: error },
      );
    }
    const runner: MigrationRunner = new PgliteMigrationRunner(db);
    const report = options.applyMigrations === false ? null : await applyMigrations(runner, options.migrationsDir, logger);
    const { PrismaPGlite } = await import('pglite-prisma-adapter');
    const prisma = new PrismaClient({ adapter: new PrismaPGlite(db) });
    const opened = db;
    const sql: RawSql = async <T>(text: string, params: readonly unknown[]) => (await opened.query<T>(text, params as unknown[])).rows;
    return handle('embedded', prisma, sql, report, {
      state: () => readMigrationState(runner, options.migrationsDir),
      close: async () => {
        try {
          await opened.close();
        } finally {
          lock.release();
        }
      },
    });
  } catch (error) {
    await db?.close().catch(() => {});
    lock.release();
    throw error;
  }
}

function handle(
  kind: DatabaseKind,
  prisma: PrismaClient,
  sql: RawSql,
  migrationReport: MigrationReport | null,
  ops: { state(): Promise<MigrationState>; close(): Promise<void> },
): Database {
  let closing: Promise<void> | undefined;
  return {
    prisma,
    sql,
    kind,
    migrationReport,
    migrationState: () => ops.state(),
    close: () => {
      closing ??= (async () => {
        try {
          await prisma.$disconnect();
        } finally {
          await ops.close();
        }
      })();
      return closing;
    },
  };
}
