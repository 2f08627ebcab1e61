// Timestamps must read back as the instant stored, whatever time zone the PostgreSQL server runs in: the service
// builds proofs (and their SHA-256 digests) from them. Inside a joined relation a timestamptz travels as JSON text
// in the session's zone, so the service's sessions are UTC whatever the server's default (PostgreSQL 15 manual,
// §8.5.1.3 "Time Stamps": output of timestamptz is converted to the session's TimeZone).
import { Client } from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Database } from '../../src/database';
import { BACKENDS, scratchDatabase, type ScratchDatabase } from '../support/db';
import { SHOP_A, seedShops } from '../support/fixtures';

describe.runIf(BACKENDS.includes('postgresql'))('dates on a PostgreSQL database whose default time zone is Asia/Kolkata (UTC+05:30)', () => {
  let scratch: ScratchDatabase;
  let db: Database;

  beforeAll(async () => {
    scratch = await scratchDatabase('postgresql', 'migrated');
    const admin = new Client({ connectionString: scratch.url });
    await admin.connect();
    try {
      const { rows } = await admin.query<{ name: string }>('SELECT current_database() AS name');
      await admin.query(`ALTER DATABASE "${rows[0]!.name}" SET timezone TO 'Asia/Kolkata'`);
    } finally {
      await admin.end();
    }
    db = await scratch.open();
    await seedShops(db.prisma);
  });
  afterAll(async () => scratch?.drop());

  it("runs the service's sessions in UTC", async () => {
    const [row] = await db.prisma.$queryRaw<Array<{ zone: string }>>`SELECT current_setting('TimeZone') AS zone`;
    expect(row!.zone).toBe('UTC');
  });

  it('reads a timestamp inside an included relation as the same instant as read directly', async () => {
    const direct = await db.prisma.user.findMany({ where: { shopId: SHOP_A }, select: { id: true, createdAt: true }, orderBy: { id: 'asc' } });
    const joined = await db.prisma.shop.findUniqueOrThrow({ where: { id: SHOP_A }, select: { users: { select: { id: true, createdAt: true }, orderBy: { id: 'asc' } } } });
    expect(direct.length).toBeGreaterThan(0);
    expect(joined.users.map((u) => u.createdAt.toISOString())).toEqual(direct.map((u) => u.createdAt.toISOString()));
  });

  it('reads the instant a row was given, to the millisecond', async () => {
    const at = new Date('2026-03-29T01:02:03.456Z');
    await db.prisma.shop.update({ where: { id: SHOP_A }, data: { createdAt: at } });
    const user = await db.prisma.user.findFirstOrThrow({ where: { shopId: SHOP_A }, select: { shop: { select: { createdAt: true } } } });
    expect(user.shop.createdAt.toISOString()).toBe('2026-03-29T01:02:03.456Z');
  });
});
