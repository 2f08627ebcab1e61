// A foreman's tree upload cannot freeze the service or fill its memory: trees over a size limit are refused with
// a 400 naming the limit, deep nesting is a 400 and never a 500, /api/health keeps answering while heavy trees are
// diagnosed, and compiled trees live in a bounded cache.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TREE_LIMITS } from '../../src/engine/diagnosis';
import { FaultTreeCatalog } from '../../src/modules/fault-trees/fault-tree-catalog.service';
import { BACKENDS } from '../support/db';
import { FOREMAN_A, newVehicle, SHOP_A, TECH_A } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';
import { syntheticTree } from '../support/synthetic-tree';

/** `depth` nested arrays around a condition, or `depth` nested `not`, as raw JSON text (no stack needed). */
const deepArrays = (depth: number) => `${'['.repeat(depth)}{"fact":"value","operator":"lessThan","value":1}${']'.repeat(depth)}`;
const deepNots = (depth: number) => `${'{"not":'.repeat(depth)}{"fact":"value","operator":"lessThan","value":1}${'}'.repeat(depth)}`;
/** A valid small tree whose one condition is replaced by the given raw JSON text. */
const treeWithRawCondition = (raw: string) => {
  const doc = syntheticTree({ tests: 2, outcomes: 2, causes: 2, id: 'deep-tree' }) as { tests: Array<{ outcomes: Array<{ condition: unknown }> }> };
  doc.tests[1]!.outcomes[0]!.condition = '__RAW__';
  return JSON.stringify(doc).replace('"__RAW__"', raw);
};

/** Milliseconds /api/health takes to answer, asked while `busy` runs (started first, given a moment to begin). */
async function healthWhile(api: TestApi, busy: () => Promise<unknown>): Promise<number> {
  const running = busy();
  await new Promise((r) => setTimeout(r, 150));
  const t0 = performance.now();
  const health = await api.call('GET', '/api/health');
  const took = performance.now() - t0;
  expect(health.status).toBe(200);
  await running;
  return took;
}

describe.each(BACKENDS)('fault-tree limits on the %s database', (backend) => {
  let api: TestApi;
  let roId: string;

  beforeAll(async () => {
    api = await startApi(backend, { env: { TRACEBAY_TREE_CACHE_TREES: '3', TRACEBAY_WRITE_LIMIT: '0' } });
    const ro = await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'P0122 set', technicianId: TECH_A } });
    expect(ro.status).toBe(201);
    roId = ro.body.id;
  });
  afterAll(async () => api?.close());

  const upload = (body: unknown) => api.call('POST', '/api/fault-trees', { user: FOREMAN_A, body });
  const circuitWith = async (treeId: string) => {
    const res = await api.call('POST', `/api/repair-orders/${roId}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'TP', label: `TP ${treeId}`, treeId } });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    return res.body.id as string;
  };
  const diagnosisOf = (circuitId: string) => api.call('GET', `/api/repair-orders/${roId}/circuits/${circuitId}/diagnosis`, { user: TECH_A });

  it('refuses the 2 tests × 1 000 outcomes × 1 000 causes tree that froze the service, naming each limit it breaks', async () => {
    const res = await upload(syntheticTree({ tests: 2, outcomes: 1000, causes: 999, sparse: true, id: 'huge' }));
    expect(res.status).toBe(400);
    expect(res.body.error.findings).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ code: 'tree.limit.causes', path: 'body.hypotheses' }),
        expect.objectContaining({ code: 'tree.limit.outcomesPerTest', path: 'body.tests.0.outcomes' }),
        expect.objectContaining({ code: 'tree.limit.searchCost', path: 'body.tests' }),
      ]),
    );
    expect(res.body.error.message).toContain(`at most ${TREE_LIMITS.causes.max}`);
  });

  it('accepts the largest tree the limits allow and diagnoses it', async () => {
    const res = await upload(syntheticTree({ tests: 25, outcomes: 4, causes: TREE_LIMITS.causes.max - 1, id: 'largest-allowed' }));
    expect(res.status, JSON.stringify(res.body).slice(0, 300)).toBe(201);
    const d = await diagnosisOf(await circuitWith('largest-allowed'));
    expect(d.status).toBe(200);
    expect(d.body.nextTest).not.toBeNull();
  });

  it.each([
    ['a condition nested 50 000 arrays deep', () => treeWithRawCondition(deepArrays(50_000)), 'body.too_deep'],
    ['a condition of 20 000 nested "not"', () => treeWithRawCondition(deepNots(20_000)), 'body.too_deep'],
  ])('answers %s with a 400 naming the depth limit, not a 500', async (_what, raw, code) => {
    const res = await api.call('POST', '/api/fault-trees', { user: FOREMAN_A, raw: raw() });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe(code);
    expect(res.body.error.message).toContain('64 levels');
  });

  it('refuses deep nesting on any route before it is parsed, with a 400', async () => {
    const res = await api.call('POST', '/api/repair-orders', { user: TECH_A, raw: `{"complaint":${deepArrays(100_000)}}` });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('body.too_deep');
  });

  it('refuses a condition nested deeper than a condition may be, naming the limit and the condition', async () => {
    const res = await api.call('POST', '/api/fault-trees', { user: FOREMAN_A, raw: treeWithRawCondition(deepNots(TREE_LIMITS.conditionDepth.max + 1)) });
    expect(res.status).toBe(400);
    expect(res.body.error.findings[0]).toMatchObject({ code: 'tree.limit.conditionDepth', path: 'body.tests.1.outcomes.0.condition' });
  });

  it('publishes the limits in the API document, from the same definition', async () => {
    const doc = (await api.call('GET', '/api/openapi.json')).body;
    const post = doc.paths['/api/fault-trees'].post;
    const schema = post.requestBody.content['application/json'].schema;
    expect(schema['x-tracebay-limits']).toEqual(Object.fromEntries(Object.entries(TREE_LIMITS).map(([k, v]) => [k, v.max])));
    expect(post.description).toContain(`searchCost ≤ ${TREE_LIMITS.searchCost.max}`);
  });

  it('keeps /api/health answering while a heavy tree stored before the limits is diagnosed, and names the limit', async () => {
    // Stored straight into the table, as an upload from before the limits would have been.
    const document = syntheticTree({ tests: 2, outcomes: 1000, causes: 999, sparse: true, id: 'stored-before-limits' });
    const row = await api.db.prisma.faultTree.create({
      data: { shopId: SHOP_A, treeId: 'stored-before-limits', version: 'sha256:old-upload', circuitKind: 'three_wire_5v', label: 'old', document: document as object, createdById: FOREMAN_A },
    });
    const circuitId = await circuitWith('largest-allowed');
    await api.db.prisma.circuit.update({ where: { id: circuitId }, data: { faultTreeId: row.id } });
    let answer: Awaited<ReturnType<typeof diagnosisOf>> | undefined;
    // Before: each such diagnosis took 7–9 s and health waited up to 8.5 s. A generous bound, not a speed target.
    const took = await healthWhile(api, async () => (answer = await diagnosisOf(circuitId)));
    expect(took).toBeLessThan(2000);
    expect(answer!.status).toBe(422);
    expect(answer!.body.error.code).toBe('fault_tree.over_limits');
    expect(answer!.body.error.findings.map((f: { code: string }) => f.code)).toContain('tree.limit.causes');
  });

  it('keeps /api/health answering while the largest allowed tree is diagnosed many times at once', async () => {
    const circuitId = await circuitWith('largest-allowed');
    const took = await healthWhile(api, () => Promise.all(Array.from({ length: 20 }, () => diagnosisOf(circuitId))));
    expect(took).toBeLessThan(2000);
  });

  it('keeps compiled trees within the cache bound however many distinct trees are uploaded, and drops idle ones', async () => {
    const catalog = api.app.get(FaultTreeCatalog);
    for (let i = 0; i < 8; i++) {
      const res = await upload({ ...syntheticTree({ tests: 6, outcomes: 3, causes: 8, id: 'many-versions' }), version: `v${i}` });
      expect(res.status).toBe(201);
      expect((await diagnosisOf(await circuitWith('many-versions'))).status).toBe(200);
      const stats = catalog.cache.stats();
      expect(stats.trees).toBeLessThanOrEqual(3);
      expect(stats.bytes).toBeLessThanOrEqual(stats.maxBytes);
    }
    catalog.cache.sweep(0);
    expect(catalog.cache.stats()).toMatchObject({ trees: 0, bytes: 0 });
    // A tree that left the cache is compiled again from its stored document.
    const again = await diagnosisOf(await circuitWith('largest-allowed'));
    expect(again.status).toBe(200);
  });
});
