// Builds the test database tier once per run: a migrated PostgreSQL template database that each
// test file clones, and migrated/empty embedded data folders (cached) that each test file copies.
import { createHash } from 'node:crypto';
import { cpSync, existsSync, mkdtempSync, readdirSync, readFileSync, renameSync, rmSync, statSync, utimesSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { Client } from 'pg';
import type { TestProject } from 'vitest/node';
import { EMBEDDED_PGDATA, openDatabase, readMigrations } from '../../src/database';

export interface DatabaseTier {
  readonly migrationsDir: string;
  /** Maintenance-database URL on the PostgreSQL server used for tests. */
  readonly adminUrl: string;
  /** Prefix shared by every database this run creates; teardown drops what is left. */
  readonly runTag: string;
  /** Migrated template database, or null when the server could not be prepared. */
  readonly template: string | null;
  /** Why the PostgreSQL tier is unavailable (tests on that back end fail with it). */
  readonly postgresqlProblem: string | null;
  /** Embedded data folders to copy: freshly initialised, and migrated. */
  readonly embeddedEmpty: string | null;
  readonly embeddedMigrated: string | null;
  readonly embeddedProblem: string | null;
  readonly timingsMs: Readonly<Record<string, number>>;
}

declare module 'vitest' {
  export interface ProvidedContext {
    tracebayDatabase: DatabaseTier;
  }
}

export const TEST_DB_PREFIX = 'tracebay_t_';
/** Per-file data folders in the temp folder; teardown removes this run's leftovers. */
export const TEST_DIR_PREFIX = 'tracebay-test-db-';
export const TEMPLATE_DB_PREFIX = 'tracebay_tpl_';
export const EMBEDDED_CACHE_PREFIX = 'tracebay-pglite-';
const DAY_MS = 86_400_000;

export function adminDatabaseUrl(): string {
  return process.env.TRACEBAY_TEST_DATABASE_URL ?? 'postgresql://postgres@127.0.0.1:5432/postgres';
}

export function databaseUrlFor(adminUrl: string, database: string): string {
  const url = new URL(adminUrl);
  url.pathname = `/${database}`;
  return url.toString();
}

export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  const migrationsDir = resolve(__dirname, '..', '..', 'prisma', 'migrations');
  const adminUrl = adminDatabaseUrl();
  const runTag = `${Math.floor(Date.now() / 1000)}_${process.pid}`;
  const timingsMs: Record<string, number> = {};
  const [pg, embedded] = await Promise.all([
    prepareServerTemplate(adminUrl, migrationsDir, runTag, timingsMs),
    prepareEmbeddedTemplates(migrationsDir, timingsMs),
  ]);
  project.provide('tracebayDatabase', {
    migrationsDir,
    adminUrl,
    runTag,
    template: pg.template,
    postgresqlProblem: pg.problem,
    embeddedEmpty: embedded.empty,
    embeddedMigrated: embedded.migrated,
    embeddedProblem: embedded.problem,
    timingsMs,
  });
  if (process.env.TRACEBAY_TEST_DB_TIMINGS) process.stdout.write(`test database tier: ${JSON.stringify(timingsMs)}\n`);
  return async () => {
    for (const entry of readdirSync(tmpdir())) {
      if (entry.startsWith(`${TEST_DIR_PREFIX}${runTag}-`)) rmSync(join(tmpdir(), entry), { recursive: true, force: true });
    }
    if (pg.template) await dropDatabases(adminUrl, (name) => name === pg.template || name.startsWith(`${TEST_DB_PREFIX}${runTag}_`));
  };
}

async function prepareServerTemplate(
  adminUrl: string,
  migrationsDir: string,
  runTag: string,
  timingsMs: Record<string, number>,
): Promise<{ template: string | null; problem: string | null }> {
  const started = Date.now();
  const template = `${TEMPLATE_DB_PREFIX}${runTag}`;
  try {
    // Leftovers of crashed runs carry their creation time (epoch seconds) right after the prefix.
    const cutoff = (Date.now() - DAY_MS) / 1000;
    await dropDatabases(adminUrl, (name) => {
      const match = /^tracebay_(?:t|tpl)_(\d+)_/.exec(name);
      return match !== null && Number(match[1]) < cutoff;
    });
    await withAdmin(adminUrl, (admin) => admin.query(`CREATE DATABASE "${template}" TEMPLATE template0`));
    const db = await openDatabase({ databaseUrl: databaseUrlFor(adminUrl, template), dataDir: tmpdir(), migrationsDir, poolSize: 1 });
    await db.close();
    timingsMs.postgresqlTemplate = Date.now() - started;
    return { template, problem: null };
  } catch (error) {
    return { template: null, problem: `PostgreSQL test template could not be prepared at ${adminUrl}: ${String(error)}` };
  }
}

/**
 * Embedded data folders are cached across runs in the temp folder: initdb (3–8 s) keyed by the
 * PGlite version, the migrated copy keyed also by every migration's name and checksum. Each is
 * built aside and renamed into place, so a killed run never leaves half a folder.
 */
async function prepareEmbeddedTemplates(
  migrationsDir: string,
  timingsMs: Record<string, number>,
): Promise<{ empty: string | null; migrated: string | null; problem: string | null }> {
  const started = Date.now();
  removeOldEmbeddedCaches();
  try {
    const version = pgliteVersion();
    const migrationsKey = createHash('sha256')
      .update(readMigrations(migrationsDir).map((m) => `${m.name}:${m.checksum}`).join('\n'))
      .digest('hex')
      .slice(0, 16);
    const empty = await cachedFolder(`${EMBEDDED_CACHE_PREFIX}initdb-${version}`, async (dir) => {
      const { PGlite } = await import('@electric-sql/pglite');
      const db = await PGlite.create(join(dir, EMBEDDED_PGDATA));
      await db.close();
    });
    const migrated = await cachedFolder(`${EMBEDDED_CACHE_PREFIX}migrated-${version}-${migrationsKey}`, async (dir) => {
      cpSync(empty, dir, { recursive: true });
      const db = await openDatabase({ dataDir: dir, migrationsDir });
      await db.close();
    });
    timingsMs.embeddedTemplates = Date.now() - started;
    return { empty, migrated, problem: null };
  } catch (error) {
    return { empty: null, migrated: null, problem: `Embedded test template could not be prepared: ${String(error)}` };
  }
}

async function cachedFolder(name: string, build: (dir: string) => Promise<void>): Promise<string> {
  const target = join(tmpdir(), name);
  if (existsSync(join(target, EMBEDDED_PGDATA, 'PG_VERSION'))) {
    const now = new Date();
    utimesSync(target, now, now);
    return target;
  }
  const draft = mkdtempSync(join(tmpdir(), `${EMBEDDED_CACHE_PREFIX}draft-`));
  try {
    await build(draft);
    renameSync(draft, target);
  } catch (error) {
    // Another run finished the same folder first: use theirs.
    if (!existsSync(join(target, EMBEDDED_PGDATA, 'PG_VERSION'))) throw error;
  } finally {
    rmSync(draft, { recursive: true, force: true });
  }
  return target;
}

function pgliteVersion(): string {
  const packageJson = join(dirname(require.resolve('@electric-sql/pglite')), '..', 'package.json');
  return (JSON.parse(readFileSync(packageJson, 'utf8')) as { version: string }).version;
}

function removeOldEmbeddedCaches(): void {
  for (const entry of readdirSync(tmpdir())) {
    if (!entry.startsWith(EMBEDDED_CACHE_PREFIX) && !entry.startsWith(TEST_DIR_PREFIX) && !entry.startsWith('tracebay-test-migrations-')) continue;
    const path = join(tmpdir(), entry);
    try {
      if (Date.now() - statSync(path).mtimeMs > DAY_MS) rmSync(path, { recursive: true, force: true });
    } catch {
      /* removed meanwhile */
    }
  }
}

export async function withAdmin<T>(adminUrl: string, work: (admin: Client) => Promise<T>): Promise<T> {
  const admin = new Client({ connectionString: adminUrl, connectionTimeoutMillis: 5000 });
  await admin.connect();
  try {
    return await work(admin);
  } finally {
    await admin.end();
  }
}

async function dropDatabases(adminUrl: string, select: (name: string) => boolean): Promise<void> {
  await withAdmin(adminUrl, async (admin) => {
    const { rows } = await admin.query<{ datname: string }>(
      "SELECT datname FROM pg_database WHERE datname LIKE 'tracebay\\_%'",
    );
    for (const { datname } of rows.filter((r) => select(r.datname))) {
      await admin.query(`DROP DATABASE IF EXISTS "${datname}" WITH (FORCE)`);
    }
  });
}
