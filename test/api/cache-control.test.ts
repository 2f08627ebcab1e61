// Every API answer may carry personal data (names, vehicles, readings), so none may be kept by a browser or proxy:
// each operation of the OpenAPI document is called signed in, and its answer must say `Cache-Control: no-store`,
// whatever its status (an error names people and orders too).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS } from '../support/db';
import { FOREMAN_A, newVehicle, TECH_A } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';

describe.each(BACKENDS)('no API answer may be cached, on the %s database', (backend) => {
  let api: TestApi;
  let roId: string;
  let ops: Array<{ method: string; path: string }> = [];

  beforeAll(async () => {
    api = await startApi(backend);
    const ro = await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'P0122 set', technicianId: TECH_A } });
    expect(ro.status).toBe(201);
    roId = ro.body.id;
    const doc = (await api.call('GET', '/api/openapi.json')).body as { paths: Record<string, Record<string, unknown>> };
    ops = Object.entries(doc.paths).flatMap(([path, methods]) => Object.keys(methods).map((method) => ({ method: method.toUpperCase(), path })));
  });
  afterAll(async () => api?.close());

  it('sends no-store on every operation of the API, answered by a signed-in foreman', async () => {
    expect(ops.length).toBeGreaterThan(20);
    const missing: string[] = [];
    for (const op of ops) {
      if (op.path === '/api/auth/sign-out') continue; // would end the session the walk uses
      const path = op.path.replace(/\{[^}]+\}/g, (p) => (p === '{id}' ? roId : '00000000-0000-4000-8000-000000000000'));
      const res = await api.call(op.method, path, { user: FOREMAN_A, ...(op.method === 'GET' ? {} : { body: {} }) });
      if (!/\bno-store\b/.test(res.headers.get('cache-control') ?? '')) missing.push(`${op.method} ${op.path} → ${res.status} ${res.headers.get('cache-control')}`);
    }
    expect(missing).toEqual([]);
  });

  it.each([
    ['an order signed in', 'GET', () => `/api/repair-orders/${roId}`, FOREMAN_A, 200],
    ['who am I', 'GET', () => '/api/me', TECH_A, 200],
    ['a sign-in with its token', 'POST', () => '/api/auth/sign-in', undefined, 400],
    ['an answer without a sign-in', 'GET', () => '/api/repair-orders', undefined, 401],
    ['an unknown API address', 'GET', () => '/api/nothing-here', TECH_A, 404],
  ])('sends no-store on %s', async (_what, method, path, user, status) => {
    const res = await api.call(method, path(), { user, ...(method === 'POST' ? { body: {} } : {}) });
    expect(res.status).toBe(status);
    expect(res.headers.get('cache-control')).toBe('no-store');
  });
});
