import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS } from '../support/db';
import { FOREMAN_A, INACTIVE_A, newVehicle, TECH_A, TECH_A2, TECH_B, VIN_SAMPLE, VIN_TEXTBOOK } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';
import { startInstance, type Instance } from '../support/two-instances';

describe.each(BACKENDS)('repair orders over HTTP on the %s database', (backend) => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startApi(backend);
  });
  afterAll(async () => api?.close());

  const open = (body: Record<string, unknown>, user = FOREMAN_A) => api.call('POST', '/api/repair-orders', { user, body });

  it('opens a repair order with a new vehicle whose VIN passes the 49 CFR 565 check digit', async () => {
    // 1M8GDM9AXKP042788: the textbook VIN with check digit X (49 CFR 565, weighted sum 351).
    const res = await open({ vehicle: newVehicle(), complaint: 'Stalls at idle', codes: ['p0122'], technicianId: TECH_A });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      status: 'open',
      version: 1,
      codes: ['P0122'],
      vehicle: { vin: VIN_TEXTBOOK, checkDigit: 'valid' },
      technician: { id: TECH_A },
      statusLog: [{ from: null, to: 'open', by: { id: FOREMAN_A } }],
    });
    expect(res.body.number).toMatch(/^RO-\d{5}$/);
  });

  it('records a high-voltage system on the vehicle, off unless said, and never unmarks it from a later order', async () => {
    // 9ZZEV12K7R0000017: an invented VIN with a valid 49 CFR 565 check digit (7, computed).
    const plain = await open({ vehicle: newVehicle({ vin: '9ZZEV12K7R0000017' }), complaint: 'MAP code' });
    expect(plain.body.vehicle.highVoltageSystem).toBe(false);
    const hv = await open({ vehicle: newVehicle({ vin: '9ZZEV12K7R0000017', highVoltageSystem: true }), complaint: 'Same car, now known to be a hybrid' });
    expect(hv.body.vehicle).toMatchObject({ id: plain.body.vehicle.id, highVoltageSystem: true });
    const later = await open({ vehicle: newVehicle({ vin: '9ZZEV12K7R0000017' }), complaint: 'Back again' });
    expect(later.body.vehicle.highVoltageSystem).toBe(true);
    const bad = await open({ vehicle: newVehicle({ highVoltageSystem: 'yes' }), complaint: 'x' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.findings[0].path).toBe('body.vehicle.highVoltageSystem');
  });

  it('gives twenty-four orders opened at the same moment twenty-four different numbers', async () => {
    const opened = await Promise.all(Array.from({ length: 24 }, (_, i) => open({ vehicle: newVehicle(), complaint: `Opened at once ${i}` })));
    expect(opened.map((r) => r.status)).toEqual(Array(24).fill(201));
    expect(new Set(opened.map((r) => r.body.number)).size).toBe(24);
  });

  it('does not follow a number typed by hand: automatic numbers have their own sequence', async () => {
    const before = (await open({ vehicle: newVehicle(), complaint: 'Numbered by the service' })).body.number as string;
    expect((await open({ vehicle: newVehicle(), complaint: 'Typed number', number: 'RO-70000' })).status).toBe(201);
    const next = await open({ vehicle: newVehicle(), complaint: 'Numbered by the service again' });
    expect(next.body.number).toBe(`RO-${String(Number(before.slice(3)) + 1).padStart(5, '0')}`);
  });

  it('puts six orders opened at the same moment for one new VIN on one vehicle', async () => {
    // 7XTRA2C18SK000031: made up, check digit 8 by 49 CFR 565 (weighted sum 239 = 21 × 11 + 8).
    const vin = '7XTRA2C18SK000031';
    const opened = await Promise.all(Array.from({ length: 6 }, (_, i) => open({ vehicle: newVehicle({ vin }), complaint: `Same car ${i}` })));
    expect(opened.map((r) => r.status)).toEqual(Array(6).fill(201));
    expect(new Set(opened.map((r) => r.body.vehicle.id)).size).toBe(1);
  });

  it('refuses a VIN whose check digit does not match, naming the field and the expected digit', async () => {
    // 1M8GDM9A1KP042788: the textbook VIN with a wrong check digit (49 CFR 565 computes X).
    const res = await open({ vehicle: newVehicle({ vin: '1M8GDM9A1KP042788' }), complaint: 'No start' });
    expect(res.status).toBe(400);
    expect(res.body.error.findings).toEqual([
      expect.objectContaining({ path: 'body.vehicle.vin', message: expect.stringContaining("'X'") }),
    ]);
  });

  it('accepts that VIN when the vehicle is marked as built for outside North America', async () => {
    const res = await open({ vehicle: newVehicle({ vin: '1M8GDM9A1KP042788', builtOutsideNorthAmerica: true }), complaint: 'No start' });
    expect(res.status).toBe(201);
    expect(res.body.vehicle.checkDigit).toBe('not_applicable');
  });

  it.each([
    ['a VIN with the letter O', 'body.vehicle.vin', { vehicle: newVehicle({ vin: '1M8GDM9AXKPO42788' }), complaint: 'x' }],
    ['a 16-character VIN', 'body.vehicle.vin', { vehicle: newVehicle({ vin: '1M8GDM9AXKP04278' }), complaint: 'x' }],
    ['a trouble code not in SAE J2012 form', 'body.codes.0', { vehicle: newVehicle(), complaint: 'x', codes: ['P01222'] }],
    ['a trouble code with a first digit above 3', 'body.codes.0', { vehicle: newVehicle(), complaint: 'x', codes: ['P4122'] }],
    ['an empty complaint', 'body.complaint', { vehicle: newVehicle(), complaint: '  ' }],
    ['an unknown field', 'body', { vehicle: newVehicle(), complaint: 'x', colour: 'red' }],
    ['both a vehicle and a vehicleId', 'body.vehicle', { vehicle: newVehicle(), vehicleId: TECH_A, complaint: 'x' }],
    ['a negative odometer', 'body.vehicle.odometer', { vehicle: newVehicle({ odometer: -1 }), complaint: 'x' }],
    ['a technician of another shop', 'body.technicianId', { vehicle: newVehicle(), complaint: 'x', technicianId: TECH_B }],
    ['an inactive technician', 'body.technicianId', { vehicle: newVehicle(), complaint: 'x', technicianId: INACTIVE_A }],
    ['a foreman as the assigned technician', 'body.technicianId', { vehicle: newVehicle(), complaint: 'x', technicianId: FOREMAN_A }],
  ])('refuses %s with a 400 at %s', async (_name, path, body) => {
    const before = await api.db.prisma.repairOrder.count();
    const res = await open(body);
    expect(res.status).toBe(400);
    expect(res.body.error.findings.map((f: { path: string }) => f.path)).toContain(path);
    expect(await api.db.prisma.repairOrder.count()).toBe(before);
  });

  it('refuses a repair order number already used in the shop with a 409, whatever its case', async () => {
    expect((await open({ number: 't-100', vehicle: newVehicle({ vin: VIN_SAMPLE }), complaint: 'x' })).status).toBe(201);
    const again = await open({ number: 'T-100', vehicle: newVehicle({ vin: VIN_SAMPLE }), complaint: 'y' });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('repair_order.number_taken');
  });

  it('reuses the vehicle already on file for the same VIN', async () => {
    const a = await open({ vehicle: newVehicle({ vin: VIN_SAMPLE }), complaint: 'first visit' });
    const b = await open({ vehicle: newVehicle({ vin: VIN_SAMPLE }), complaint: 'second visit' });
    expect(b.body.vehicle.id).toBe(a.body.vehicle.id);
  });

  it('moves along the status chain and refuses a skipped step with a 409 listing the allowed moves', async () => {
    const ro = (await open({ vehicle: newVehicle(), complaint: 'chain', technicianId: TECH_A })).body;
    const move = (to: string, reason?: string) => api.call('POST', `/api/repair-orders/${ro.id}/status`, { user: TECH_A, body: { to, ...(reason ? { reason } : {}) } });
    const skip = await move('verified');
    expect(skip.status).toBe(409);
    expect(skip.body.error).toMatchObject({ code: 'status.illegal_move', from: 'open', allowed: expect.arrayContaining(['diagnosing']) });
    expect((await move('diagnosing')).status).toBe(200);
    const unrepaired = await move('repaired');
    expect(unrepaired.status).toBe(409);
    expect(unrepaired.body.error.code).toBe('status.repair_not_recorded');
    await api.call('POST', `/api/repair-orders/${ro.id}/repairs`, { user: TECH_A, body: { part: 'connector', action: 'Re-pinned the sensor connector' } });
    expect((await move('verified')).status).toBe(200);
    const unapproved = await move('closed');
    expect(unapproved.body.error).toMatchObject({ code: 'status.not_approved', latestDecision: null });
    expect((await api.call('POST', `/api/repair-orders/${ro.id}/reviews`, { user: FOREMAN_A, body: { decision: 'approved' } })).status).toBe(201);
    expect((await move('closed')).status).toBe(200);
    const noReason = await move('diagnosing');
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.findings[0].path).toBe('body.reason');
    const reopened = await move('diagnosing', 'Customer back: code returned after two days');
    expect(reopened.status).toBe(200);
    expect(reopened.body.statusLog.map((s: { to: string }) => s.to)).toEqual(['open', 'diagnosing', 'repaired', 'verified', 'closed', 'diagnosing']);
    expect(reopened.body.dates.repaired).not.toBeNull();
  });

  it('refuses an update made against a stale version with a 409 saying what it is now', async () => {
    const ro = (await open({ vehicle: newVehicle(), complaint: 'versions', technicianId: TECH_A })).body;
    const first = await api.call('PATCH', `/api/repair-orders/${ro.id}`, { user: TECH_A, body: { version: 1, cause: 'Chafed signal wire' } });
    expect(first.status).toBe(200);
    expect(first.body.version).toBe(2);
    const stale = await api.call('PATCH', `/api/repair-orders/${ro.id}`, { user: TECH_A, body: { version: 1, cause: 'Something else' } });
    expect(stale.status).toBe(409);
    expect(stale.body.error).toMatchObject({ code: 'repair_order.stale_version', currentVersion: 2 });
    expect((await api.call('GET', `/api/repair-orders/${ro.id}`, { user: TECH_A })).body.cause).toBe('Chafed signal wire');
  });

  it('lists with filters by status and technician, and pages', async () => {
    await open({ vehicle: newVehicle(), complaint: 'for the list', technicianId: TECH_A });
    const mine = await api.call('GET', `/api/repair-orders?technicianId=${TECH_A}&status=open,diagnosing&pageSize=1`, { user: TECH_A });
    expect(mine.status).toBe(200);
    expect(mine.body.items).toHaveLength(1);
    expect(mine.body.total).toBeGreaterThanOrEqual(1);
    expect(mine.body.items[0].technician.id).toBe(TECH_A);
    const wildcard = await api.call('GET', '/api/repair-orders?q=%25', { user: TECH_A });
    expect(wildcard.body.items).toEqual([]);
    const bad = await api.call('GET', '/api/repair-orders?status=finished', { user: TECH_A });
    expect(bad.status).toBe(400);
    expect(bad.body.error.findings[0].path).toMatch(/^query\.status/);
  });

  it('shows a technician only the orders they opened or are assigned to; the foreman sees all', async () => {
    const colleague = (await open({ vehicle: newVehicle(), complaint: 'assigned to a colleague', technicianId: TECH_A2 })).body;
    expect((await api.call('GET', `/api/repair-orders/${colleague.id}`, { user: TECH_A })).status).toBe(404);
    expect((await api.call('GET', `/api/repair-orders/${colleague.id}`, { user: TECH_A2 })).status).toBe(200);
    expect((await api.call('GET', `/api/repair-orders/${colleague.id}`, { user: FOREMAN_A })).status).toBe(200);
    const mine = (await api.call('GET', '/api/repair-orders?pageSize=200', { user: TECH_A })).body.items as Array<{ id: string }>;
    expect(mine.map((o) => o.id)).not.toContain(colleague.id);
    const own = (await open({ vehicle: newVehicle(), complaint: 'opened by the technician' }, TECH_A)).body;
    expect((await api.call('GET', `/api/repair-orders/${own.id}`, { user: TECH_A })).status).toBe(200);
  });

  it('hides another shop’s repair orders behind a 404', async () => {
    const ro = (await open({ vehicle: newVehicle(), complaint: 'private' })).body;
    expect((await api.call('GET', `/api/repair-orders/${ro.id}`, { user: TECH_B })).status).toBe(404);
    const list = await api.call('GET', '/api/repair-orders', { user: TECH_B });
    expect(list.body.items).toEqual([]);
  });

  it('asks for the user header, and answers a malformed id with a 400 and an unknown one with a 404', async () => {
    expect((await api.call('GET', '/api/repair-orders')).status).toBe(401);
    expect((await api.call('GET', '/api/repair-orders/not-a-uuid', { user: TECH_A })).body.error.findings[0].path).toBe('params.id');
    expect((await api.call('GET', '/api/repair-orders/00000000-0000-4000-8000-000000000000', { user: TECH_A })).status).toBe(404);
  });
});

describe.runIf(BACKENDS.includes('postgresql'))('opening orders at the same moment on two instances of one PostgreSQL database', () => {
  let api: TestApi;
  let a: Instance;
  let b: Instance;
  beforeAll(async () => {
    api = await startApi('postgresql');
    [a, b] = [await startInstance(api), await startInstance(api)];
  });
  afterAll(async () => {
    await Promise.all([a?.close(), b?.close()]);
    await api?.close();
  });

  const openOn = (instance: Instance, body: Record<string, unknown>) => instance.call('POST', '/api/repair-orders', { user: FOREMAN_A, body });

  it('gives sixteen orders spread over both instances sixteen different numbers', async () => {
    const opened = await Promise.all(Array.from({ length: 16 }, (_, i) => openOn(i % 2 ? a : b, { vehicle: newVehicle(), complaint: `Two instances ${i}` })));
    expect(opened.map((r) => r.status)).toEqual(Array(16).fill(201));
    expect(new Set(opened.map((r) => r.body.number)).size).toBe(16);
  });

  it('puts orders opened on both instances for one new VIN on one vehicle', async () => {
    // 7XTRA2C11SK000047: made up, check digit 1 by 49 CFR 565 (weighted sum 254 = 23 × 11 + 1).
    const vin = '7XTRA2C11SK000047';
    const opened = await Promise.all(Array.from({ length: 8 }, (_, i) => openOn(i % 2 ? a : b, { vehicle: newVehicle({ vin }), complaint: `Same car, two instances ${i}` })));
    expect(opened.map((r) => r.status)).toEqual(Array(8).fill(201));
    expect(new Set(opened.map((r) => r.body.vehicle.id)).size).toBe(1);
  });
});
