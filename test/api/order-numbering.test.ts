// Automatic repair-order numbers have their own sequence per shop: a number typed by hand (however large) never
// moves it, a typed number it reaches is skipped, the shop sets its prefix and width, and existing shops and the
// demo continue from their own highest numbers.
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../src/demo/seed';
import { FOREMAN, FOREMAN_TWO } from '../../src/demo/scenario';
import { BACKENDS, scratchDatabase, type ScratchDatabase } from '../support/db';
import { FOREMAN_A, FOREMAN_B, newVehicle, SHOP_A, SHOP_B, TECH_A, seedShops } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';
import { MigrationsFolder } from '../database/migrations-folder';

const NUMBERING = '/api/shop/order-numbering';

describe.each(BACKENDS)('repair-order numbering on the %s database', (backend) => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startApi(backend, { env: { TRACEBAY_WRITE_LIMIT: '0' } });
  });
  afterAll(async () => api?.close());

  const open = (body: Record<string, unknown> = {}, user = FOREMAN_A) => api.call('POST', '/api/repair-orders', { user, body: { vehicle: newVehicle(), complaint: 'P0122 set', ...body } });

  it('keeps numbering every opening after someone types "RO-999999999999999" (before: 11 of the next 30 got 503)', async () => {
    const first = await open();
    expect(first.body.number).toBe('RO-00001');
    expect((await open({ number: 'RO-999999999999999' })).status).toBe(201);
    const after = [];
    for (let i = 0; i < 30; i++) after.push(await open());
    expect(after.map((r) => r.status)).toEqual(Array(30).fill(201));
    expect(after.map((r) => r.body.number)).toEqual(Array.from({ length: 30 }, (_, i) => `RO-${String(i + 2).padStart(5, '0')}`));
  });

  it('gives twelve orders opened at the same moment twelve consecutive numbers', async () => {
    const opened = await Promise.all(Array.from({ length: 12 }, () => open()));
    expect(opened.map((r) => r.status)).toEqual(Array(12).fill(201));
    const numbers = opened.map((r) => Number(r.body.number.slice(3))).sort((a, b) => a - b);
    expect(numbers).toEqual(Array.from({ length: 12 }, (_, i) => numbers[0]! + i));
  });

  it('skips a number already typed by hand when the sequence reaches it', async () => {
    const { next } = (await api.call('GET', NUMBERING, { user: TECH_A })).body;
    const typed = `RO-${String(next).padStart(5, '0')}`;
    expect((await open({ number: typed.toLowerCase() })).body.number).toBe(typed);
    expect((await open()).body.number).toBe(`RO-${String(next + 1).padStart(5, '0')}`);
  });

  it.each([
    ['longer than 20 characters', 'RO-12345678901234567890', 'at most 20 characters'],
    ['with a space', 'RO 12', 'letters, digits'],
    ['with markup', 'RO-1<b>', 'letters, digits'],
    ['starting with a dash', '-RO-1', 'letters, digits'],
  ])('refuses a typed number %s with a 400 naming the field', async (_what, number, expected) => {
    const res = await open({ number });
    expect(res.status).toBe(400);
    expect(res.body.error.findings).toEqual(expect.arrayContaining([expect.objectContaining({ path: 'body.number', message: expect.stringContaining(expected) })]));
  });

  it('lets the foreman set the prefix and width (and where it continues), and numbers the next order so', async () => {
    const set = await api.call('PUT', NUMBERING, { user: FOREMAN_A, body: { prefix: 'tb-', width: 6, next: 42 } });
    expect(set.status, JSON.stringify(set.body)).toBe(200);
    expect(set.body).toEqual({ prefix: 'TB-', width: 6, next: 42, nextNumber: 'TB-000042' });
    expect((await open()).body.number).toBe('TB-000042');
    expect((await api.call('GET', NUMBERING, { user: TECH_A })).body).toMatchObject({ prefix: 'TB-', width: 6, next: 43, nextNumber: 'TB-000043' });
    // Prefix and width again without `next`: the sequence goes on where it was.
    await api.call('PUT', NUMBERING, { user: FOREMAN_A, body: { prefix: 'TB/', width: 3 } });
    expect((await open()).body.number).toBe('TB/043');
    // Another shop's numbering is its own.
    expect((await open({}, FOREMAN_B)).body.number).toBe('RO-00001');
  });

  it('records a change of the numbering in the audit trail', async () => {
    const events = await api.db.prisma.auditEvent.findMany({ where: { action: 'order_numbering.updated', shopId: SHOP_A } });
    expect(events.map((e) => e.changes)).toEqual(expect.arrayContaining([{ prefix: { before: 'RO-', after: 'TB-' }, width: { before: 5, after: 6 } }]));
  });

  it('refuses the numbering change from a technician with a 403', async () => {
    const res = await api.call('PUT', NUMBERING, { user: TECH_A, body: { prefix: 'X-', width: 4 } });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('order_numbering.foreman_only');
  });

  it.each([
    ['a prefix with a space', { prefix: 'R O', width: 5 }, 'body.prefix'],
    ['a prefix over 10 characters', { prefix: 'ABCDEFGHIJK-', width: 5 }, 'body.prefix'],
    ['a width of 0', { prefix: 'RO-', width: 0 }, 'body.width'],
    ['a width of 10', { prefix: 'RO-', width: 10 }, 'body.width'],
    ['a next number of 0', { prefix: 'RO-', width: 5, next: 0 }, 'body.next'],
    ['no width', { prefix: 'RO-' }, 'body.width'],
  ])('refuses %s with a 400 naming the field', async (_what, body, path) => {
    const res = await api.call('PUT', NUMBERING, { user: FOREMAN_A, body });
    expect(res.status).toBe(400);
    expect(res.body.error.findings.map((f: { path: string }) => f.path)).toContain(path);
  });
});

describe.each(BACKENDS)('the demo shops’ numbering on the %s database', (backend) => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startApi(backend, { fixtures: false });
    expect(await seedDemo(api.db.prisma)).toBe('seeded');
  });
  afterAll(async () => api?.close());

  it.each([
    ['Kestrel Row', FOREMAN, 'KR-24038'],
    ['Fennick Yard', FOREMAN_TWO, 'FY-1109'],
  ])('continues %s from its highest number', async (_shop, user, expected) => {
    const res = await api.call('POST', '/api/repair-orders', { user, body: { vehicle: newVehicle(), complaint: 'P0122 set' } });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.number).toBe(expected);
  });
});

describe.each(BACKENDS)('upgrading a %s database that already has repair orders', (backend) => {
  let scratch: ScratchDatabase | undefined;
  let folder: MigrationsFolder | undefined;
  afterEach(async () => {
    await scratch?.drop();
    folder?.remove();
  });

  it('starts each shop’s sequence after its own numbers, ignoring numbers of more than 9 digits', async () => {
    const root = join(__dirname, '..', '..', 'prisma', 'migrations');
    const names = readdirSync(root).filter((n) => /^\d{14}_/.test(n)).sort();
    const mine = names.find((n) => n.endsWith('_order_numbering'))!;
    folder = new MigrationsFolder(Object.fromEntries(names.filter((n) => n < mine).map((n) => [n, readFileSync(join(root, n, 'migration.sql'), 'utf8')])));
    scratch = await scratchDatabase(backend, 'empty');
    let db = await scratch.open({ migrationsDir: folder.dir });
    await seedShops(db.prisma);
    // Raw SQL: the client knows columns that later migrations add (the vehicle's high-voltage flag), this database not yet.
    const [vehicle] = await db.prisma.$queryRawUnsafe<Array<{ id: string }>>(
      `INSERT INTO "Vehicle" ("id", "shopId", "vin", "year", "make", "model", "odometer", "createdById")
       VALUES (gen_random_uuid(), $1::uuid, '1M8GDM9AXKP042788', 2019, 'Testmake', 'Testmodel', 1, $2::uuid) RETURNING "id"`,
      SHOP_A,
      FOREMAN_A,
    );
    for (const number of ['RO-00007', 'RO-00012', 'RO-999999999999999', 'T-100'])
      await db.prisma.repairOrder.create({ data: { shopId: SHOP_A, number, vehicleId: vehicle!.id, complaint: 'x', createdById: FOREMAN_A } });
    await db.close();
    folder.write(mine, readFileSync(join(root, mine, 'migration.sql'), 'utf8'));
    db = await scratch.open({ migrationsDir: folder.dir });
    const rows = await db.prisma.orderNumbering.findMany({ orderBy: { shopId: 'asc' } });
    expect(rows.map((r) => ({ shopId: r.shopId, prefix: r.prefix, width: r.width, next: Number(r.next) }))).toEqual([
      { shopId: SHOP_A, prefix: 'RO-', width: 5, next: 13 },
      { shopId: SHOP_B, prefix: 'RO-', width: 5, next: 1 },
    ]);
  });
});
