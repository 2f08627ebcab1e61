// The audit trail: every write records who, when, from which client and what changed, and the database refuses
// to change or delete the trail (trigger on both back ends; on PostgreSQL the grants too).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS } from '../support/db';
import { FOREMAN_A, newVehicle, TECH_A, TECH_B } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';

const koeoBackprobe = { location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off' } as const;
const TABLET = { 'user-agent': 'bay-tablet-test/1.0', 'x-tracebay-client': 'bay-3-tablet' };

interface AuditItem {
  action: string;
  entity: { type: string; id: string };
  by: { id: string; name: string | null } | null;
  at: string;
  client: { ip: string | null; userAgent: string | null; requestId: string | null; clientId: string | null };
  row: Record<string, unknown>;
  changes: Record<string, { before: unknown; after: unknown }> | null;
}

describe.each(BACKENDS)('audit trail on the %s database', (backend) => {
  let api: TestApi;
  let roId: string;
  let circuitId: string;
  let readingId: string;
  let correctionId: string;
  let trail: AuditItem[];
  const started = Date.now();
  /** The client's X-Request-Id of each request → the server's own id answered for it (the one the trail keeps). */
  const serverIds = new Map<string, string>();

  beforeAll(async () => {
    api = await startApi(backend);
    const as = (user: string, requestId: string) => ({ user, headers: { ...TABLET, 'x-request-id': requestId } });
    const call = api.call.bind(api);
    api = {
      ...api,
      async call(method, path, options) {
        const res = await call(method, path, options);
        const theirs = options?.headers?.['x-request-id'];
        if (theirs) serverIds.set(theirs, res.headers.get('x-request-id')!);
        return res;
      },
    } as TestApi;
    const ro = await api.call('POST', '/api/repair-orders', {
      ...as(FOREMAN_A, 'req-open-ro'),
      body: { vehicle: newVehicle(), complaint: 'P0122 set', codes: ['P0122'], technicianId: TECH_A },
    });
    expect(ro.status, JSON.stringify(ro.body)).toBe(201);
    roId = ro.body.id;
    const circuit = await api.call('POST', `/api/repair-orders/${roId}/circuits`, { ...as(TECH_A, 'req-circuit'), body: { kind: 'three_wire_5v', sensor: 'TP', label: 'TP sensor 1' } });
    circuitId = circuit.body.id;
    expect((await api.call('POST', `/api/repair-orders/${roId}/status`, { ...as(TECH_A, 'req-diagnosing'), body: { to: 'diagnosing' } })).status).toBe(200);
    const reading = { circuitId, quantity: 'dc_volts', at: 'reference', against: 'battery_negative', ...koeoBackprobe, unit: 'V' };
    const wrong = await api.call('POST', `/api/repair-orders/${roId}/measurements`, { ...as(TECH_A, 'req-reading'), body: { ...reading, value: 0.51 } });
    expect(wrong.status, JSON.stringify(wrong.body)).toBe(201);
    readingId = wrong.body.id;
    const fixed = await api.call('POST', `/api/repair-orders/${roId}/measurements`, { ...as(TECH_A, 'req-correction'), body: { ...reading, value: 5.01, supersedes: readingId } });
    expect(fixed.status, JSON.stringify(fixed.body)).toBe(201);
    correctionId = fixed.body.id;
    const version = (await api.call('GET', `/api/repair-orders/${roId}`, { user: FOREMAN_A })).body.version;
    const patched = await api.call('PATCH', `/api/repair-orders/${roId}`, { ...as(FOREMAN_A, 'req-patch'), body: { version, complaint: 'P0122 set, stalls at idle' } });
    expect(patched.status, JSON.stringify(patched.body)).toBe(200);
    const repair = await api.call('POST', `/api/repair-orders/${roId}/repairs`, {
      ...as(TECH_A, 'req-repair'),
      body: { circuitId, part: 'signal', action: 'Spliced the signal wire with a sealed crimp sleeve' },
    });
    expect(repair.status, JSON.stringify(repair.body)).toBe(201);
    // "Verified" needs the deciding reading taken again after the repair, healthy.
    const retest = await api.call('POST', `/api/repair-orders/${roId}/measurements`, { ...as(TECH_A, 'req-retest'), body: { ...reading, value: 5.0, phase: 'verification' } });
    expect(retest.status, JSON.stringify(retest.body)).toBe(201);
    expect((await api.call('POST', `/api/repair-orders/${roId}/status`, { ...as(TECH_A, 'req-verified'), body: { to: 'verified' } })).status).toBe(200);
    const review = await api.call('POST', `/api/repair-orders/${roId}/reviews`, { ...as(FOREMAN_A, 'req-review'), body: { decision: 'approved', comment: 'Splice checked' } });
    expect(review.status, JSON.stringify(review.body)).toBe(201);
    const listed = await api.call('GET', `/api/repair-orders/${roId}/audit?pageSize=200`, { user: FOREMAN_A });
    expect(listed.status, JSON.stringify(listed.body)).toBe(200);
    trail = listed.body.items;
  });
  afterAll(async () => api?.close());

  const one = (clientRequestId: string, action: string) => {
    const requestId = serverIds.get(clientRequestId);
    const found = trail.filter((e) => e.client.requestId === requestId && e.action === action);
    expect(found, `${action} of ${requestId} in ${JSON.stringify(trail.map((e) => [e.client.requestId, e.action]))}`).toHaveLength(1);
    return found[0]!;
  };

  it.each([
    ['opening the repair order', 'req-open-ro', 'repair_order.created', FOREMAN_A],
    ['the first status entry', 'req-open-ro', 'status_change.created', FOREMAN_A],
    ['a circuit', 'req-circuit', 'circuit.created', TECH_A],
    ['a status move', 'req-diagnosing', 'status_change.created', TECH_A],
    ['a reading', 'req-reading', 'measurement.created', TECH_A],
    ['a correction of a reading', 'req-correction', 'measurement.corrected', TECH_A],
    ['a change of the repair order', 'req-patch', 'repair_order.updated', FOREMAN_A],
    ['a repair', 'req-repair', 'repair.created', TECH_A],
    ['a review', 'req-review', 'review.created', FOREMAN_A],
  ])('records %s (%s → %s) with who did it and from which client', (_what, clientRequestId, action, user) => {
    const event = one(clientRequestId, action);
    expect(event.by).toMatchObject({ id: user });
    expect(event.client).toMatchObject({ userAgent: TABLET['user-agent'], clientId: TABLET['x-tracebay-client'], requestId: serverIds.get(clientRequestId) });
    // Loopback, as IPv4 or IPv4-mapped IPv6 (RFC 4291 §2.5.5.2).
    expect(event.client.ip).toMatch(/^(::ffff:)?127\.0\.0\.1$/);
    expect(Date.parse(event.at)).toBeGreaterThanOrEqual(started - 5_000);
    expect(Date.parse(event.at)).toBeLessThanOrEqual(Date.now() + 5_000);
  });

  it('keeps the row as written: the reading and its value, and the correction naming what it supersedes', () => {
    expect(one('req-reading', 'measurement.created')).toMatchObject({ entity: { type: 'measurement', id: readingId }, row: { valueEntered: 0.51, takenById: TECH_A } });
    expect(one('req-correction', 'measurement.corrected')).toMatchObject({ entity: { id: correctionId }, row: { valueEntered: 5.01, supersedesId: readingId } });
    expect(one('req-review', 'review.created').row).toMatchObject({ decision: 'approved', comment: 'Splice checked', byId: FOREMAN_A });
  });

  it('names each changed field before → after on an update, and nothing that did not change', () => {
    const patch = one('req-patch', 'repair_order.updated');
    expect(patch.changes).toEqual({ complaint: { before: 'P0122 set', after: 'P0122 set, stalls at idle' } });
    expect(one('req-diagnosing', 'repair_order.updated').changes).toEqual({ status: { before: 'open', after: 'diagnosing' } });
    // Recording a repair moves the order to "repaired" in the same transaction: both writes are in the trail.
    expect(one('req-repair', 'repair_order.updated').changes).toEqual({ status: { before: 'diagnosing', after: 'repaired' } });
    expect(one('req-repair', 'status_change.created').row).toMatchObject({ fromStatus: 'diagnosing', toStatus: 'repaired', byId: TECH_A });
    expect(one('req-verified', 'status_change.created').row).toMatchObject({ fromStatus: 'repaired', toStatus: 'verified' });
  });

  it('does not record a read, nor the bookkeeping touch a new reading makes on its repair order', () => {
    expect(trail.filter((e) => e.client.requestId === serverIds.get('req-reading')).map((e) => e.action)).toEqual(['measurement.created']);
    expect(trail.every((e) => e.action !== 'repair_order.updated' || e.changes !== null)).toBe(true);
  });

  it('pages the trail, oldest first', async () => {
    const first = await api.call('GET', `/api/repair-orders/${roId}/audit?pageSize=3`, { user: FOREMAN_A });
    const second = await api.call('GET', `/api/repair-orders/${roId}/audit?pageSize=3&page=2`, { user: FOREMAN_A });
    expect(first.body).toMatchObject({ page: 1, pageSize: 3, total: trail.length });
    expect(first.body.items.map((e: AuditItem) => e.action)).toEqual(trail.slice(0, 3).map((e) => e.action));
    expect(second.body.items.map((e: AuditItem & { id: string }) => e.id)).toEqual(trail.slice(3, 6).map((e) => (e as AuditItem & { id: string }).id));
    expect(trail[0]!.action).toBe('repair_order.created');
  });

  it.each([
    ['a page size over 200', '?pageSize=500', 'query.pageSize'],
    ['a page of 0', '?page=0', 'query.page'],
    ['an unknown parameter', '?sort=desc', 'query'],
  ])('refuses %s with a 400 naming the parameter', async (_what, query, path) => {
    const res = await api.call('GET', `/api/repair-orders/${roId}/audit${query}`, { user: FOREMAN_A });
    expect(res.status).toBe(400);
    expect(res.body.error.findings.map((f: { path: string }) => f.path)).toContain(path);
  });

  it("answers 404 for another shop's repair order, as for one that does not exist", async () => {
    const other = await api.call('GET', `/api/repair-orders/${roId}/audit`, { user: TECH_B });
    expect(other.status).toBe(404);
    expect(other.body.error.code).toBe('repair_order.not_found');
    expect((await api.call('GET', '/api/repair-orders/00000000-0000-4000-8000-000000000000/audit', { user: FOREMAN_A })).status).toBe(404);
  });

  it.each([
    ['UPDATE', `UPDATE "AuditEvent" SET "action" = 'measurement.deleted'`],
    ['DELETE', `DELETE FROM "AuditEvent"`],
    ['TRUNCATE', `TRUNCATE "AuditEvent"`],
  ])('the database refuses %s on the trail, even straight from SQL', async (_op, sql) => {
    const before = await api.db.prisma.auditEvent.count();
    await expect(api.db.prisma.$executeRawUnsafe(sql)).rejects.toThrow(/append-only/);
    expect(await api.db.prisma.auditEvent.count()).toBe(before);
  });

  it('records a write made without a request (a script) too, with the author from the row', async () => {
    const before = await api.db.prisma.auditEvent.count({ where: { repairOrderId: roId } });
    await api.db.prisma.review.create({ data: { repairOrderId: roId, decision: 'returned', comment: 'by script', byId: FOREMAN_A } });
    const last = await api.db.prisma.auditEvent.findFirst({ where: { repairOrderId: roId }, orderBy: { id: 'desc' } });
    expect(await api.db.prisma.auditEvent.count({ where: { repairOrderId: roId } })).toBe(before + 1);
    expect(last).toMatchObject({ action: 'review.created', userId: FOREMAN_A, ip: null, requestId: null });
  });

  it("records each sign-in with the person and shop, leaving the secret's hash out", async () => {
    const events = await api.db.prisma.auditEvent.findMany({ where: { action: 'sign_in.created', userId: TECH_A } });
    expect(events.length).toBeGreaterThanOrEqual(1);
    expect(events[0]).toMatchObject({ entityType: 'sign_in', userId: TECH_A, repairOrderId: null });
    expect(events[0]!.shopId).toBe((await api.db.prisma.user.findUniqueOrThrow({ where: { id: TECH_A } })).shopId);
    expect(Object.keys(events[0]!.row as object)).not.toContain('secretHash');
  });

  it('keeps the server’s own request id, never one a client chose (a client cannot write another’s id into the trail)', async () => {
    const ids = trail.map((e) => e.client.requestId);
    expect(ids.every((id) => typeof id === 'string' && /^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/.test(id))).toBe(true);
    expect(ids.filter((id) => id!.startsWith('req-'))).toEqual([]);
    // Someone sending the id of an earlier request gets a trail entry under a new id of the server's.
    const victim = serverIds.get('req-patch')!;
    const version = (await api.call('GET', `/api/repair-orders/${roId}`, { user: FOREMAN_A })).body.version;
    const res = await api.call('PATCH', `/api/repair-orders/${roId}`, { user: FOREMAN_A, headers: { 'x-request-id': victim }, body: { version, complaint: 'P0122 set, stalls hot' } });
    expect(res.status).toBe(200);
    expect(res.headers.get('x-request-id')).not.toBe(victim);
    expect(res.headers.get('x-client-request-id')).toBe(victim);
    expect(await api.db.prisma.auditEvent.count({ where: { requestId: victim, repairOrderId: roId } })).toBe(1);
    expect(await api.db.prisma.auditEvent.count({ where: { requestId: res.headers.get('x-request-id')!, action: 'repair_order.updated' } })).toBe(1);
  });

  if (backend === 'postgresql') {
    it('has no UPDATE, DELETE or TRUNCATE granted to PUBLIC on the trail', async () => {
      const rows = await api.db.prisma.$queryRaw<{ privilege_type: string }[]>`
        SELECT privilege_type FROM information_schema.role_table_grants WHERE table_name = 'AuditEvent' AND grantee = 'PUBLIC'`;
      expect(rows.map((r) => r.privilege_type).filter((p) => ['UPDATE', 'DELETE', 'TRUNCATE'].includes(p))).toEqual([]);
    });
  }
});
