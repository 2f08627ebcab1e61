import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { checkVin } from '../../src/engine/vin';
import { DEMO_ORDERS, DEMO_USERS, FOREMAN, TEO } from '../../src/demo/scenario';
import { seedDemo } from '../../src/demo/seed';
import { BACKENDS } from '../support/db';
import { startApi, type TestApi } from '../support/http';

describe.each(BACKENDS)('the demo shop on the %s database', (backend) => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startApi(backend, { fixtures: false });
    expect(await seedDemo(api.db.prisma)).toBe('seeded');
  });
  afterAll(async () => api?.close());

  it('is seeded once: a second start leaves it as it is', async () => {
    expect(await seedDemo(api.db.prisma)).toBe('already_present');
  });

  it('has repair orders in every state, all with VINs whose 49 CFR 565 check digit is valid', async () => {
    const list = (await api.call('GET', '/api/repair-orders?pageSize=50', { user: FOREMAN })).body.items as Array<{ number: string; status: string; vehicle: { vin: string } }>;
    const demo = list.filter((o) => DEMO_ORDERS.some((d) => d.number === o.number));
    expect(new Set(demo.map((o) => o.status))).toEqual(new Set(['open', 'diagnosing', 'verified', 'closed']));
    for (const o of demo) expect(checkVin(o.vehicle.vin)).toMatchObject({ ok: true, checkDigit: 'valid' });
    expect(DEMO_USERS.map((u) => u.role)).toEqual(expect.arrayContaining(['technician', 'foreman', 'admin']));
  });

  it('has a verified job with a diagnostic path and a proof that renders', async () => {
    const list = (await api.call('GET', '/api/repair-orders?status=verified', { user: TEO })).body.items as Array<{ id: string; number: string }>;
    const job = list.find((o) => o.number === 'KR-24031')!;
    const ro = (await api.call('GET', `/api/repair-orders/${job.id}`, { user: TEO })).body;
    const diagnosis = (await api.call('GET', `/api/repair-orders/${job.id}/circuits/${ro.circuits[0].id}/diagnosis`, { user: TEO })).body;
    expect(diagnosis.path.length).toBeGreaterThan(3);
    const res = await fetch(`${api.url}/api/repair-orders/${job.id}/proof.pdf`, { headers: { 'x-tracebay-user': TEO } });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('application/pdf');
  });
});
