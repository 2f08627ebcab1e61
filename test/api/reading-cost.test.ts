/**
 * What one reading costs the database: a tablet posts every reading with `?diagnosis=true`, so this request is the
 * service's hot path. Counted at the driver on both back ends, once the caller's token has been seen.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS } from '../support/db';
import { ADMIN_A, newVehicle, TECH_A, TECH_A2 } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';
import { statementsDuring } from '../support/statements';
import { startInstance, type Instance } from '../support/two-instances';

const MOST_STATEMENTS = 3;

describe.each(BACKENDS)('the cost of a reading on the %s database', (backend) => {
  let api: TestApi;

  beforeAll(async () => {
    api = await startApi(backend);
  });
  afterAll(async () => api?.close());

  async function newJob(user = TECH_A) {
    const ro = await api.call('POST', '/api/repair-orders', { user, body: { vehicle: newVehicle(), complaint: 'P0107 set', codes: ['P0107'] } });
    expect(ro.status).toBe(201);
    const circuit = await api.call('POST', `/api/repair-orders/${ro.body.id}/circuits`, { user, body: { kind: 'three_wire_5v', sensor: 'MAP', label: 'MAP sensor' } });
    expect(circuit.status).toBe(201);
    const first = await api.call('GET', `/api/repair-orders/${ro.body.id}/circuits/${circuit.body.id}/diagnosis`, { user });
    return { roId: ro.body.id as string, circuitId: circuit.body.id as string, next: first.body.nextTest };
  }

  const post = (job: { roId: string; circuitId: string }, next: { request: Record<string, unknown> }, value: number, user = TECH_A) =>
    api.call('POST', `/api/repair-orders/${job.roId}/measurements?diagnosis=true`, { user, body: { circuitId: job.circuitId, ...next.request, value, unit: next.request.quantity === 'ohms' ? 'ohm' : 'V' } });

  it(`sends at most ${MOST_STATEMENTS} statements for an order's first reading with its diagnosis, and moves the order to diagnosing`, async () => {
    const job = await newJob();
    let res: Awaited<ReturnType<typeof post>> | undefined;
    const sent = await statementsDuring(async () => {
      res = await post(job, job.next, 4.98);
    });
    expect(res!.status).toBe(201);
    expect(res!.body.diagnoses).toHaveLength(1);
    expect(sent.length, sent.join('\n---\n')).toBeLessThanOrEqual(MOST_STATEMENTS);
    const order = await api.call('GET', `/api/repair-orders/${job.roId}`, { user: TECH_A });
    expect(order.body.status).toBe('diagnosing');
    expect(order.body.statusLog.map((s: { from: string | null; to: string; reason: string }) => [s.from, s.to, s.reason])).toEqual([
      [null, 'open', expect.any(String)],
      ['open', 'diagnosing', 'first reading recorded'],
    ]);
  });

  it(`sends at most ${MOST_STATEMENTS} statements for a follow-up reading with its diagnosis, which counts every reading so far`, async () => {
    const job = await newJob();
    const first = await post(job, job.next, 4.98);
    expect(first.status).toBe(201);
    const next = first.body.diagnoses[0].nextTest;
    let res: Awaited<ReturnType<typeof post>> | undefined;
    const sent = await statementsDuring(async () => {
      res = await post(job, next, 0.02);
    });
    expect(res!.status).toBe(201);
    expect(sent.length, sent.join('\n---\n')).toBeLessThanOrEqual(MOST_STATEMENTS);
    const diagnosis = await api.call('GET', `/api/repair-orders/${job.roId}/circuits/${job.circuitId}/diagnosis`, { user: TECH_A });
    expect(res!.body.diagnoses[0]).toEqual({ circuitId: job.circuitId, ...diagnosis.body });
    expect(diagnosis.body.path).toHaveLength(2);
  });

  describe('with a second instance of the service on the same database', () => {
    let other: Instance;
    beforeAll(async () => {
      other = await startInstance(api);
    });
    afterAll(async () => other?.close());

    it('refuses a reading on one instance at once after its token was signed out on the other', async () => {
      const job = await newJob();
      const signIn = await api.call('POST', '/api/auth/sign-in', { body: { email: 'one@a.test', password: 'gravel path under seven lamps' } });
      const headers = { authorization: `Bearer ${signIn.body.token}` };
      const body = (value: number) => ({ circuitId: job.circuitId, ...job.next.request, value, unit: 'V' });
      // The other instance has seen the token: it answered a reading with it.
      expect((await other.call('POST', `/api/repair-orders/${job.roId}/measurements?diagnosis=true`, { headers, body: body(4.98) })).status).toBe(201);
      expect((await api.call('POST', '/api/auth/sign-out', { headers })).status).toBe(200);
      // A request its route's pipes would refuse before the handler runs gets the 401 too, not a 400.
      expect((await other.call('POST', `/api/repair-orders/${job.roId}/measurements?diagnosis=yes`, { headers, body: body(4.97) })).status).toBe(401);
      const after = await other.call('POST', `/api/repair-orders/${job.roId}/measurements?diagnosis=true`, { headers, body: body(4.97) });
      expect(after.status).toBe(401);
      const readings = await api.call('GET', `/api/repair-orders/${job.roId}/measurements`, { user: TECH_A });
      expect(readings.body.items).toHaveLength(1);
    });

    it('counts readings let through on a cached sign-in against the write budget: an invalid one too, and the fourth is refused with 429', async () => {
      const limited = await startInstance(api, { TRACEBAY_WRITE_LIMIT: '3', TRACEBAY_WRITE_WINDOW_SECONDS: '3599' });
      try {
        const job = await newJob(ADMIN_A);
        const body = (value: unknown) => ({ circuitId: job.circuitId, ...job.next.request, value, unit: 'V' });
        const send = (value: unknown) => limited.call('POST', `/api/repair-orders/${job.roId}/measurements?diagnosis=true`, { user: ADMIN_A, body: body(value) });
        const statuses = [(await send(4.98)).status, (await send(4.97)).status, (await send('five volts')).status];
        expect(statuses).toEqual([201, 201, 400]);
        const refused = await send(4.96);
        expect(refused.status).toBe(429);
        expect(refused.body.error).toMatchObject({ code: 'rate_limit.writes' });
        expect(Number(refused.headers.get('retry-after'))).toBeGreaterThanOrEqual(1);
      } finally {
        await limited.close();
      }
    });

    it('refuses a reading on one instance at once after the person was deactivated on the other', async () => {
      const job = await newJob(TECH_A2);
      const body = (value: number) => ({ circuitId: job.circuitId, ...job.next.request, value, unit: 'V' });
      expect((await other.call('POST', `/api/repair-orders/${job.roId}/measurements?diagnosis=true`, { user: TECH_A2, body: body(4.98) })).status).toBe(201);
      expect((await api.call('POST', `/api/users/${TECH_A2}/deactivate`, { user: ADMIN_A })).status).toBe(200);
      const after = await other.call('POST', `/api/repair-orders/${job.roId}/measurements?diagnosis=true`, { user: TECH_A2, body: body(4.97) });
      expect(after.status).toBe(401);
    });
  });
});
