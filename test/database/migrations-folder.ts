// Temporary migration folders for migrator tests, laid out like prisma/migrations.
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export class MigrationsFolder {
  readonly dir = mkdtempSync(join(tmpdir(), 'tracebay-test-migrations-'));

  constructor(migrations: Record<string, string> = {}, lockFile: string | null = 'provider = "postgresql"\n') {
    if (lockFile !== null) writeFileSync(join(this.dir, 'migration_lock.toml'), lockFile);
    for (const [name, sql] of Object.entries(migrations)) this.write(name, sql);
  }

  write(name: string, sql: string): this {
    mkdirSync(join(this.dir, name), { recursive: true });
    writeFileSync(join(this.dir, name, 'migration.sql'), sql);
    return this;
  }

  /** A migration folder without its migration.sql. */
  addEmptyFolder(name: string): this {
    mkdirSync(join(this.dir, name), { recursive: true });
    return this;
  }

  scriptPath(name: string): string {
    return join(this.dir, name, 'migration.sql');
  }

  remove(): void {
    rmSync(this.dir, { recursive: true, force: true });
  }
}
