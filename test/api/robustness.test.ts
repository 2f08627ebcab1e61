import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS } from '../support/db';
import { FOREMAN_A, newVehicle, TECH_A } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';

/** Statuses a well-behaved endpoint may answer to any body; a 500 is never among them. */
const EXPECTED = new Set([200, 201, 400, 404, 409, 413]);

describe.each(BACKENDS)('random and malformed input on the %s database', (backend) => {
  let api: TestApi;
  let roId: string;
  let circuitId: string;

  beforeAll(async () => {
    api = await startApi(backend);
    roId = (await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'fuzz target' } })).body.id;
    circuitId = (
      await api.call('POST', `/api/repair-orders/${roId}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'MAP', label: 'MAP' } })
    ).body.id;
  });
  afterAll(async () => api?.close());

  const valid = () => ({
    'POST /api/repair-orders': { vehicle: newVehicle(), complaint: 'random', codes: ['P0107'] },
    [`PATCH /api/repair-orders/${roId}`]: { version: 1, cause: 'random' },
    [`POST /api/repair-orders/${roId}/status`]: { to: 'diagnosing' },
    [`POST /api/repair-orders/${roId}/circuits`]: { kind: 'three_wire_5v', sensor: 'TP', label: 'TP 2', cavities: { A: 'signal' } },
    [`POST /api/repair-orders/${roId}/measurements`]: {
      circuitId, quantity: 'dc_volts', at: 'reference', against: 'ground', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', value: 5, unit: 'V',
    },
  });

  /** A valid body with one field replaced by anything at all, or dropped. */
  const mutated = (base: Record<string, unknown>) =>
    fc.tuple(fc.constantFrom(...Object.keys(base)), fc.option(fc.jsonValue(), { nil: undefined })).map(([key, value]) => ({ ...base, [key]: value }));

  it('never answers a random body on any write endpoint with a 500', async () => {
    const endpoints = Object.entries(valid());
    const body = fc.oneof(fc.jsonValue(), fc.anything(), ...endpoints.map(([, b]) => mutated(b as Record<string, unknown>)));
    await fc.assert(
      fc.asyncProperty(fc.constantFrom(...endpoints.map(([e]) => e)), body, async (endpoint, payload) => {
        const [method, path] = endpoint.split(' ');
        let raw: string;
        try {
          raw = JSON.stringify(payload) ?? 'null';
        } catch {
          raw = '{';
        }
        const res = await api.call(method, path, { user: TECH_A, raw });
        if (!EXPECTED.has(res.status)) throw new Error(`${endpoint} answered ${res.status} to ${raw.slice(0, 200)}: ${JSON.stringify(res.body)}`);
        if (res.status >= 400) expect(res.body.error.code).toEqual(expect.any(String));
      }),
      { numRuns: 300, seed: 20261201 },
    );
  });

  it.each([
    ['malformed JSON', '{"complaint": ', 400, 'body.malformed'],
    ['a JSON string instead of an object', '"hello"', 400, 'invalid_input'],
    ['null', 'null', 400, 'invalid_input'],
  ])('answers %s with %i', async (_name, raw, status, code) => {
    const res = await api.call('POST', '/api/repair-orders', { user: TECH_A, raw });
    expect(res.status).toBe(status);
    expect(res.body.error.code).toBe(code);
  });

  it('answers a body over the size limit with a 413 and stores nothing', async () => {
    const before = await api.db.prisma.repairOrder.count();
    const res = await api.call('POST', '/api/repair-orders', { user: TECH_A, body: { vehicle: newVehicle(), complaint: 'x'.repeat(2_000_000) } });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('body.too_large');
    expect(await api.db.prisma.repairOrder.count()).toBe(before);
  });

  it('gives every response the server’s own request id and keeps a sane one sent by the client beside it', async () => {
    const res = await api.call('GET', '/api/health', { headers: { 'x-request-id': 'tablet-7-000123' } });
    expect(res.headers.get('x-request-id')).toMatch(/^[0-9a-f-]{36}$/);
    expect(res.headers.get('x-client-request-id')).toBe('tablet-7-000123');
    const insane = await api.call('GET', '/api/health', { headers: { 'x-request-id': 'a b<c>' } });
    expect(insane.headers.get('x-client-request-id')).toBeNull();
    const bad = await api.call('GET', '/api/nope', { user: TECH_A });
    expect(bad.status).toBe(404);
    expect(bad.body.error.requestId).toMatch(/[0-9a-f-]{36}/);
  });

  it('reports the database kind and that no migration is pending', async () => {
    const res = await api.call('GET', '/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ status: 'ok', database: { kind: backend, migrations: { pending: [] } } });
    expect(res.body.database.migrations.applied.length).toBeGreaterThan(0);
  });

  it('publishes an OpenAPI document whose request schemas come from the validation schemas', async () => {
    const doc = (await api.call('GET', '/api/openapi.json')).body;
    expect(Object.keys(doc.paths)).toEqual(expect.arrayContaining(['/api/repair-orders', '/api/repair-orders/{id}/measurements', '/api/health']));
    const create = doc.paths['/api/repair-orders'].post.requestBody.content['application/json'].schema;
    expect(create.required).toEqual(expect.arrayContaining(['complaint']));
    expect(create.additionalProperties).toBe(false);
    expect((await api.call('GET', '/api/docs')).status).toBe(200);
  });
});
