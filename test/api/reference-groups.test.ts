import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FOREMAN_A, newVehicle, TECH_A } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';
import { drawSharedCaseN, sharedReading, SHARED_SENSOR_POOL, type SharedNCase } from '../support/out-of-model/shared-reference';
import type { MeasurementRequest } from '../../src/engine/vocabulary';

const SENSOR_TERMS = ['TP', 'MAP', 'FTP', 'APP'];
const REFERENCE_KOEO = { quantity: 'dc_volts', at: 'reference', against: 'battery_negative', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', jumpers: [] };

describe('reference groups and the order-wide diagnosis over HTTP', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startApi('postgresql');
  });
  afterAll(async () => api?.close());

  async function orderWith(n: number) {
    const ro = (await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'several 5 V sensors read low', codes: ['P0641'], technicianId: TECH_A } })).body;
    const circuits = [];
    for (const term of SENSOR_TERMS.slice(0, n)) {
      circuits.push((await api.call('POST', `/api/repair-orders/${ro.id}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: term, label: `${term} sensor` } })).body);
    }
    const ect = (await api.call('POST', `/api/repair-orders/${ro.id}/circuits`, { user: TECH_A, body: { kind: 'two_wire_thermistor', sensor: 'ECT', label: 'ECT sensor' } })).body;
    return { ro, circuits, ect };
  }

  it('refuses a group with a clear 400 naming the circuit: unknown, listed twice, not three-wire 5 V, fewer than two, already in a group', async () => {
    const { ro, circuits, ect } = await orderWith(3);
    const post = (circuitIds: string[]) => api.call('POST', `/api/repair-orders/${ro.id}/reference-groups`, { user: TECH_A, body: { circuitIds } });
    const unknown = await post([circuits[0].id, '5f0c1f5e-1d2b-4c39-9a55-2f1f0c0d0e0f']);
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.findings[0]).toMatchObject({ code: 'reference_group.unknown_circuit', path: 'body.circuitIds[1]' });
    const twice = await post([circuits[0].id, circuits[0].id]);
    expect(twice.status).toBe(400);
    expect(JSON.stringify(twice.body)).toMatch(/listed twice/);
    const thermistor = await post([circuits[0].id, ect.id]);
    expect(thermistor.status).toBe(400);
    expect(thermistor.body.error.findings[0]).toMatchObject({ code: 'reference_group.not_three_wire', path: 'body.circuitIds[1]' });
    const one = await post([circuits[0].id]);
    expect(one.status).toBe(400);
    expect(JSON.stringify(one.body)).toMatch(/at least 2 circuits/);
    const made = await post([circuits[0].id, circuits[1].id]);
    expect(made.status).toBe(201);
    const again = await post([circuits[2].id, circuits[1].id]);
    expect(again.status).toBe(400);
    expect(again.body.error.findings[0]).toMatchObject({ code: 'reference_group.circuit_in_another_group', path: 'body.circuitIds[1]' });
  });

  it('lists, clears and audits a group; a cleared group frees its circuits', async () => {
    const { ro, circuits } = await orderWith(2);
    const made = (await api.call('POST', `/api/repair-orders/${ro.id}/reference-groups`, { user: TECH_A, body: { circuitIds: circuits.map((c) => c.id), source: 'wire_identification' } })).body;
    expect(made).toMatchObject({ circuitIds: circuits.map((c) => c.id), source: 'wire_identification' });
    expect((await api.call('GET', `/api/repair-orders/${ro.id}/reference-groups`, { user: TECH_A })).body.items).toHaveLength(1);
    const cleared = await api.call('DELETE', `/api/repair-orders/${ro.id}/reference-groups/${made.id}`, { user: TECH_A });
    expect(cleared.status).toBe(200);
    expect((await api.call('GET', `/api/repair-orders/${ro.id}/reference-groups`, { user: TECH_A })).body.items).toHaveLength(0);
    expect((await api.call('DELETE', `/api/repair-orders/${ro.id}/reference-groups/${made.id}`, { user: TECH_A })).status).toBe(404);
    const audit = (await api.call('GET', `/api/repair-orders/${ro.id}/audit`, { user: FOREMAN_A })).body.items.map((e: { action: string }) => e.action);
    expect(audit).toEqual(expect.arrayContaining(['reference_group.created', 'reference_group.updated']));
    expect((await api.call('POST', `/api/repair-orders/${ro.id}/reference-groups`, { user: TECH_A, body: { circuitIds: circuits.map((c) => c.id) } })).status).toBe(201);
  });

  it('keeps to the circuits while no circuit of a group points at the reference', async () => {
    const { ro, circuits } = await orderWith(3);
    await api.call('POST', `/api/repair-orders/${ro.id}/reference-groups`, { user: TECH_A, body: { circuitIds: circuits.map((c) => c.id) } });
    const order = await api.call('GET', `/api/repair-orders/${ro.id}/diagnosis`, { user: TECH_A });
    expect(order.status).toBe(200);
    expect(order.body.referenceGroups[0]).toMatchObject({ active: false, circuitIds: circuits.map((c) => c.id) });
    expect(order.body.nextTest.referenceGroupId).toBeNull();
    expect(order.body.circuits).toHaveLength(4);
    // The order's next test carries the cautions the circuit's own test screen shows.
    const own = (await api.call('GET', `/api/repair-orders/${ro.id}/circuits/${order.body.nextTest.circuitId}/diagnosis`, { user: TECH_A })).body;
    expect(order.body.nextTest.cautions).toEqual(own.nextTest.cautions.map((c: { id: string; text: string }) => ({ id: c.id, text: c.text })));
    expect(order.body.nextTest.cautions.map((c: { id: string }) => c.id)).toContain('service_information');
  });

  /** Drives the order view to its end on a drawn shared-reference case: each next test answered from the case. */
  async function driveOrder(ro: { id: string }, circuits: Array<{ id: string; sensor: string }>, c: SharedNCase, names: readonly string[]) {
    const attempts = new Map<string, number>();
    let order = (await api.call('GET', `/api/repair-orders/${ro.id}/diagnosis`, { user: TECH_A })).body;
    for (let step = 0; step < 16; step++) {
      const group = order.referenceGroups[0];
      if (group.diagnosis.status === 'concluded' || group.diagnosis.status === 'exhausted' || !order.nextTest || order.nextTest.referenceGroupId === null) break;
      const { request, circuitId } = order.nextTest;
      const k = circuits.findIndex((x) => x.id === circuitId);
      const key = JSON.stringify(request);
      const attempt = attempts.get(key) ?? 0;
      attempts.set(key, attempt + 1);
      const asked: MeasurementRequest = { ...request, sensor: request.sensor === 'all' ? undefined : names[k] };
      const value = sharedReading(c.circuit, c.instruments, asked, c.noiseSeed, attempt);
      const posted = await api.call('POST', `/api/repair-orders/${ro.id}/measurements`, {
        user: TECH_A,
        body: { circuitId, ...request, value: value === 'overload' ? 'OL' : value, unit: request.quantity === 'ohms' ? 'Ω' : 'V' },
      });
      expect(posted.status, JSON.stringify(posted.body)).toBe(201);
      order = (await api.call('GET', `/api/repair-orders/${ro.id}/diagnosis`, { user: TECH_A })).body;
    }
    return order;
  }

  // Cases drawn from the out-of-model shared reference (its own part values, not the engine's circuit model).
  it.each<[number, string, number]>([
    [3, 'ftp_sensor_loading_reference', 0],
    [3, 'reference_short_ground', 1],
    [3, 'module_regulator', 0],
    [4, 'map_sensor_loading_reference', 0],
    [4, 'reference_short_ground', 3],
    [4, 'module_regulator', 2],
  ])('moves to the shared reference of %i circuits by itself and finds %s (case %i)', async (n, cause, index) => {
    const names = SHARED_SENSOR_POOL.slice(0, n);
    const c = drawSharedCaseN(names, cause, index, 20261204);
    const { ro, circuits } = await orderWith(n);
    await api.call('POST', `/api/repair-orders/${ro.id}/reference-groups`, { user: TECH_A, body: { circuitIds: circuits.map((x) => x.id) } });
    // The technician reads the reference at two of the sensors, as each circuit's own first test: both low.
    for (const k of [0, 1]) {
      const value = sharedReading(c.circuit, c.instruments, { ...(REFERENCE_KOEO as MeasurementRequest), sensor: names[k] }, c.noiseSeed, 0);
      await api.call('POST', `/api/repair-orders/${ro.id}/measurements`, { user: TECH_A, body: { circuitId: circuits[k].id, ...REFERENCE_KOEO, value, unit: 'V' } });
    }
    const first = (await api.call('GET', `/api/repair-orders/${ro.id}/diagnosis`, { user: TECH_A })).body;
    expect(first.referenceGroups[0].active).toBe(true);
    expect(first.referenceGroups[0].why[0]).toMatch(/2 circuits on this reference point at it/);
    expect(first.circuits.filter((x: { pointsAtReference: boolean }) => x.pointsAtReference)).toHaveLength(2);
    expect(first.nextTest.referenceGroupId).toBe(first.referenceGroups[0].id);
    expect(first.nextTest.cautions.map((c: { id: string }) => c.id)).toContain('service_information');
    const order = await driveOrder(ro, circuits, c, names);
    const group = order.referenceGroups[0].diagnosis;
    expect(group.status).toBe('concluded');
    const k = names.findIndex((s) => cause === `${s}_sensor_loading_reference`);
    const expected = k >= 0 ? `c${k + 1}_sensor_loading_reference` : cause;
    expect(group.conclusion.hypothesisId).toBe(expected);
    expect(order.leadingCauses[0]).toMatchObject({ id: expected, referenceGroupId: order.referenceGroups[0].id, circuitId: k >= 0 ? circuits[k].id : null });
  });
});
