// Opening either back end: data persists across opens, one data folder has one owner, and a
// server that cannot be reached fails with a clear error instead of hanging.
import { createServer, type Server, type Socket } from 'node:net';
import { afterEach, describe, expect, it } from 'vitest';
import { openDatabase } from '../../src/database';
import { BACKENDS, scratchDatabase, type ScratchDatabase } from '../support/db';
import { MigrationsFolder } from './migrations-folder';

const SHOP = '11111111-2222-4333-8444-555555555555';

describe.each(BACKENDS.map((b) => [b]))('opening the %s database', (backend) => {
  let scratch: ScratchDatabase | undefined;
  afterEach(async () => {
    await scratch?.drop();
    scratch = undefined;
  });

  it('keeps written rows after closing and opening again', async () => {
    scratch = await scratchDatabase(backend, 'migrated');
    const first = await scratch.open();
    await first.prisma.shop.create({ data: { id: SHOP, name: 'Persistence Bay' } });
    await first.close();
    const second = await scratch.open();
    expect(await second.prisma.shop.findUnique({ where: { id: SHOP }, select: { name: true } })).toEqual({ name: 'Persistence Bay' });
    expect(second.kind).toBe(backend);
  });

  it('closes idempotently', async () => {
    scratch = await scratchDatabase(backend, 'migrated');
    const db = await scratch.open();
    await db.close();
    await expect(db.close()).resolves.toBeUndefined();
  });
});

describe.runIf(BACKENDS.includes('embedded'))('one embedded data folder, one owner', () => {
  let scratch: ScratchDatabase | undefined;
  afterEach(async () => {
    await scratch?.drop();
  });

  it('refuses a second open while the first is open, naming the folder and pid, and allows it after close', async () => {
    scratch = await scratchDatabase('embedded', 'migrated');
    const first = await scratch.open();
    await expect(scratch.open()).rejects.toMatchObject({
      code: 'DATA_DIR_LOCKED',
      message: expect.stringContaining(`${scratch.dataDir} is in use by process ${process.pid}`),
    });
    await first.close();
    const again = await scratch.open();
    expect(await again.prisma.shop.count()).toBe(0);
  });
});

describe.runIf(BACKENDS.includes('postgresql'))('the PostgreSQL server back end', () => {
  let scratch: ScratchDatabase | undefined;
  let server: Server | undefined;
  const sockets: Socket[] = [];
  const folders: MigrationsFolder[] = [];
  afterEach(async () => {
    await scratch?.drop();
    scratch = undefined;
    sockets.splice(0).forEach((s) => s.destroy());
    await new Promise((resolve) => (server ? server.close(resolve) : resolve(undefined)));
    server = undefined;
    folders.splice(0).forEach((f) => f.remove());
  });
  const migrations = (m: Record<string, string>) => {
    const f = new MigrationsFolder(m);
    folders.push(f);
    return f.dir;
  };

  it('reports a refused connection as DATABASE_UNREACHABLE with the address', async () => {
    const closed = createServer();
    await new Promise<void>((resolve) => closed.listen(0, '127.0.0.1', resolve));
    const { port } = closed.address() as { port: number };
    await new Promise((resolve) => closed.close(resolve));
    await expect(
      openDatabase({ databaseUrl: `postgresql://postgres@127.0.0.1:${port}/none`, dataDir: '/unused', migrationsDir: migrations({}) }),
    ).rejects.toMatchObject({ code: 'DATABASE_UNREACHABLE', message: expect.stringContaining(`127.0.0.1:${port}/none`) });
  });

  it('gives up on a server that accepts but never answers, instead of hanging', async () => {
    server = createServer((socket) => void sockets.push(socket));
    await new Promise<void>((resolve) => server!.listen(0, '127.0.0.1', resolve));
    const { port } = server.address() as { port: number };
    await expect(
      openDatabase({ databaseUrl: `postgresql://postgres@127.0.0.1:${port}/silent`, dataDir: '/unused', migrationsDir: migrations({}), connectTimeoutMs: 300 }),
    ).rejects.toMatchObject({ code: 'DATABASE_UNREACHABLE' });
  });

  it.each([
    ['mysql://root@localhost/db', /protocol "mysql:"/],
    ['not a url', /not a valid URL/],
    ['postgresql://postgres@localhost/db?schema=bad;name', /schema="bad;name"/],
  ])('refuses the database URL %s with a clear message', async (url, message) => {
    await expect(openDatabase({ databaseUrl: url, dataDir: '/unused', migrationsDir: migrations({}) })).rejects.toMatchObject({
      code: 'DATABASE_URL_INVALID',
      message: expect.stringMatching(message),
    });
  });

  it('waits for the migration advisory lock held by another session, then gives up with MIGRATION_LOCK_TIMEOUT', async () => {
    scratch = await scratchDatabase('postgresql', 'empty');
    const { Client } = await import('pg');
    const holder = new Client({ connectionString: scratch.url });
    await holder.connect();
    try {
      await holder.query('SELECT pg_advisory_lock(72707369)');
      await expect(
        scratch.open({ migrationsDir: migrations({ '1_t': 'CREATE TABLE t (id int);' }), migrationLockTimeoutMs: 600 }),
      ).rejects.toMatchObject({ code: 'MIGRATION_LOCK_TIMEOUT', message: expect.stringContaining('72707369') });
    } finally {
      await holder.end();
    }
  });

  it('lets two migrators on two connections migrate one database at once: each migration is applied once', async () => {
    scratch = await scratchDatabase('postgresql', 'empty');
    const dir = migrations({ '1_t': 'CREATE TABLE t (id int);', '2_u': 'CREATE TABLE u (id int); SELECT pg_sleep(0.2);' });
    const [a, b] = await Promise.all([scratch.open({ migrationsDir: dir }), scratch.open({ migrationsDir: dir })]);
    const applied = [...a.migrationReport!.applied, ...b.migrationReport!.applied].sort();
    expect(applied).toEqual(['1_t', '2_u']);
    const rows = await a.prisma.$queryRawUnsafe<{ n: number }[]>('SELECT count(*)::int AS n FROM "_prisma_migrations"');
    expect(rows[0]!.n).toBe(2);
  });

  it('honours ?schema= by migrating into that schema', async () => {
    scratch = await scratchDatabase('postgresql', 'empty');
    const db = await openDatabase({
      databaseUrl: `${scratch.url}?schema=bay_two`,
      dataDir: '/unused',
      migrationsDir: migrations({ '1_t': 'CREATE TABLE "Part" (id int);' }),
    });
    try {
      const rows = await db.prisma.$queryRawUnsafe<{ schema: string; table: string }[]>(
        `SELECT table_schema AS schema, table_name AS table FROM information_schema.tables
         WHERE table_name IN ('Part', '_prisma_migrations') ORDER BY table_name`,
      );
      expect(rows).toEqual([{ schema: 'bay_two', table: 'Part' }, { schema: 'bay_two', table: '_prisma_migrations' }]);
    } finally {
      await db.close();
    }
  });
});
