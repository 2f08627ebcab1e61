import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { checkVin } from '../../src/engine/vin';
import { DEMO_ORDERS, DEMO_ORDERS_TWO, DEMO_USERS, FOREMAN, FOREMAN_TWO, TECH_TWO, TEO } from '../../src/demo/scenario';
import { DEMO_SIGN_INS, seedDemo } from '../../src/demo/seed';
import { checkPassword } from '../../src/modules/auth/password-rules';
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
    const res = await fetch(`${api.url}/api/repair-orders/${job.id}/proof.pdf`, { headers: await api.authHeaders(TEO) });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('application/pdf');
  });

  it('has its closed job approved on the evidence as it stands, not stale', async () => {
    const list = (await api.call('GET', '/api/repair-orders?status=closed', { user: FOREMAN })).body.items as Array<{ id: string; number: string }>;
    const job = list.find((o) => o.number === 'KR-24029')!;
    const approval = (await api.call('GET', `/api/repair-orders/${job.id}/approval`, { user: FOREMAN })).body;
    expect(approval).toMatchObject({ state: 'approved' });
    expect(approval.evidenceDigest).toBe(approval.currentEvidenceDigest);
  });

  it('signs every demo person in with the printed password, each passing the NIST SP 800-63B §5.1.1.2 rules', async () => {
    for (const u of DEMO_SIGN_INS) {
      expect(checkPassword(u.password, { email: u.email, name: u.name, shopName: u.shop }), u.email).toEqual([]);
      const res = await api.call('POST', '/api/auth/sign-in', { body: { email: u.email, password: u.password } });
      expect(res.status, u.email).toBe(200);
      expect(res.body.user.role).toBe(u.role);
    }
  });

  it.each([
    ['the first shop’s foreman', FOREMAN, DEMO_ORDERS.map((o) => o.number)],
    // A technician sees the orders they opened or are assigned to, never another shop's.
    ['the first shop’s technician', TEO, DEMO_ORDERS.filter((o) => o.technician === TEO).map((o) => o.number)],
    ['the second shop’s foreman', FOREMAN_TWO, DEMO_ORDERS_TWO.map((o) => o.number)],
    ['the second shop’s technician', TECH_TWO, DEMO_ORDERS_TWO.filter((o) => o.technician === TECH_TWO).map((o) => o.number)],
  ])('shows %s only the repair orders of their own shop they may see', async (_who, user, own) => {
    const list = (await api.call('GET', '/api/repair-orders?pageSize=50', { user })).body.items as Array<{ number: string }>;
    expect(list.map((o) => o.number).sort()).toEqual([...own].sort());
  });
});
