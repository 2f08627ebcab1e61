// Idempotency keys on writes (the header as in the IETF httpapi draft "The Idempotency-Key HTTP Header Field"):
// a retry gets the first answer and writes nothing again; the same key on another request is refused.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS } from '../support/db';
import { FOREMAN_A, newVehicle, TECH_A, TECH_A2 } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';
import { startInstance, type Instance } from '../support/two-instances';

const koeoBackprobe = { location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off' } as const;

describe.each(BACKENDS)('idempotency keys on the %s database', (backend) => {
  let api: TestApi;
  let roId: string;
  let circuitId: string;
  const reading = (value: number) => ({ circuitId, quantity: 'dc_volts', at: 'signal', against: 'battery_negative', ...koeoBackprobe, value, unit: 'V' });
  const count = async () => ({
    readings: await api.db.prisma.measurement.count({ where: { repairOrderId: roId } }),
    trail: await api.db.prisma.auditEvent.count({ where: { repairOrderId: roId } }),
    orders: await api.db.prisma.repairOrder.count(),
  });

  beforeAll(async () => {
    api = await startApi(backend);
    roId = (await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'P0122 set', technicianId: TECH_A } })).body.id;
    circuitId = (await api.call('POST', `/api/repair-orders/${roId}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'TP', label: 'TP sensor 1' } })).body.id;
  });
  afterAll(async () => api?.close());

  it('answers a retried reading with the first response, marked as a replay, and stores it once', async () => {
    const send = () => api.call('POST', `/api/repair-orders/${roId}/measurements`, { user: TECH_A, body: reading(4.87), headers: { 'idempotency-key': 'tablet-7-retry-1' } });
    const first = await send();
    expect(first.status).toBe(201);
    expect(first.headers.get('idempotent-replayed')).toBeNull();
    const before = await count();
    const again = await send();
    expect(again.status).toBe(201);
    expect(again.headers.get('idempotent-replayed')).toBe('true');
    expect(again.body).toEqual(first.body);
    expect(await count()).toEqual(before);
  });

  it('answers a retried repair order with the same order (same id and number), opening one', async () => {
    const body = { vehicle: newVehicle(), complaint: 'MAP code after rain' };
    const send = () => api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body, headers: { 'idempotency-key': 'desk-open-42' } });
    const first = await send();
    const before = await count();
    const again = await send();
    expect([first.status, again.status]).toEqual([201, 201]);
    expect(again.body).toMatchObject({ id: first.body.id, number: first.body.number });
    expect(await count()).toEqual(before);
  });

  it('replays a PATCH too, rather than answering the retry with a stale-version 409', async () => {
    const version = (await api.call('GET', `/api/repair-orders/${roId}`, { user: FOREMAN_A })).body.version;
    const send = () => api.call('PATCH', `/api/repair-orders/${roId}`, { user: FOREMAN_A, body: { version, cause: 'open signal wire' }, headers: { 'idempotency-key': 'patch-cause-1' } });
    const first = await send();
    const again = await send();
    expect([first.status, again.status]).toEqual([200, 200]);
    expect(again.body.version).toBe(version + 1);
    expect(again.headers.get('idempotent-replayed')).toBe('true');
  });

  it.each([
    ['another body', (k: string) => api.call('POST', `/api/repair-orders/${roId}/measurements`, { user: TECH_A, body: reading(1.23), headers: { 'idempotency-key': k } })],
    ['another path', (k: string) => api.call('POST', `/api/repair-orders/${roId}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'MAP', label: 'x' }, headers: { 'idempotency-key': k } })],
  ])('refuses the same key with %s (422), writing nothing', async (_what, resend) => {
    const key = `reuse-${Math.random().toString(36).slice(2)}`;
    expect((await api.call('POST', `/api/repair-orders/${roId}/measurements`, { user: TECH_A, body: reading(4.86), headers: { 'idempotency-key': key } })).status).toBe(201);
    const before = await count();
    const reused = await resend(key);
    expect(reused.status).toBe(422);
    expect(reused.body.error).toMatchObject({ code: 'idempotency.key_reused', findings: [{ path: 'headers.idempotency-key' }] });
    expect(await count()).toEqual(before);
  });

  it("keeps each user's keys apart: another user's same key is a new request", async () => {
    const key = 'shared-looking-key';
    const mine = await api.call('POST', `/api/repair-orders/${roId}/measurements`, { user: TECH_A, body: reading(4.85), headers: { 'idempotency-key': key } });
    const theirs = await api.call('POST', `/api/repair-orders/${roId}/measurements`, { user: FOREMAN_A, body: reading(4.85), headers: { 'idempotency-key': key } });
    expect([mine.status, theirs.status]).toEqual([201, 201]);
    expect(theirs.body.id).not.toBe(mine.body.id);
    expect(theirs.headers.get('idempotent-replayed')).toBeNull();
  });

  it('frees the key when the first request failed without writing, so the corrected retry goes through', async () => {
    const key = 'fails-first';
    const bad = await api.call('POST', `/api/repair-orders/${roId}/measurements`, { user: TECH_A, body: { ...reading(4.8), unit: 'furlongs' }, headers: { 'idempotency-key': key } });
    expect(bad.status).toBe(400);
    const good = await api.call('POST', `/api/repair-orders/${roId}/measurements`, { user: TECH_A, body: reading(4.8), headers: { 'idempotency-key': key } });
    expect(good.status).toBe(201);
    expect(good.headers.get('idempotent-replayed')).toBeNull();
  });

  it('stores one reading when the same keyed request arrives ten times at once', async () => {
    const before = await count();
    const answers = await Promise.all(
      Array.from({ length: 10 }, () => api.call('POST', `/api/repair-orders/${roId}/measurements`, { user: TECH_A, body: reading(4.84), headers: { 'idempotency-key': 'burst-1' } })),
    );
    expect(answers.map((a) => a.status)).toEqual(Array(10).fill(201));
    expect(new Set(answers.map((a) => a.body.id)).size).toBe(1);
    expect(answers.filter((a) => a.headers.get('idempotent-replayed') === 'true')).toHaveLength(9);
    expect((await count()).readings).toBe(before.readings + 1);
  });

  it.each([
    ['an empty key', ''],
    ['a key with a space', 'two words'],
    ['a key of 256 characters', 'k'.repeat(256)],
  ])('refuses %s with a 400 naming the header', async (_what, key) => {
    const res = await api.call('POST', `/api/repair-orders/${roId}/measurements`, { user: TECH_A, body: reading(4.8), headers: { 'idempotency-key': key } });
    expect(res.status).toBe(400);
    expect(res.body.error.findings[0]).toMatchObject({ code: 'idempotency.key_invalid', path: 'headers.idempotency-key' });
  });
});

describe.runIf(BACKENDS.includes('postgresql'))('idempotency and version checks across two instances on one PostgreSQL database', () => {
  let api: TestApi;
  let a: Instance;
  let b: Instance;
  let roId: string;
  let circuitId: string;

  beforeAll(async () => {
    api = await startApi('postgresql');
    a = await startInstance(api);
    b = await startInstance(api);
    roId = (await a.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'P0117 set', technicianId: TECH_A } })).body.id;
    circuitId = (await b.call('POST', `/api/repair-orders/${roId}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'MAP', label: 'MAP sensor' } })).body.id;
  });
  afterAll(async () => {
    await Promise.all([a?.close(), b?.close()]);
    await api?.close();
  });

  const reading = { location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', quantity: 'dc_volts', at: 'reference', against: 'battery_negative', value: 5.0, unit: 'V' };

  it('answers a retry sent to the other instance with the first answer, storing one reading', async () => {
    const send = (instance: Instance) =>
      instance.call('POST', `/api/repair-orders/${roId}/measurements`, { user: TECH_A, body: { circuitId, ...reading }, headers: { 'idempotency-key': 'lb-retry-1' } });
    const first = await send(a);
    const retry = await send(b);
    expect([first.status, retry.status]).toEqual([201, 201]);
    expect(retry.headers.get('idempotent-replayed')).toBe('true');
    expect(retry.body.id).toBe(first.body.id);
    expect(await api.db.prisma.measurement.count({ where: { repairOrderId: roId } })).toBe(1);
  });

  it('writes once when both instances get the same keyed request at the same moment', async () => {
    const before = await api.db.prisma.measurement.count({ where: { repairOrderId: roId } });
    const answers = await Promise.all(
      [a, b, a, b, a, b].map((instance) =>
        instance.call('POST', `/api/repair-orders/${roId}/measurements`, { user: TECH_A, body: { circuitId, ...reading, value: 4.99 }, headers: { 'idempotency-key': 'lb-burst-1' } }),
      ),
    );
    expect(answers.map((r) => r.status)).toEqual(Array(6).fill(201));
    expect(new Set(answers.map((r) => r.body.id)).size).toBe(1);
    expect(await api.db.prisma.measurement.count({ where: { repairOrderId: roId } })).toBe(before + 1);
  });

  it('refuses on one instance a key used on the other for another request', async () => {
    await a.call('POST', `/api/repair-orders/${roId}/measurements`, { user: TECH_A, body: { circuitId, ...reading, value: 4.98 }, headers: { 'idempotency-key': 'lb-reuse' } });
    const reused = await b.call('POST', `/api/repair-orders/${roId}/measurements`, { user: TECH_A, body: { circuitId, ...reading, value: 1.0 }, headers: { 'idempotency-key': 'lb-reuse' } });
    expect(reused.status).toBe(422);
    expect(reused.body.error.code).toBe('idempotency.key_reused');
  });

  it('answers a stale PATCH through B after an update through A with 409 naming the current version', async () => {
    const version = (await a.call('GET', `/api/repair-orders/${roId}`, { user: FOREMAN_A })).body.version;
    expect((await a.call('PATCH', `/api/repair-orders/${roId}`, { user: FOREMAN_A, body: { version, complaint: 'P0117 set, hard start cold' } })).status).toBe(200);
    const stale = await b.call('PATCH', `/api/repair-orders/${roId}`, { user: TECH_A, body: { version, cause: 'sensor ground open' } });
    expect(stale.status).toBe(409);
    expect(stale.body.error).toMatchObject({ code: 'repair_order.stale_version', currentVersion: version + 1 });
    expect((await api.call('GET', `/api/repair-orders/${roId}`, { user: FOREMAN_A })).body.cause).toBe('');
  });

  it('lets exactly one of two simultaneous PATCHes at the same version through, one per instance', async () => {
    const version = (await a.call('GET', `/api/repair-orders/${roId}`, { user: FOREMAN_A })).body.version;
    for (let round = 0; round < 5; round++) {
      const current = version + round;
      const answers = await Promise.all([
        a.call('PATCH', `/api/repair-orders/${roId}`, { user: FOREMAN_A, body: { version: current, correction: `from A ${round}` } }),
        b.call('PATCH', `/api/repair-orders/${roId}`, { user: TECH_A, body: { version: current, correction: `from B ${round}` } }),
      ]);
      expect(answers.map((r) => r.status).sort()).toEqual([200, 409]);
      const now = (await api.call('GET', `/api/repair-orders/${roId}`, { user: FOREMAN_A })).body;
      expect(now.version).toBe(current + 1);
      expect(now.correction).toBe(answers.find((r) => r.status === 200)!.body.correction);
    }
  });
});
