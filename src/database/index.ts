export { openDatabase, EMBEDDED_PGDATA, type Database, type OpenDatabaseOptions } from './open-database';
export { DatabaseError, isDatabaseError, type DatabaseErrorCode } from './errors';
export {
  applyMigrations,
  readMigrationState,
  silentLogger,
  type DatabaseLogger,
  type MigrationReport,
  type MigrationState,
} from './migrator';
export { readMigrations, migrationChecksum, checksumMatches, type MigrationFile } from './migration-files';
export {
  PgMigrationRunner,
  PgliteMigrationRunner,
  MIGRATION_ADVISORY_LOCK,
  type DatabaseKind,
  type MigrationRunner,
} from './migration-runner';
export { lockDataDir, DATA_DIR_LOCK_FILE, type DataDirLock } from './data-dir-lock';
export { parseDatabaseUrl } from './pg-connection';
export { isDatabaseUnavailable, isDataRejected } from './unavailable';
