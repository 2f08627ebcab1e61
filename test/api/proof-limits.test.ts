/**
 * One set of limits for what people write: every order the API accepts, at every write limit, gets a proof; one
 * character (or item) over any limit is a 400 naming the field. Built with fast-check over the shapes text takes
 * (words, one unbroken run, a line per character, wide glyphs, symbols and accents).
 */
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LIMITS } from '../../src/common/limits';
import { BACKENDS } from '../support/db';
import { FOREMAN_A, newVehicle, TECH_A } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';

const T = LIMITS.text;
type Shape = 'words' | 'unbroken' | 'lines' | 'wide' | 'symbols';
const SHAPES: Shape[] = ['words', 'unbroken', 'lines', 'wide', 'symbols'];
const PATTERN: Record<Shape, string> = {
  words: 'Signal wire chafed at the bracket, spliced and sleeved. ',
  unbroken: 'x',
  lines: 'a\n',
  wide: 'W',
  symbols: 'Ω°µ≤±−é ',
};

/** Text of exactly `n` UTF-16 units in a shape, with no white space at either end (the API trims). */
function textOf(shape: Shape, n: number): string {
  const p = PATTERN[shape];
  const s = p.repeat(Math.ceil(n / p.length) + 1).slice(0, n);
  return s.replace(/\s$/, 'z').replace(/^\s/, 'z');
}

const koeo = { location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off' } as const;

describe.each(BACKENDS)('write limits and the proof on the %s database', (backend) => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startApi(backend);
  });
  afterAll(async () => api?.close());

  const orders = (id: string, rest = '') => `/api/repair-orders/${id}${rest}`;

  /** An order with every field a person writes at its limit, repaired, returned and approved; answers its proof. */
  async function orderAtLimits(shape: Shape, corrections: number) {
    const t = (n: number) => textOf(shape, n);
    // One-line fields (names, labels, part names, the repair's location) refuse line breaks: the same length in one line.
    const l = (n: number) => t(n).replace(/\n/g, '-');
    const codes = Array.from({ length: LIMITS.count.codes }, (_, i) => `P${String(100 + i).padStart(4, '0')}`);
    const ro = await api.call('POST', '/api/repair-orders', {
      user: FOREMAN_A,
      body: { vehicle: newVehicle({ make: l(T.vehicleMake), model: l(T.vehicleModel), engine: l(T.vehicleEngine) }), complaint: t(T.complaint), codes, technicianId: TECH_A },
    });
    expect(ro.status, JSON.stringify(ro.body).slice(0, 300)).toBe(201);
    const id = ro.body.id as string;
    const circuit = await api.call('POST', orders(id, '/circuits'), { user: TECH_A, body: { kind: 'three_wire_5v', sensor: l(T.circuitSensor), label: l(T.circuitLabel) } });
    expect(circuit.status).toBe(201);
    const circuitId = circuit.body.id as string;
    const reading = { circuitId, quantity: 'dc_volts', at: 'reference', against: 'ground', ...koeo, unit: 'V' };
    let last = await api.call('POST', orders(id, '/measurements'), { user: TECH_A, body: { ...reading, value: 5.01, note: t(T.readingNote) } });
    expect(last.status).toBe(201);
    for (let i = 0; i < corrections; i++) {
      last = await api.call('POST', orders(id, '/measurements'), { user: TECH_A, body: { ...reading, value: 5 + i / 100, note: t(T.readingNote), supersedes: last.body.id } });
      expect(last.status).toBe(201);
    }
    const parts = Array.from({ length: LIMITS.count.partsPerRepair }, () => ({ name: l(T.partName), number: l(T.partNumber), quantity: LIMITS.number.partQuantity }));
    const repair = await api.call('POST', orders(id, '/repairs'), {
      user: TECH_A,
      body: { circuitId, part: 'signal', action: t(T.repairAction), location: l(T.repairLocation), parts, note: t(T.repairNote), labourMinutes: LIMITS.number.labourMinutes },
    });
    expect(repair.status, JSON.stringify(repair.body).slice(0, 300)).toBe(201);
    const version = (await api.call('GET', orders(id), { user: TECH_A })).body.version;
    const patched = await api.call('PATCH', orders(id), { user: FOREMAN_A, body: { version, cause: t(T.cause), correction: t(T.correction), odometerOut: LIMITS.number.odometer } });
    expect(patched.status).toBe(200);
    const after = await api.call('POST', orders(id, '/codes-after'), {
      user: TECH_A,
      body: { version: patched.body.version, codes, method: 'cleared_then_key_cycles', keyCycles: LIMITS.number.keyCycles, note: t(T.codesAfterNote) },
    });
    expect(after.status, JSON.stringify(after.body).slice(0, 300)).toBe(200);
    expect((await api.call('POST', orders(id, '/reviews'), { user: FOREMAN_A, body: { decision: 'returned', comment: t(T.reviewComment) } })).status).toBe(201);
    expect((await api.call('POST', orders(id, '/reviews'), { user: FOREMAN_A, body: { decision: 'approved', comment: t(T.reviewComment) } })).status).toBe(201);
    const pdf = await fetch(`${api.url}${orders(id, '/proof.pdf')}`, { headers: await api.authHeaders(FOREMAN_A) });
    return { id, circuitId, lastReadingId: last.body.id as string, status: pdf.status, size: (await pdf.arrayBuffer()).byteLength };
  }

  it('renders the proof of an order with every written field at its limit, whatever shape the text takes', async () => {
    await fc.assert(
      fc.asyncProperty(fc.constantFrom(...SHAPES), fc.integer({ min: 0, max: 8 }), async (shape, corrections) => {
        const { status, size } = await orderAtLimits(shape, corrections);
        expect(status).toBe(200);
        expect(size).toBeGreaterThan(10_000);
      }),
      { numRuns: 3, endOnFailure: true },
    );
  }, 600_000);

  it('answers one character or item over each limit with a 400 naming the field, and stores nothing', async () => {
    const { id, circuitId } = await orderAtLimits('words', 0);
    const over = (n: number) => textOf('words', n + 1);
    const reading = { circuitId, quantity: 'dc_volts', at: 'reference', against: 'ground', ...koeo, unit: 'V', value: 5 };
    const repair = { circuitId, part: 'signal', action: 'Spliced' };
    const cases: Array<[string, string, string, unknown, string]> = [
      ['complaint', 'POST', '/api/repair-orders', { vehicle: newVehicle(), complaint: over(T.complaint) }, 'body.complaint'],
      ['vehicle make', 'POST', '/api/repair-orders', { vehicle: newVehicle({ make: over(T.vehicleMake) }), complaint: 'x' }, 'body.vehicle.make'],
      ['codes', 'POST', '/api/repair-orders', { vehicle: newVehicle(), complaint: 'x', codes: Array(LIMITS.count.codes + 1).fill('P0122') }, 'body.codes'],
      ['reading note', 'POST', orders(id, '/measurements'), { ...reading, note: over(T.readingNote) }, 'body.note'],
      ['repair action', 'POST', orders(id, '/repairs'), { ...repair, action: over(T.repairAction) }, 'body.action'],
      ['repair location', 'POST', orders(id, '/repairs'), { ...repair, location: over(T.repairLocation) }, 'body.location'],
      ['repair note', 'POST', orders(id, '/repairs'), { ...repair, note: over(T.repairNote) }, 'body.note'],
      ['parts', 'POST', orders(id, '/repairs'), { ...repair, parts: Array(LIMITS.count.partsPerRepair + 1).fill({ name: 'Sleeve' }) }, 'body.parts'],
      ['part name', 'POST', orders(id, '/repairs'), { ...repair, parts: [{ name: over(T.partName) }] }, 'body.parts.0.name'],
      ['part number', 'POST', orders(id, '/repairs'), { ...repair, parts: [{ name: 'Sleeve', number: over(T.partNumber) }] }, 'body.parts.0.number'],
      ['part quantity', 'POST', orders(id, '/repairs'), { ...repair, parts: [{ name: 'Sleeve', quantity: LIMITS.number.partQuantity + 1 }] }, 'body.parts.0.quantity'],
      ['labour minutes', 'POST', orders(id, '/repairs'), { ...repair, labourMinutes: LIMITS.number.labourMinutes + 1 }, 'body.labourMinutes'],
      ['review comment', 'POST', orders(id, '/reviews'), { decision: 'returned', comment: over(T.reviewComment) }, 'body.comment'],
      ['cause', 'PATCH', orders(id), { version: 1, cause: over(T.cause) }, 'body.cause'],
      ['correction', 'PATCH', orders(id), { version: 1, correction: over(T.correction) }, 'body.correction'],
      ['codes-after note', 'POST', orders(id, '/codes-after'), { version: 1, codes: [], method: 'road_test', note: over(T.codesAfterNote) }, 'body.note'],
      ['circuit label', 'POST', orders(id, '/circuits'), { kind: 'three_wire_5v', sensor: 'TP', label: over(T.circuitLabel) }, 'body.label'],
    ];
    const before = await api.db.prisma.auditEvent.count();
    const failures: string[] = [];
    for (const [what, method, path, body, field] of cases) {
      const res = await api.call(method, path, { user: FOREMAN_A, body });
      const paths = (res.body?.error?.findings ?? []).map((f: { path: string }) => f.path);
      if (res.status !== 400 || !paths.includes(field)) failures.push(`${what}: ${res.status} ${JSON.stringify(paths)}`);
    }
    expect(failures).toEqual([]);
    expect(await api.db.prisma.auditEvent.count()).toBe(before);
  }, 600_000);
});
