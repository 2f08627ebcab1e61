// The few operations the migrator needs, written once for each back end so the algorithm
// in migrator.ts never asks which database it talks to.
import type { PGliteInterface } from '@electric-sql/pglite';
import type { ClientBase } from 'pg';
import { DatabaseError } from './errors';

export type DatabaseKind = 'postgresql' | 'embedded';

export type Row = Record<string, unknown>;

export interface MigrationRunner {
  readonly kind: DatabaseKind;
  /** One parameterised statement. */
  query<R extends Row = Row>(sql: string, params?: readonly unknown[]): Promise<R[]>;
  /** A whole migration script as one simple-protocol query: one implicit transaction. */
  runScript(script: string): Promise<void>;
  /** Serialises migrators on one database; resolves to the release function. */
  lock(): Promise<() => Promise<void>>;
}

/** The key Prisma's engine uses for `pg_advisory_lock` while migrating. */
export const MIGRATION_ADVISORY_LOCK = 72707369;

export interface PgRunnerOptions {
  /** How long to wait for another migrator's advisory lock (default 10 s, as Prisma). */
  lockTimeoutMs?: number;
  lockPollMs?: number;
}

/** Runs on one dedicated pg connection: the advisory lock belongs to that session. */
export class PgMigrationRunner implements MigrationRunner {
  readonly kind = 'postgresql' as const;

  constructor(
    private readonly client: ClientBase,
    private readonly options: PgRunnerOptions = {},
  ) {}

  async query<R extends Row = Row>(sql: string, params: readonly unknown[] = []): Promise<R[]> {
    const result = await this.client.query(sql, [...params]);
    return result.rows as R[];
  }

  async runScript(script: string): Promise<void> {
    // No parameters: node-postgres sends a simple Query message, which PostgreSQL runs as
    // one implicit transaction, so a failing statement rolls back the whole file.
    await this.client.query(script);
  }

  async lock(): Promise<() => Promise<void>> {
    const timeoutMs = this.options.lockTimeoutMs ?? 10_000;
    const pollMs = this.options.lockPollMs ?? 200;
    const deadline = Date.now() + timeoutMs;
    for (;;) {
      const [row] = await this.query<{ locked: boolean }>('SELECT pg_try_advisory_lock($1) AS locked', [
        MIGRATION_ADVISORY_LOCK,
      ]);
      if (row?.locked) break;
      if (Date.now() >= deadline) throw await this.lockTimeout(timeoutMs);
      await new Promise((resolve) => setTimeout(resolve, pollMs));
    }
    return async () => {
      await this.query('SELECT pg_advisory_unlock($1)', [MIGRATION_ADVISORY_LOCK]);
    };
  }

  private async lockTimeout(timeoutMs: number): Promise<DatabaseError> {
    const holders = await this.query<{ pid: number }>(
      "SELECT pid FROM pg_locks WHERE locktype = 'advisory' AND objid = $1 AND granted",
      [MIGRATION_ADVISORY_LOCK],
    ).catch(() => []);
    const pids = holders.map((h) => h.pid);
    return new DatabaseError(
      'MIGRATION_LOCK_TIMEOUT',
      `Another migrator held the migration lock (pg_advisory_lock ${MIGRATION_ADVISORY_LOCK}` +
        `${pids.length ? `, server pid ${pids.join(', ')}` : ''}) for more than ${timeoutMs / 1000} s; ` +
        'let it finish and try again.',
      { lockKey: MIGRATION_ADVISORY_LOCK, holderPids: pids, timeoutMs },
    );
  }
}

/** PGlite has a single connection and the data folder has its own lock file: no advisory lock. */
export class PgliteMigrationRunner implements MigrationRunner {
  readonly kind = 'embedded' as const;

  constructor(private readonly db: PGliteInterface) {}

  async query<R extends Row = Row>(sql: string, params: readonly unknown[] = []): Promise<R[]> {
    const result = await this.db.query<R>(sql, [...params]);
    return result.rows;
  }

  async runScript(script: string): Promise<void> {
    // exec() sends the script as one simple query: all statements or none.
    await this.db.exec(script);
  }

  async lock(): Promise<() => Promise<void>> {
    return async () => {};
  }
}
