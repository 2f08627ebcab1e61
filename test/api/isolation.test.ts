/**
 * Shop isolation, tried on every route: each operation of the OpenAPI document and each page route is called by
 * people of shop B (technician, foreman, admin) on ids that belong to shop A. A route with an id in its path must
 * answer 404 (never 403: that would confirm the id exists; never 200); a route without one must not let any of
 * shop A's data through. The routes come from the running service, so a new endpoint is tried without editing
 * this file; one that needs a request body fails here until a valid body is added to BODIES.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { builtInDocuments } from '../../src/engine/diagnosis';
import { BACKENDS } from '../support/db';
import { ADMIN_B, FOREMAN_A, FOREMAN_B, newVehicle, TECH_A, TECH_A2, TECH_B } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';

interface Operation {
  method: string;
  path: string;
}

const MARKER = 'isolation-marker-shop-a';
const koeoBackprobe = { location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off' } as const;

/** Shop A's ids, put into every path parameter of that name. */
interface ShopA {
  id: string;
  circuitId: string;
  /** A second three-wire circuit, grouped with the first on one 5 V reference. */
  circuit2Id: string;
  groupId: string;
  treeRowId: string;
  userId: string;
  vin: string;
  /** The public proof check answers everyone by design; a digest no proof of shop A has must tell nothing. */
  digest: string;
}

/** A request body valid in itself, so the answer is about the id and not about the body (400 would hide a leak). */
const BODIES: Record<string, (a: ShopA) => unknown> = {
  'patch /api/repair-orders/{id}': () => ({ version: 1, cause: 'Changed from another shop' }),
  'post /api/repair-orders/{id}/status': () => ({ to: 'diagnosing' }),
  'post /api/repair-orders/{id}/circuits': () => ({ kind: 'three_wire_5v', sensor: 'MAP', label: 'MAP', cavities: { A: 'reference', B: 'signal', C: 'ground' } }),
  'post /api/repair-orders/{id}/measurements': (a) => ({ circuitId: a.circuitId, quantity: 'dc_volts', at: 'signal', against: 'battery_negative', ...koeoBackprobe, value: 4.87, unit: 'V' }),
  'post /api/repair-orders/{id}/reference-groups': (a) => ({ circuitIds: [a.circuitId, a.circuit2Id] }),
  'post /api/repair-orders/{id}/repairs': (a) => ({ circuitId: a.circuitId, part: 'signal', action: 'Spliced the signal wire' }),
  'post /api/repair-orders/{id}/reviews': () => ({ decision: 'approved' }),
  'post /api/repair-orders/{id}/codes-after': () => ({ version: 1, codes: [], method: 'road_test' }),
  'post /api/users/{id}/deactivate': () => undefined,
  'delete /api/repair-orders/{id}/reference-groups/{groupId}': () => undefined,
};

/** Routes that are about the caller's own credential, not shop data. */
const NOT_SHOP_DATA = new Set(['post /api/auth/sign-in', 'post /api/auth/sign-out']);

const OTHER_SHOP = [
  ['technician', TECH_B],
  ['foreman', FOREMAN_B],
  ['admin', ADMIN_B],
] as const;

describe.each(BACKENDS)('shop isolation on every route on the %s database', (backend) => {
  let api: TestApi;
  let a: ShopA;
  let apiOps: Operation[] = [];
  let pageOps: Operation[] = [];
  let markers: string[] = [];

  beforeAll(async () => {
    api = await startApi(backend);
    // A number of its own: each shop's automatic numbers start alike, so shop B's next number may read like A's first.
    const ro = await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { number: 'A-77031', vehicle: newVehicle(), complaint: MARKER, technicianId: TECH_A } });
    expect(ro.status).toBe(201);
    const circuit = await api.call('POST', `/api/repair-orders/${ro.body.id}/circuits`, {
      user: TECH_A,
      body: { kind: 'three_wire_5v', sensor: 'TP', label: `TP ${MARKER}`, cavities: { A: 'reference', B: 'signal', C: 'ground' } },
    });
    expect(circuit.status).toBe(201);
    const circuit2 = await api.call('POST', `/api/repair-orders/${ro.body.id}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'MAP', label: 'MAP' } });
    const group = await api.call('POST', `/api/repair-orders/${ro.body.id}/reference-groups`, { user: TECH_A, body: { circuitIds: [circuit.body.id, circuit2.body.id] } });
    expect(group.status).toBe(201);
    const reading = await api.call('POST', `/api/repair-orders/${ro.body.id}/measurements`, { user: TECH_A, body: BODIES['post /api/repair-orders/{id}/measurements']!({ circuitId: circuit.body.id } as ShopA) });
    expect(reading.status).toBe(201);
    const own = { ...(builtInDocuments()[0] as unknown as Record<string, unknown>), id: 'shop-a-private', title: `Tree ${MARKER}` };
    const tree = await api.call('POST', '/api/fault-trees', { user: FOREMAN_A, body: own });
    expect(tree.status).toBe(201);
    a = { id: ro.body.id, circuitId: circuit.body.id, circuit2Id: circuit2.body.id, groupId: group.body.id, treeRowId: tree.body.tree.rowId ?? tree.body.tree.id, userId: TECH_A2, vin: ro.body.vehicle.vin, digest: 'ab'.repeat(32) };
    // What shop B must never read: what shop A typed, its order number, a reading's id, its people and shop name.
    // (The ids B itself sent may come back in a not-found message: B knew them already.)
    markers = [MARKER, ro.body.number, reading.body.id ?? reading.body.items?.[0]?.id, 'Tech One', 'Fore Person', 'Test Bay One'].filter(Boolean);

    const doc = (await api.call('GET', '/api/openapi.json')).body as { paths: Record<string, Record<string, unknown>> };
    apiOps = Object.entries(doc.paths).flatMap(([path, ops]) => Object.keys(ops).map((method) => ({ method, path })));
    // Page routes as the HTTP router holds them (the pages are left out of the API document).
    const router = (api.app.getHttpAdapter().getInstance() as { router: { stack: Array<{ route?: { path: string; methods: Record<string, boolean> } }> } }).router;
    pageOps = router.stack
      .filter((l) => l.route && !l.route.path.startsWith('/api'))
      .flatMap((l) => Object.keys(l.route!.methods).map((method) => ({ method, path: l.route!.path.replace(/:(\w+)/g, '{$1}') })));
  }, 60_000);
  afterAll(async () => api?.close());

  const fill = (path: string) =>
    path.replace(/\{(\w+)\}/g, (_, name: string) => {
      const value = (a as unknown as Record<string, string>)[name === 'vin' ? 'vin' : name];
      if (!value) throw new Error(`no shop A value for the path parameter ${name} in ${path}: add it to ShopA`);
      return value;
    });

  it('finds the routes to try: the API document and the page routes', () => {
    expect(apiOps.length).toBeGreaterThan(25);
    expect(apiOps.filter((o) => o.path.includes('{')).length).toBeGreaterThan(10);
    expect(pageOps.filter((o) => o.path.includes('{')).map((o) => o.path)).toEqual(expect.arrayContaining(['/bay/orders/{id}', '/board/orders/{id}']));
  });

  it('has every route that takes a shop A id find it for shop A itself (so the 404s below are about the shop)', async () => {
    for (const op of apiOps.filter((o) => o.method === 'get' && /\{(id|circuitId|treeRowId)\}/.test(o.path))) {
      const res = await api.call('GET', fill(op.path), { user: FOREMAN_A });
      // The proof of a job still in diagnosis is a 409 (nothing to prove yet): found, just not ready.
      expect([200, 409], `${op.method} ${op.path}: ${res.status}`).toContain(res.status);
    }
  });

  it.each(OTHER_SHOP)('answers 404 to a %s of shop B on every API route with a shop A id in its path', async (_role, user) => {
    const failures: string[] = [];
    for (const op of apiOps.filter((o) => o.path.includes('{') && !o.path.includes('{vin}'))) {
      const key = `${op.method} ${op.path}`;
      const makeBody = BODIES[key];
      if (op.method !== 'get' && !makeBody) {
        failures.push(`${key}: no valid request body in BODIES; add one so the route is tried`);
        continue;
      }
      const res = await api.call(op.method.toUpperCase(), fill(op.path), { user, body: makeBody?.(a) });
      const text = JSON.stringify(res.body);
      if (res.status !== 404) failures.push(`${key}: ${res.status} ${text.slice(0, 200)}`);
      for (const m of markers) if (text.includes(m)) failures.push(`${key}: the answer contains shop A's ${m}`);
    }
    expect(failures).toEqual([]);
  });

  it.each(OTHER_SHOP)('lets no shop A data through to a %s of shop B on the API routes without an id', async (_role, user) => {
    const failures: string[] = [];
    for (const op of apiOps.filter((o) => !o.path.includes('{') && !NOT_SHOP_DATA.has(`${o.method} ${o.path}`))) {
      // Lists filtered by a shop A person must come back empty or refused, never with A's rows.
      const path = op.method === 'get' && op.path === '/api/repair-orders' ? `${op.path}?technicianId=${TECH_A}&q=${MARKER}` : op.path;
      const res = await api.call(op.method.toUpperCase(), path, { user, body: op.method === 'get' ? undefined : { repairOrderId: a.id, digest: '0'.repeat(64) } });
      const text = JSON.stringify(res.body);
      if (res.status >= 500) failures.push(`${op.method} ${op.path}: ${res.status}`);
      for (const m of markers) if (text.includes(m)) failures.push(`${op.method} ${op.path}: the answer contains shop A's ${m}`);
    }
    expect(failures).toEqual([]);
  });

  it.each(OTHER_SHOP)('shows a %s of shop B a not-found page on every page route with a shop A id', async (_role, user) => {
    const { cookie } = await api.sessionOf(user);
    const failures: string[] = [];
    for (const op of pageOps.filter((o) => o.method === 'get' && o.path.includes('{'))) {
      const res = await fetch(api.url + fill(op.path), { redirect: 'manual', headers: { cookie } });
      const text = await res.text();
      if (res.status !== 404) failures.push(`${op.path}: ${res.status}`);
      for (const m of markers) if (text.includes(m)) failures.push(`${op.path}: the page contains shop A's ${m}`);
    }
    expect(failures).toEqual([]);
  });

  it('leaves shop A’s repair order as it was after all those calls', async () => {
    const ro = await api.call('GET', `/api/repair-orders/${a.id}`, { user: FOREMAN_A });
    expect(ro.body).toMatchObject({ status: 'diagnosing', version: expect.any(Number), cause: '' });
    const circuits = await api.call('GET', `/api/repair-orders/${a.id}/circuits`, { user: FOREMAN_A });
    expect(circuits.body.items).toHaveLength(2);
    expect((await api.call('GET', `/api/repair-orders/${a.id}/reference-groups`, { user: FOREMAN_A })).body.items).toHaveLength(1);
    const tech = await api.call('GET', '/api/users', { user: FOREMAN_A });
    expect(tech.body.items.find((u: { id: string }) => u.id === TECH_A2)).toMatchObject({ active: true });
  });
});
