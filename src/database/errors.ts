// Coded errors of the database layer: callers branch on `code`, people read `message`.

export type DatabaseErrorCode =
  /** The migrations folder does not exist or cannot be read. */
  | 'MIGRATIONS_DIR_UNREADABLE'
  /** A migration folder has no migration.sql. */
  | 'MIGRATION_SCRIPT_MISSING'
  /** migration_lock.toml names another provider than postgresql. */
  | 'MIGRATION_PROVIDER_MISMATCH'
  /** Another process held the migration advisory lock for too long. */
  | 'MIGRATION_LOCK_TIMEOUT'
  /** Tables exist but no migration history (Prisma's P3005). */
  | 'DATABASE_NOT_EMPTY'
  /** A migration failed earlier and was never resolved (Prisma's P3009). */
  | 'MIGRATION_FAILED_EARLIER'
  /** A migration failed just now; its row carries the logs. */
  | 'MIGRATION_FAILED'
  /** An applied migration's file changed since it was applied. */
  | 'MIGRATION_EDITED'
  /** Another live process holds the embedded data folder. */
  | 'DATA_DIR_LOCKED'
  /** The embedded data folder cannot be created, locked or opened. */
  | 'DATA_DIR_UNUSABLE'
  /** The PostgreSQL server cannot be reached or refused the connection. */
  | 'DATABASE_UNREACHABLE'
  /** The database URL cannot be parsed or uses an unsupported option. */
  | 'DATABASE_URL_INVALID';

export class DatabaseError extends Error {
  override readonly name = 'DatabaseError';

  constructor(
    readonly code: DatabaseErrorCode,
    message: string,
    /** Structured facts behind the message (migration name, checksums, pid...). */
    readonly details: Readonly<Record<string, unknown>> = {},
    options?: { cause?: unknown },
  ) {
    super(message, options);
  }

  toJSON(): { code: DatabaseErrorCode; message: string; details: Readonly<Record<string, unknown>> } {
    return { code: this.code, message: this.message, details: this.details };
  }
}

export function isDatabaseError(value: unknown, code?: DatabaseErrorCode): value is DatabaseError {
  return value instanceof DatabaseError && (code === undefined || value.code === code);
}

/** Short description of a driver error (pg or PGlite) for messages and logs. */
export function describeDriverError(error: unknown): string {
  if (error instanceof AggregateError && error.errors.length > 0) {
    return error.errors.map((e) => describeDriverError(e)).join('; ');
  }
  if (error instanceof Error) {
    const code = (error as { code?: unknown }).code;
    return typeof code === 'string' && code.length > 0 ? `${error.message} (${code})` : error.message;
  }
  return String(error);
}
