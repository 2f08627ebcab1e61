// Test databases: each test file gets its own, cloned from the run's migrated template
// (PostgreSQL: CREATE DATABASE ... TEMPLATE; embedded: a copy of the migrated data folder).
import { randomBytes } from 'node:crypto';
import { cpSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, inject } from 'vitest';
import { openDatabase, type Database, type DatabaseKind, type OpenDatabaseOptions } from '../../src/database';
import { databaseUrlFor, TEST_DB_PREFIX, TEST_DIR_PREFIX, withAdmin, type DatabaseTier } from './global-setup';

export type Backend = DatabaseKind;

/** Both back ends, unless TRACEBAY_TEST_BACKENDS narrows them (e.g. "embedded" on a machine without a server). */
export const BACKENDS: readonly Backend[] = selectBackends(process.env.TRACEBAY_TEST_BACKENDS);

export interface TestDatabase extends Database {
  /** PostgreSQL connection URL of this file's database (postgresql back end). */
  readonly url?: string;
  /** Data folder of this file's database (embedded back end). */
  readonly dataDir?: string;
}

/** A database location with nothing opened yet: for tests of opening and migrating themselves. */
export interface ScratchDatabase {
  readonly kind: Backend;
  readonly url?: string;
  readonly dataDir: string;
  /** openDatabase on this location; `migrationsDir` defaults to the project's. */
  open(options?: Partial<Omit<OpenDatabaseOptions, 'databaseUrl' | 'dataDir'>>): Promise<Database>;
  /** Closes whatever `open` returned and drops the database or deletes the folder. */
  drop(): Promise<void>;
}

/** A fresh, fully migrated database for one test file. Close it in afterAll. */
export async function testDatabase(backend: Backend): Promise<TestDatabase> {
  const scratch = await scratchDatabase(backend, 'migrated');
  const db = await scratch.open();
  return {
    prisma: db.prisma,
    sql: db.sql,
    kind: db.kind,
    migrationReport: db.migrationReport,
    migrationState: () => db.migrationState(),
    close: () => scratch.drop(),
    ...(backend === 'postgresql' ? { url: scratch.url } : { dataDir: scratch.dataDir }),
  };
}

/**
 * A database location: `migrated` is a copy of the run's template, `empty` has no tables and
 * no migration history (PostgreSQL: cloned from template0).
 */
export async function scratchDatabase(backend: Backend, contents: 'migrated' | 'empty'): Promise<ScratchDatabase> {
  const tier = inject('tracebayDatabase');
  const dataDir = mkdtempSync(join(tmpdir(), `${TEST_DIR_PREFIX}${tier.runTag}-`));
  let location: { url?: string; dispose(): Promise<void> };
  try {
    location = backend === 'postgresql' ? await cloneServerDatabase(tier, contents) : copyEmbedded(tier, contents, dataDir);
  } catch (error) {
    rmSync(dataDir, { recursive: true, force: true });
    throw error;
  }
  const opened: Database[] = [];
  return {
    kind: backend,
    url: location.url,
    dataDir,
    async open(options = {}) {
      const db = await openDatabase({ migrationsDir: tier.migrationsDir, ...options, databaseUrl: location.url, dataDir, poolSize: options.poolSize ?? 4 });
      opened.push(db);
      return db;
    },
    async drop() {
      await Promise.allSettled(opened.map((db) => db.close()));
      await location.dispose();
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

/** Runs `body` once per back end, each with its own database opened in beforeAll and closed in afterAll. */
export function describeEachBackend(title: string, body: (db: () => TestDatabase, backend: Backend) => void): void {
  describe.each(BACKENDS.map((backend) => [backend]))(`${title} (%s)`, (backend) => {
    let db: TestDatabase | undefined;
    beforeAll(async () => {
      db = await testDatabase(backend);
    });
    afterAll(async () => {
      await db?.close();
    });
    body(() => {
      if (!db) throw new Error(`The ${backend} test database is not open (did beforeAll fail?)`);
      return db;
    }, backend);
  });
}

async function cloneServerDatabase(
  tier: DatabaseTier,
  contents: 'migrated' | 'empty',
): Promise<{ url: string; dispose(): Promise<void> }> {
  if (!tier.template) throw new Error(tier.postgresqlProblem ?? 'The PostgreSQL test tier is not prepared.');
  const name = `${TEST_DB_PREFIX}${tier.runTag}_${randomBytes(5).toString('hex')}`;
  const source = contents === 'migrated' ? tier.template : 'template0';
  await withAdmin(tier.adminUrl, (admin) => admin.query(`CREATE DATABASE "${name}" TEMPLATE "${source}"`));
  return {
    url: databaseUrlFor(tier.adminUrl, name),
    dispose: async () => {
      await withAdmin(tier.adminUrl, (admin) => admin.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`));
    },
  };
}

function copyEmbedded(tier: DatabaseTier, contents: 'migrated' | 'empty', dataDir: string): { dispose(): Promise<void> } {
  const source = contents === 'migrated' ? tier.embeddedMigrated : tier.embeddedEmpty;
  if (!source) throw new Error(tier.embeddedProblem ?? 'The embedded test tier is not prepared.');
  cpSync(source, dataDir, { recursive: true });
  return { dispose: async () => {} };
}

function selectBackends(value: string | undefined): readonly Backend[] {
  if (!value) return ['postgresql', 'embedded'];
  const chosen = value.split(',').map((v) => v.trim());
  const bad = chosen.filter((v) => v !== 'postgresql' && v !== 'embedded');
  if (bad.length > 0) {
    throw new Error(`TRACEBAY_TEST_BACKENDS has ${bad.join(', ')}; expected a comma list of postgresql, embedded.`);
  }
  return chosen as Backend[];
}
