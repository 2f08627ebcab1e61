// Reads prisma/migrations the way Prisma's engine does: every sub-folder is one migration,
// taken in localeCompare order, its migration.sql checksummed as SHA-256 of the UTF-8 text.
import { createHash } from 'node:crypto';
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { DatabaseError, describeDriverError } from './errors';

export interface MigrationFile {
  /** Folder name, e.g. `20250101120000_init`; also the `migration_name` column. */
  readonly name: string;
  readonly scriptPath: string;
  readonly script: string;
  /** 64 lower-case hex characters. */
  readonly checksum: string;
}

export const MIGRATION_SCRIPT = 'migration.sql';
export const MIGRATION_LOCK_FILE = 'migration_lock.toml';
const PROVIDER = 'postgresql';

export function migrationChecksum(script: string): string {
  return createHash('sha256').update(script, 'utf8').digest('hex');
}

/**
 * Whether a script still matches the checksum recorded when it was applied. Like Prisma's engine,
 * a file whose only change is LF versus CRLF line endings (git checkouts) still matches.
 */
export function checksumMatches(script: string, recorded: string): boolean {
  const candidates = [script, script.replace(/\r\n/g, '\n'), script.replace(/\r?\n/g, '\r\n')];
  return candidates.some((text) => migrationChecksum(text) === recorded.toLowerCase());
}

export function readMigrations(migrationsDir: string): MigrationFile[] {
  let entries: string[];
  try {
    entries = readdirSync(migrationsDir);
  } catch (error) {
    throw new DatabaseError(
      'MIGRATIONS_DIR_UNREADABLE',
      `Cannot read the migrations folder ${migrationsDir}: ${describeDriverError(error)}`,
      { migrationsDir },
      { cause: error },
    );
  }
  checkProvider(migrationsDir);
  const folders = entries
    .filter((entry) => statSync(join(migrationsDir, entry)).isDirectory())
    .sort((a, b) => a.localeCompare(b));
  return folders.map((name) => {
    const scriptPath = join(migrationsDir, name, MIGRATION_SCRIPT);
    if (!existsSync(scriptPath)) {
      throw new DatabaseError(
        'MIGRATION_SCRIPT_MISSING',
        `Migration folder ${name} has no ${MIGRATION_SCRIPT} (expected ${scriptPath}). ` +
          'Every sub-folder of the migrations folder must hold one migration.sql.',
        { migration: name, scriptPath },
      );
    }
    const script = readFileSync(scriptPath, 'utf8');
    return { name, scriptPath, script, checksum: migrationChecksum(script) };
  });
}

/** migration_lock.toml only guards the provider line; a missing file is accepted, as by Prisma. */
function checkProvider(migrationsDir: string): void {
  const lockPath = join(migrationsDir, MIGRATION_LOCK_FILE);
  if (!existsSync(lockPath)) return;
  const text = readFileSync(lockPath, 'utf8');
  const match = /^\s*provider\s*=\s*"([^"]*)"\s*$/m.exec(text);
  if (!match) {
    throw new DatabaseError(
      'MIGRATION_PROVIDER_MISMATCH',
      `${lockPath} has no provider line; expected provider = "${PROVIDER}".`,
      { lockPath },
    );
  }
  if (match[1] !== PROVIDER) {
    throw new DatabaseError(
      'MIGRATION_PROVIDER_MISMATCH',
      `${lockPath} says provider = "${match[1]}", but these migrations run on PostgreSQL; expected provider = "${PROVIDER}".`,
      { lockPath, provider: match[1] },
    );
  }
}
