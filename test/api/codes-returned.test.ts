/**
 * Codes read after the repair: an order is not verified while a code that concerns a repaired circuit came back.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { MeasurementRequest } from '../../src/engine/vocabulary';
import { FOREMAN_A, newVehicle, TECH_A } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';
import { diagnoseToEnd, simulatedReading } from '../support/simulate';

describe('codes read after the repair, against "verified"', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startApi('postgresql');
  });
  afterAll(async () => api?.close());

  const orders = (id: string, rest = '') => `/api/repair-orders/${id}${rest}`;
  const verify = (id: string) => api.call('POST', orders(id, '/status'), { user: TECH_A, body: { to: 'verified' } });
  const version = async (id: string) => (await api.call('GET', orders(id), { user: TECH_A })).body.version as number;
  const codesAfter = async (id: string, codes: string[]) =>
    api.call('POST', orders(id, '/codes-after'), { user: TECH_A, body: { version: await version(id), codes, method: 'cleared_then_key_cycles', keyCycles: 3 } });

  /** A TP A circuit diagnosed to an open signal wire (code P0122 at intake) and spliced. */
  async function repairedOrder() {
    const ro = (await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'Throttle code', codes: ['P0122'], technicianId: TECH_A } })).body;
    const circuitId = (await api.call('POST', orders(ro.id, '/circuits'), { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'TP A', label: 'TP sensor 1' } })).body.id as string;
    const diagnosis = await diagnoseToEnd(api, TECH_A, ro.id, circuitId, 'signal_open');
    expect(diagnosis.conclusion).toMatchObject({ hypothesisId: 'signal_open' });
    expect((await api.call('POST', orders(ro.id, '/repairs'), { user: TECH_A, body: { circuitId, part: 'signal', action: 'Spliced the signal wire' } })).status).toBe(201);
    return { id: ro.id as string, circuitId };
  }

  it('refuses "verified" with a 409 naming a returned code of the repaired sensor, and lists it in the verification', async () => {
    const { id, circuitId } = await repairedOrder();
    expect((await codesAfter(id, ['P0122'])).status).toBe(200);
    const check = (await api.call('GET', orders(id, '/verification'), { user: TECH_A })).body;
    expect(check.complete).toBe(false);
    expect(check.codesReturned).toEqual([expect.objectContaining({ code: 'P0122', circuitId, circuit: 'TP sensor 1' })]);
    const refused = await verify(id);
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('status.codes_returned');
    expect(refused.body.error.message).toContain('P0122 (TP sensor 1)');
    const { cookie } = await api.sessionOf(TECH_A);
    const screen = await (await fetch(`${api.url}/bay/orders/${id}/circuits/${circuitId}`, { headers: { cookie } })).text();
    expect(screen).toMatch(/<p class="notice">[\s\S]*Read again after the repair: <span class="code">P0122<\/span>[\s\S]*cannot be marked verified/);
  });

  it('lets a code of another sensor through to the reading checks, and verifies once the readings are healthy', async () => {
    const { id, circuitId } = await repairedOrder();
    expect((await codesAfter(id, ['P0107'])).status).toBe(200);
    expect((await api.call('GET', orders(id, '/verification'), { user: TECH_A })).body.codesReturned).toEqual([]);
    const refused = await verify(id);
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('status.verification_incomplete');
    for (const t of refused.body.error.toMeasure as Array<{ request: MeasurementRequest }>) {
      const res = await api.call('POST', orders(id, '/measurements'), { user: TECH_A, body: { circuitId, ...t.request, ...simulatedReading('good', t.request), phase: 'verification' } });
      expect(res.status).toBe(201);
    }
    expect((await verify(id)).status).toBe(200);
  });

  it('clears the refusal once the codes are read again and none came back', async () => {
    const { id } = await repairedOrder();
    expect((await codesAfter(id, ['P0123'])).status).toBe(200);
    expect((await verify(id)).body.error.code).toBe('status.codes_returned');
    expect((await codesAfter(id, [])).status).toBe(200);
    const again = await verify(id);
    expect(again.body.error.code).toBe('status.verification_incomplete');
  });
});
