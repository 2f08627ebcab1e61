// The migrator on both back ends, against temporary migration folders: the `_prisma_migrations`
// rows it writes follow Prisma's format (id, SHA-256 checksum, finished_at, applied_steps_count).
import { writeFileSync } from 'node:fs';
import { afterEach, describe, expect, it } from 'vitest';
import type { Database } from '../../src/database';
import { BACKENDS, scratchDatabase, type ScratchDatabase } from '../support/db';
import { MigrationsFolder } from './migrations-folder';

interface HistoryRow {
  migration_name: string;
  checksum: string;
  finished_at: Date | null;
  rolled_back_at: Date | null;
  applied_steps_count: number;
  logs: string | null;
}

/** SHA-256 through WebCrypto, independently of the createHash path the migrator uses. */
async function sha256Hex(text: string): Promise<string> {
  const digest = await globalThis.crypto.subtle.digest('SHA-256', new TextEncoder().encode(text));
  return Buffer.from(digest).toString('hex');
}

async function history(db: Database): Promise<HistoryRow[]> {
  return db.prisma.$queryRawUnsafe<HistoryRow[]>(
    `SELECT migration_name, checksum, finished_at, rolled_back_at, applied_steps_count, logs
     FROM "_prisma_migrations" ORDER BY started_at, migration_name`,
  );
}

async function tableExists(db: Database, table: string): Promise<boolean> {
  const [row] = await db.prisma.$queryRawUnsafe<{ present: boolean }[]>(
    `SELECT to_regclass('"${table}"') IS NOT NULL AS present`,
  );
  return row!.present;
}

const CREATE = 'CREATE TABLE "Item" ("id" INTEGER NOT NULL, CONSTRAINT "Item_pkey" PRIMARY KEY ("id"));\n';
const ALTER = 'ALTER TABLE "Item" ADD COLUMN "label" TEXT NOT NULL DEFAULT \'\';\n';

describe.each(BACKENDS.map((b) => [b]))('migrating an empty %s database', (backend) => {
  let scratch: ScratchDatabase | undefined;
  const folders: MigrationsFolder[] = [];
  const fresh = async (migrations: Record<string, string>) => {
    scratch = await scratchDatabase(backend, 'empty');
    const folder = new MigrationsFolder(migrations);
    folders.push(folder);
    return { scratch, folder, open: (apply = true) => scratch!.open({ migrationsDir: folder.dir, applyMigrations: apply }) };
  };
  afterEach(async () => {
    await scratch?.drop();
    scratch = undefined;
    folders.splice(0).forEach((f) => f.remove());
  });

  it('applies the folders in localeCompare order and records one finished row each', async () => {
    // "1_B_alter" needs the table of "1_a_create": byte order would run it first and fail.
    const { open } = await fresh({ '1_B_alter': ALTER, '1_a_create': CREATE });
    const db = await open();
    expect(db.migrationReport).toEqual({ applied: ['1_a_create', '1_B_alter'], alreadyApplied: [] });
    const rows = await history(db);
    expect(rows.map((r) => r.migration_name)).toEqual(['1_a_create', '1_B_alter']);
    expect(rows.map((r) => r.checksum)).toEqual([await sha256Hex(CREATE), await sha256Hex(ALTER)]);
    for (const row of rows) {
      expect(row).toMatchObject({ applied_steps_count: 1, rolled_back_at: null, logs: null });
      expect(row.finished_at).toBeInstanceOf(Date);
    }
    expect(await db.migrationState()).toEqual({ applied: ['1_a_create', '1_B_alter'], pending: [], failed: [] });
  });

  it('applies nothing the second time, and only the new folder after one is added', async () => {
    const { open, folder } = await fresh({ '1_a_create': CREATE });
    await (await open()).close();
    const again = await open();
    expect(again.migrationReport).toEqual({ applied: [], alreadyApplied: ['1_a_create'] });
    expect(await history(again)).toHaveLength(1);
    folder.write('2_alter', ALTER);
    expect(await again.migrationState()).toMatchObject({ applied: ['1_a_create'], pending: ['2_alter'] });
    await again.close();
    const third = await open();
    expect(third.migrationReport).toEqual({ applied: ['2_alter'], alreadyApplied: ['1_a_create'] });
    expect((await history(third)).map((r) => r.migration_name)).toEqual(['1_a_create', '2_alter']);
  });

  it('stops when an applied migration was edited, naming it and both checksums', async () => {
    const { open, folder } = await fresh({ '1_a_create': CREATE });
    await (await open()).close();
    const edited = CREATE.replace('INTEGER', 'BIGINT');
    writeFileSync(folder.scriptPath('1_a_create'), edited);
    const [recorded, now] = [await sha256Hex(CREATE), await sha256Hex(edited)];
    await expect(open()).rejects.toMatchObject({
      code: 'MIGRATION_EDITED',
      message: expect.stringMatching(new RegExp(`1_a_create.*${recorded}.*${now}`)),
    });
  });

  it('keeps nothing of a failing migration, records its logs, stops there, and refuses the next run', async () => {
    const bad = 'CREATE TABLE "Half" ("id" INTEGER);\nINSERT INTO "Nowhere" VALUES (1);\n';
    const { open, folder } = await fresh({ '1_a_create': CREATE, '2_bad': bad, '3_after': ALTER });
    await expect(open()).rejects.toMatchObject({
      code: 'MIGRATION_FAILED',
      message: expect.stringMatching(/2_bad[\s\S]*Nowhere[\s\S]*line 2/),
    });
    const inspect = await open(false);
    expect(await tableExists(inspect, 'Half')).toBe(false);
    expect(await tableExists(inspect, 'Item')).toBe(true);
    const rows = await history(inspect);
    expect(rows.map((r) => r.migration_name)).toEqual(['1_a_create', '2_bad']);
    expect(rows[1]).toMatchObject({ finished_at: null, rolled_back_at: null, applied_steps_count: 0 });
    expect(rows[1]!.logs).toMatch(/Nowhere/);
    expect(await inspect.migrationState()).toEqual({ applied: ['1_a_create'], pending: ['2_bad', '3_after'], failed: ['2_bad'] });
    await inspect.close();

    await expect(open()).rejects.toMatchObject({ code: 'MIGRATION_FAILED_EARLIER', message: expect.stringContaining('2_bad') });

    // Resolved the way `prisma migrate resolve --rolled-back` does it: the row stays, marked rolled back.
    const resolve = await open(false);
    await resolve.prisma.$executeRawUnsafe(`UPDATE "_prisma_migrations" SET rolled_back_at = now() WHERE migration_name = '2_bad'`);
    await resolve.close();
    folder.write('2_bad', 'CREATE TABLE "Half" ("id" INTEGER);\n');
    const fixed = await open();
    expect(fixed.migrationReport).toEqual({ applied: ['2_bad', '3_after'], alreadyApplied: ['1_a_create'] });
    expect(await tableExists(fixed, 'Half')).toBe(true);
  });

  it('refuses a database that has tables but no migration history', async () => {
    const { open } = await fresh({ '1_a_create': CREATE });
    const raw = await open(false);
    await raw.prisma.$executeRawUnsafe('CREATE TABLE "stray_parts" ("id" INTEGER)');
    await raw.close();
    await expect(open()).rejects.toMatchObject({ code: 'DATABASE_NOT_EMPTY', message: expect.stringContaining('stray_parts') });
  });
});
