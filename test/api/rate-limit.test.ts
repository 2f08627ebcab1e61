// Rate limits on writes (per user) and on sign-in (per client address and per email address), counted in the
// database so that every instance draws on one budget; over budget → 429 with Retry-After (RFC 6585 §4,
// RFC 9110 §10.2.3). Instances here get small budgets through configuration; the window lengths are unusual so
// that nothing else in the file shares their counters.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../src/config/config';
import { BACKENDS } from '../support/db';
import { FOREMAN_A, newVehicle, TECH_A, TECH_A2 } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';
import { startInstance, type Instance } from '../support/two-instances';

const LIMITS = {
  TRACEBAY_WRITE_LIMIT: '3',
  TRACEBAY_WRITE_WINDOW_SECONDS: '3599',
  TRACEBAY_SIGN_IN_LIMIT_IP: '5',
  TRACEBAY_SIGN_IN_LIMIT_EMAIL: '2',
  TRACEBAY_SIGN_IN_WINDOW_SECONDS: '3598',
};

describe('rate-limit configuration', () => {
  it('is generous by default and can be turned off with 0', () => {
    const defaults = loadConfig({}).rateLimits;
    expect(defaults.writesPerUser).toBeGreaterThanOrEqual(1000);
    expect(loadConfig({ TRACEBAY_WRITE_LIMIT: '0' }).rateLimits.writesPerUser).toBe(0);
  });

  it.each([
    ['TRACEBAY_WRITE_LIMIT', '-1'],
    ['TRACEBAY_WRITE_WINDOW_SECONDS', '0'],
    ['TRACEBAY_SIGN_IN_LIMIT_EMAIL', 'many'],
  ])('refuses %s=%s, naming the variable', (name, value) => {
    expect(() => loadConfig({ [name]: value })).toThrow(new RegExp(name));
  });
});

describe.each(BACKENDS)('rate limits on the %s database', (backend) => {
  let api: TestApi;
  let limited: Instance;
  let roId: string;

  beforeAll(async () => {
    api = await startApi(backend);
    roId = (await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'P0107 set', technicianId: TECH_A } })).body.id;
    // Sign the people in through the main instance first, so only this file's own attempts count on the limited one.
    for (const user of [TECH_A, TECH_A2]) await api.call('GET', '/api/repair-orders', { user });
    limited = await startInstance(api, LIMITS);
  });
  afterAll(async () => {
    await limited?.close();
    await api?.close();
  });

  const patchCause = (user: string, call = limited.call) => async () => {
    const version = (await call('GET', `/api/repair-orders/${roId}`, { user })).body.version;
    return call('PATCH', `/api/repair-orders/${roId}`, { user, body: { version, cause: `checked ${Math.random()}` } });
  };

  it("answers a user's fourth write in the window with 429, Retry-After and a coded error; reads and other users go on", async () => {
    const write = patchCause(TECH_A);
    const statuses = [];
    for (let i = 0; i < 4; i++) statuses.push(await write());
    expect(statuses.map((r) => r.status)).toEqual([200, 200, 200, 429]);
    const refused = statuses[3]!;
    expect(refused.body.error).toMatchObject({ code: 'rate_limit.writes' });
    expect(refused.body.error.message).toMatch(/at most 3 in 3599 s/);
    const retryAfter = Number(refused.headers.get('retry-after'));
    expect(retryAfter).toBeGreaterThanOrEqual(1);
    expect(retryAfter).toBeLessThanOrEqual(3599);
    expect((await limited.call('GET', `/api/repair-orders/${roId}`, { user: TECH_A })).status).toBe(200);
    expect((await patchCause(FOREMAN_A)()).status).toBe(200);
  });

  it('does not count the same writes on an instance configured with other limits', async () => {
    expect((await patchCause(TECH_A, api.call)()).status).toBe(200);
  });

  it('limits sign-in attempts per email address, then per client address, whatever the answer', async () => {
    const signIn = (email: string) => limited.call('POST', '/api/auth/sign-in', { body: { email, password: 'not the password at all' } });
    const sameEmail = [];
    for (let i = 0; i < 3; i++) sameEmail.push((await signIn('nobody@a.test')).status);
    expect(sameEmail.slice(0, 2)).not.toContain(429);
    expect(sameEmail[2]).toBe(429);
    // Five attempts from this address so far counted… the sixth is over the address's budget, for any email.
    const others = [];
    for (let i = 0; i < 3; i++) others.push(await signIn(`someone-${i}@a.test`));
    expect(others.slice(0, 2).map((r) => r.status)).not.toContain(429);
    expect(others[2]!.status).toBe(429);
    expect(others[2]!.body.error.code).toBe('rate_limit.sign_in');
    expect(Number(others[2]!.headers.get('retry-after'))).toBeGreaterThanOrEqual(1);
  });

  it("counts the pages' sign-in form in the same budgets as the API, and answers over budget with a page, 429 and Retry-After", async () => {
    // Its own window length, so the attempts above (this address is over its budget there) do not count here.
    const own = await startInstance(api, { ...LIMITS, TRACEBAY_SIGN_IN_WINDOW_SECONDS: '3597' });
    try {
      const email = 'form@a.test';
      const form = await own.call('GET', '/sign-in');
      const cookie = form.headers.getSetCookie().map((c) => c.split(';')[0]!).join('; ');
      const token = /name="_csrf" value="([^"]+)"/.exec(form.body as string)![1]!;
      const viaForm = () =>
        own.call('POST', '/sign-in', {
          raw: new URLSearchParams({ _csrf: token, email, password: 'not the password at all' }).toString(),
          headers: { 'content-type': 'application/x-www-form-urlencoded', cookie },
        });
      const viaApi = () => own.call('POST', '/api/auth/sign-in', { body: { email, password: 'not the password at all' } });
      expect([(await viaForm()).status, (await viaApi()).status]).toEqual([401, 401]);
      const refused = await viaForm();
      expect(refused.status).toBe(429);
      expect(refused.headers.get('content-type')).toContain('text/html');
      expect(refused.body as string).toContain('<h1>Too many tries</h1>');
      expect(refused.body as string).toMatch(/Too many sign-in attempts for this account: at most 2 in 3597 s\. Try again in \d+ min\./);
      expect(Number(refused.headers.get('retry-after'))).toBeGreaterThanOrEqual(1);
    } finally {
      await own.close();
    }
  });
});

describe.runIf(BACKENDS.includes('postgresql'))('rate limits across two instances on one PostgreSQL database', () => {
  let api: TestApi;
  let a: Instance;
  let b: Instance;
  let roId: string;

  beforeAll(async () => {
    api = await startApi('postgresql');
    roId = (await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'P0452 set', technicianId: TECH_A } })).body.id;
    await api.call('GET', '/api/repair-orders', { user: TECH_A });
    a = await startInstance(api, LIMITS);
    b = await startInstance(api, LIMITS);
  });
  afterAll(async () => {
    await Promise.all([a?.close(), b?.close()]);
    await api?.close();
  });

  it('shares one write budget: three writes spread over both, the fourth refused by either', async () => {
    const write = async (instance: Instance) => {
      const version = (await instance.call('GET', `/api/repair-orders/${roId}`, { user: TECH_A })).body.version;
      return (await instance.call('PATCH', `/api/repair-orders/${roId}`, { user: TECH_A, body: { version, correction: `step ${Math.random()}` } })).status;
    };
    expect([await write(a), await write(b), await write(a)]).toEqual([200, 200, 200]);
    expect([await write(b), await write(a)]).toEqual([429, 429]);
  });

  it('counts the sign-in route however its path is spelled (routing ignores case and a trailing slash)', async () => {
    const email = 'spelled@a.test';
    const paths = ['/api/auth/sign-in', '/API/Auth/Sign-In', '/api/auth/sign-in/'];
    const statuses = [];
    for (const path of paths) statuses.push((await a.call('POST', path, { body: { email, password: 'not the password at all' } })).status);
    expect(statuses.slice(0, 2)).not.toContain(429);
    expect(statuses[2]).toBe(429);
  });

  it('shares the sign-in budget of an email address across instances', async () => {
    const signIn = (instance: Instance) => instance.call('POST', '/api/auth/sign-in', { body: { email: 'shared@a.test', password: 'not the password at all' } });
    const statuses = [(await signIn(a)).status, (await signIn(b)).status, (await signIn(a)).status];
    expect(statuses.slice(0, 2)).not.toContain(429);
    expect(statuses[2]).toBe(429);
  });
});
