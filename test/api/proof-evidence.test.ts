/**
 * What a proof of repair rests on: "verified" only with the deciding readings taken again and healthy, approvals
 * bound to the evidence they were given on, and decisions taken at the same moment landing once.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { MeasurementRequest } from '../../src/engine/vocabulary';
import { BACKENDS } from '../support/db';
import { FOREMAN_A, newVehicle, TECH_A } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';
import { diagnoseToEnd, simulatedReading } from '../support/simulate';
import { readPdf } from '../proof-render/pdf-tools';

interface ToMeasure {
  circuitId: string;
  readingId: string;
  test: string;
  request: MeasurementRequest;
  state: 'not_measured' | 'outside_healthy';
}

describe.each(BACKENDS)('evidence behind a proof of repair on the %s database', (backend) => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startApi(backend);
  });
  afterAll(async () => api?.close());

  const orders = (id: string, rest = '') => `/api/repair-orders/${id}${rest}`;

  /** An order diagnosed to an open signal wire; with `repaired`, the splice recorded too. */
  async function diagnosedOrder(repaired = true) {
    const ro = (await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'Throttle code', codes: ['P0122'], technicianId: TECH_A } })).body;
    const circuitId = (await api.call('POST', orders(ro.id, '/circuits'), { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'TP', label: 'TP sensor 1' } })).body.id;
    const diagnosis = await diagnoseToEnd(api, TECH_A, ro.id, circuitId, 'signal_open');
    if (repaired) {
      const repair = await api.call('POST', orders(ro.id, '/repairs'), { user: TECH_A, body: { circuitId, part: 'signal', action: 'Spliced the signal wire', location: 'signal wire at the sensor' } });
      expect(repair.status).toBe(201);
    }
    return { id: ro.id as string, circuitId: circuitId as string, decidedBy: diagnosis.conclusion.decidedBy as string[] };
  }

  const verify = (id: string) => api.call('POST', orders(id, '/status'), { user: TECH_A, body: { to: 'verified' } });
  const measure = (id: string, circuitId: string, request: MeasurementRequest, hypothesis = 'good') =>
    api.call('POST', orders(id, '/measurements'), { user: TECH_A, body: { circuitId, ...request, ...simulatedReading(hypothesis, request), phase: 'verification' } });

  /** Takes every reading the refusal lists again, on the healthy circuit; then verifies. */
  async function verifyHealthy(id: string, circuitId: string) {
    const refused = await verify(id);
    expect(refused.status).toBe(409);
    for (const t of refused.body.error.toMeasure as ToMeasure[]) expect((await measure(id, circuitId, t.request)).status).toBe(201);
    const res = await verify(id);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
  }

  it('refuses "verified" right after the repair with a 409 that lists every deciding reading still to take again', async () => {
    const { id, decidedBy } = await diagnosedOrder();
    const res = await verify(id);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('status.verification_incomplete');
    const listed = res.body.error.toMeasure as ToMeasure[];
    expect(listed.map((t) => t.readingId).sort()).toEqual([...decidedBy].sort());
    expect(listed.every((t) => t.state === 'not_measured')).toBe(true);
    expect(res.body.error.message).toContain(listed[0]!.test);
  });

  it('names on the proof only the people who acted: no foreman before any foreman decision', async () => {
    const { id } = await diagnosedOrder();
    const pdf = Buffer.from(await (await fetch(`${api.url}${orders(id, '/proof.pdf')}`, { headers: await api.authHeaders(TECH_A) })).arrayBuffer());
    const text = (await readPdf(pdf)).pages.map((p) => p.text).join(' ').replace(/\s+/g, ' ');
    expect(text).not.toContain('Fore Person');
    expect(text).toContain('no foreman decision yet');
    expect(text).toContain('Tech One');
  });

  it('keeps refusing while one deciding reading is missing or still reads the fault, and verifies once all read healthy', async () => {
    const { id, circuitId } = await diagnosedOrder();
    const all = (await verify(id)).body.error.toMeasure as ToMeasure[];
    expect(all.length).toBeGreaterThan(1);
    // A deciding reading on which the open wire and the healthy circuit clearly differ: taken again still showing the
    // open wire, it falls outside where the healthy circuit puts it.
    const differs = (t: ToMeasure) => {
      const open = simulatedReading('signal_open', t.request).value;
      const good = simulatedReading('good', t.request).value;
      if (open === 'OL' || good === 'OL') return open !== good;
      return Math.abs(open - good) > Math.max(0.5, 0.2 * Math.abs(good));
    };
    const still = [...all].reverse().find(differs)!;
    expect(still).toBeDefined();
    const others = all.filter((t) => t !== still);
    // One re-test of several is not a verification.
    expect((await measure(id, circuitId, others[0]!.request)).status).toBe(201);
    const after1 = await verify(id);
    expect(after1.status).toBe(409);
    expect((after1.body.error.toMeasure as ToMeasure[]).map((t) => t.readingId)).toEqual(all.filter((t) => t !== others[0]).map((t) => t.readingId));
    for (const t of others.slice(1)) expect((await measure(id, circuitId, t.request)).status).toBe(201);
    expect((await measure(id, circuitId, still.request, 'signal_open')).status).toBe(201);
    const faulty = await verify(id);
    expect(faulty.status).toBe(409);
    expect(faulty.body.error.toMeasure).toEqual([expect.objectContaining({ readingId: still.readingId, state: 'outside_healthy' })]);
    // Taken once more, healthy: the latest reading of a test is the one that counts.
    expect((await measure(id, circuitId, still.request)).status).toBe(201);
    expect((await verify(id)).status).toBe(200);
  });

  it('makes an approval stale once a reading, a repair or a status change follows it, and closes only with an approval of the evidence now', async () => {
    const { id, circuitId } = await diagnosedOrder();
    const approved = await api.call('POST', orders(id, '/reviews'), { user: FOREMAN_A, body: { decision: 'approved' } });
    expect(approved.status).toBe(201);
    expect(approved.body.evidenceDigest).toMatch(/^[0-9a-f]{64}$/);
    expect((await api.call('GET', orders(id, '/approval'), { user: TECH_A })).body).toMatchObject({ state: 'approved', evidenceDigest: approved.body.evidenceDigest });

    // Another repair after the approval: the approval no longer covers the evidence.
    expect((await api.call('POST', orders(id, '/repairs'), { user: TECH_A, body: { circuitId, part: 'connector', action: 'Cleaned the sensor connector' } })).status).toBe(201);
    const stale = (await api.call('GET', orders(id, '/approval'), { user: TECH_A })).body;
    expect(stale).toMatchObject({ state: 'stale', evidenceDigest: approved.body.evidenceDigest });
    expect(stale.currentEvidenceDigest).not.toBe(approved.body.evidenceDigest);

    await verifyHealthy(id, circuitId);
    const close = await api.call('POST', orders(id, '/status'), { user: TECH_A, body: { to: 'closed' } });
    expect(close.status).toBe(409);
    expect(close.body.error.code).toBe('status.approval_stale');

    const pdf = Buffer.from(await (await fetch(`${api.url}${orders(id, '/proof.pdf')}`, { headers: await api.authHeaders(FOREMAN_A) })).arrayBuffer());
    const text = (await readPdf(pdf)).pages.map((p) => p.text).join(' ').replace(/\s+/g, ' ');
    expect(text).toContain('APPROVAL STALE');
    expect(text).not.toContain('Approved by');

    // An approval of what the evidence is now closes the order; the proof then names the digest it approved.
    const current = (await api.call('GET', orders(id, '/approval'), { user: TECH_A })).body.currentEvidenceDigest;
    const wrong = await api.call('POST', orders(id, '/reviews'), { user: FOREMAN_A, body: { decision: 'approved', evidenceDigest: approved.body.evidenceDigest } });
    expect(wrong.status).toBe(409);
    expect(wrong.body.error.code).toBe('review.evidence_changed');
    const again = await api.call('POST', orders(id, '/reviews'), { user: FOREMAN_A, body: { decision: 'approved', evidenceDigest: `sha256:${current}` } });
    expect(again.status).toBe(201);
    expect(again.body.evidenceDigest).toBe(current);
    const closed = await api.call('POST', orders(id, '/status'), { user: FOREMAN_A, body: { to: 'closed' } });
    expect(closed.status, JSON.stringify(closed.body)).toBe(200);
    expect((await api.call('GET', orders(id, '/approval'), { user: TECH_A })).body.state).toBe('approved');
  });

  it('stores one of eight approvals sent at the same moment and answers the other seven 409', async () => {
    const { id, circuitId } = await diagnosedOrder();
    await verifyHealthy(id, circuitId);
    const answers = await Promise.all(Array.from({ length: 8 }, () => api.call('POST', orders(id, '/reviews'), { user: FOREMAN_A, body: { decision: 'approved' } })));
    expect(answers.map((a) => a.status).sort()).toEqual([201, ...Array(7).fill(409)]);
    expect(await api.db.prisma.review.count({ where: { repairOrderId: id } })).toBe(1);
  });

  it('stores one of eight repairs sent at the same moment to a diagnosing order, with one status move, and answers the rest 409', async () => {
    const { id, circuitId } = await diagnosedOrder(false);
    const body = { circuitId, part: 'signal', action: 'Spliced the signal wire' };
    const answers = await Promise.all(Array.from({ length: 8 }, () => api.call('POST', orders(id, '/repairs'), { user: TECH_A, body })));
    expect(answers.map((a) => a.status).sort()).toEqual([201, ...Array(7).fill(409)]);
    expect(await api.db.prisma.repair.count({ where: { repairOrderId: id } })).toBe(1);
    expect(await api.db.prisma.statusChange.count({ where: { repairOrderId: id, toStatus: 'repaired' } })).toBe(1);
  });

  it('logs "open → diagnosing" once when ten first readings arrive at the same moment, and keeps all ten', async () => {
    const ro = (await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'Ten at once', technicianId: TECH_A } })).body;
    const circuitId = (await api.call('POST', orders(ro.id, '/circuits'), { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'TP', label: 'TP 1' } })).body.id;
    const reference = { circuitId, quantity: 'dc_volts', at: 'reference', against: 'ground', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', unit: 'V' };
    const answers = await Promise.all(Array.from({ length: 10 }, (_, i) => api.call('POST', orders(ro.id, '/measurements'), { user: TECH_A, body: { ...reference, value: 4.9 + i / 100 } })));
    expect(answers.map((a) => a.status)).toEqual(Array(10).fill(201));
    expect(await api.db.prisma.measurement.count({ where: { repairOrderId: ro.id } })).toBe(10);
    expect(await api.db.prisma.statusChange.count({ where: { repairOrderId: ro.id, toStatus: 'diagnosing' } })).toBe(1);
  });
});
