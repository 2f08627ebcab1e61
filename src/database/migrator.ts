// Applies prisma/migrations compatibly with Prisma's `_prisma_migrations` history, on any
// MigrationRunner. Rows written here are read correctly by Prisma's own engine and vice versa.
import { randomUUID } from 'node:crypto';
import { DatabaseError, describeDriverError } from './errors';
import { checksumMatches, readMigrations, type MigrationFile } from './migration-files';
import type { MigrationRunner } from './migration-runner';

export interface DatabaseLogger {
  log(message: string): void;
  warn(message: string): void;
}

export const silentLogger: DatabaseLogger = { log: () => {}, warn: () => {} };

export interface MigrationState {
  /** Applied and not rolled back, in history order. */
  readonly applied: string[];
  /** Local folders without a live history row, in apply order. */
  readonly pending: string[];
  /** Rows that started but neither finished nor were rolled back. */
  readonly failed: string[];
}

export interface MigrationReport {
  /** Migrations applied by this call, in order. */
  readonly applied: string[];
  /** Migrations that were already applied before this call. */
  readonly alreadyApplied: string[];
}

type HistoryRow = {
  id: string;
  migration_name: string;
  checksum: string;
  finished_at: Date | null;
  rolled_back_at: Date | null;
  logs: string | null;
};

/** Prisma's own DDL for the history table, created unqualified in the connection's schema. */
const CREATE_HISTORY_TABLE = `CREATE TABLE "_prisma_migrations" (
    "id" VARCHAR(36) PRIMARY KEY NOT NULL,
    "checksum" VARCHAR(64) NOT NULL,
    "finished_at" TIMESTAMPTZ,
    "migration_name" VARCHAR(255) NOT NULL,
    "logs" TEXT,
    "rolled_back_at" TIMESTAMPTZ,
    "started_at" TIMESTAMPTZ NOT NULL DEFAULT now(),
    "applied_steps_count" INTEGER NOT NULL DEFAULT 0
)`;

export async function applyMigrations(
  runner: MigrationRunner,
  migrationsDir: string,
  logger: DatabaseLogger = silentLogger,
): Promise<MigrationReport> {
  const local = readMigrations(migrationsDir);
  const release = await runner.lock();
  try {
    if (!(await historyTableExists(runner))) {
      await refuseUnlessEmpty(runner);
      await runner.query(CREATE_HISTORY_TABLE);
    }
    const rows = await readHistory(runner);
    refuseFailedRows(rows);
    const applied = liveAppliedRows(rows);
    refuseEditedMigrations(local, applied);
    for (const name of applied.keys()) {
      if (!local.some((m) => m.name === name)) {
        logger.warn(`Migration ${name} is recorded as applied but has no folder in ${migrationsDir}.`);
      }
    }
    const pending = local.filter((m) => !applied.has(m.name));
    for (const migration of pending) await applyOne(runner, migration, logger);
    if (pending.length === 0) logger.log('Database schema is up to date; no pending migrations.');
    return {
      applied: pending.map((m) => m.name),
      alreadyApplied: local.filter((m) => applied.has(m.name)).map((m) => m.name),
    };
  } finally {
    await release();
  }
}

export async function readMigrationState(runner: MigrationRunner, migrationsDir: string): Promise<MigrationState> {
  const local = readMigrations(migrationsDir);
  const rows = (await historyTableExists(runner)) ? await readHistory(runner) : [];
  const applied = liveAppliedRows(rows);
  return {
    applied: [...applied.keys()],
    pending: local.filter((m) => !applied.has(m.name)).map((m) => m.name),
    failed: rows.filter(isFailed).map((r) => r.migration_name),
  };
}

async function applyOne(runner: MigrationRunner, migration: MigrationFile, logger: DatabaseLogger): Promise<void> {
  const id = randomUUID();
  const started = Date.now();
  await runner.query(
    `INSERT INTO "_prisma_migrations" (id, checksum, migration_name, started_at, applied_steps_count)
     VALUES ($1, $2, $3, now(), 0)`,
    [id, migration.checksum, migration.name],
  );
  try {
    await runner.runScript(migration.script);
  } catch (error) {
    const logs = failureLog(migration, error);
    await runner.query('UPDATE "_prisma_migrations" SET logs = $2 WHERE id = $1', [id, logs]);
    throw new DatabaseError(
      'MIGRATION_FAILED',
      `${logs}\nNothing of this migration was kept (it ran as one transaction). Fix ${migration.scriptPath}, ` +
        'then mark the failed row as rolled back (set rolled_back_at) before migrating again.',
      { migration: migration.name, rowId: id, scriptPath: migration.scriptPath },
      { cause: error },
    );
  }
  await runner.query(
    `UPDATE "_prisma_migrations"
     SET applied_steps_count = applied_steps_count + 1, finished_at = now() WHERE id = $1`,
    [id],
  );
  logger.log(`Applied migration ${migration.name} (${Date.now() - started} ms).`);
}

function failureLog(migration: MigrationFile, error: unknown): string {
  const e = error as { code?: unknown; position?: unknown; detail?: unknown; hint?: unknown };
  const lines = [`Migration ${migration.name} failed to apply.`];
  if (typeof e.code === 'string') lines.push(`Database error code: ${e.code}`);
  lines.push(`Database error: ${error instanceof Error ? error.message : String(error)}`);
  const position = Number(e.position);
  if (Number.isInteger(position) && position > 0) {
    const line = migration.script.slice(0, position - 1).split('\n').length;
    lines.push(`Position: line ${line} of ${migration.scriptPath}`);
  }
  if (typeof e.detail === 'string' && e.detail) lines.push(`Detail: ${e.detail}`);
  if (typeof e.hint === 'string' && e.hint) lines.push(`Hint: ${e.hint}`);
  return lines.join('\n');
}

async function historyTableExists(runner: MigrationRunner): Promise<boolean> {
  const [row] = await runner.query<{ present: boolean }>(
    `SELECT EXISTS (SELECT 1 FROM pg_tables
       WHERE schemaname = current_schema() AND tablename = '_prisma_migrations') AS present`,
  );
  return row?.present === true;
}

async function refuseUnlessEmpty(runner: MigrationRunner): Promise<void> {
  const objects = await runner.query<{ name: string }>(
    `SELECT c.relname AS name FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
       WHERE n.nspname = current_schema() AND c.relkind IN ('r', 'p', 'v', 'm', 'f', 'S')
     UNION ALL
     SELECT t.typname AS name FROM pg_type t JOIN pg_namespace n ON n.oid = t.typnamespace
       WHERE n.nspname = current_schema() AND t.typtype IN ('e', 'd')
     ORDER BY name LIMIT 6`,
  );
  if (objects.length === 0) return;
  const names = objects.slice(0, 5).map((o) => o.name);
  throw new DatabaseError(
    'DATABASE_NOT_EMPTY',
    `The database schema is not empty (${names.join(', ')}${objects.length > 5 ? ', ...' : ''}) but has no ` +
      '_prisma_migrations history, so it was not created by these migrations (like Prisma P3005). ' +
      'Use an empty database, or baseline it by recording the migrations it already contains.',
    { objects: names },
  );
}

async function readHistory(runner: MigrationRunner): Promise<HistoryRow[]> {
  return runner.query<HistoryRow>(
    `SELECT id, migration_name, checksum, finished_at, rolled_back_at, logs
     FROM "_prisma_migrations" ORDER BY started_at, migration_name`,
  );
}

function isFailed(row: HistoryRow): boolean {
  return row.finished_at === null && row.rolled_back_at === null;
}

function refuseFailedRows(rows: HistoryRow[]): void {
  const failed = rows.filter(isFailed);
  if (failed.length === 0) return;
  const [first] = failed;
  throw new DatabaseError(
    'MIGRATION_FAILED_EARLIER',
    `Migration ${first!.migration_name} failed earlier and was never resolved, so no migration will run ` +
      '(like Prisma P3009). Repair the database by hand, then set rolled_back_at on its _prisma_migrations ' +
      `row (id ${first!.id}) to run it again.` +
      (first!.logs ? `\nIts logs:\n${first!.logs}` : ''),
    { migrations: failed.map((r) => r.migration_name), rowIds: failed.map((r) => r.id) },
  );
}

function liveAppliedRows(rows: HistoryRow[]): Map<string, HistoryRow> {
  const applied = new Map<string, HistoryRow>();
  for (const row of rows) {
    if (row.finished_at !== null && row.rolled_back_at === null) applied.set(row.migration_name, row);
  }
  return applied;
}

function refuseEditedMigrations(local: MigrationFile[], applied: Map<string, HistoryRow>): void {
  for (const migration of local) {
    const row = applied.get(migration.name);
    if (!row || checksumMatches(migration.script, row.checksum)) continue;
    throw new DatabaseError(
      'MIGRATION_EDITED',
      `Migration ${migration.name} was changed after it was applied: the database recorded checksum ` +
        `${row.checksum}, but ${migration.scriptPath} now has checksum ${migration.checksum}. ` +
        'Restore the applied file and put the change in a new migration.',
      { migration: migration.name, recordedChecksum: row.checksum, fileChecksum: migration.checksum },
    );
  }
}
