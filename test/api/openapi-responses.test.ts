/**
 * The OpenAPI document names what every endpoint answers: a success schema (JSON, or the PDF) and the error body,
 * and the answers the service really gives fit the schemas it declares.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as R from '../../src/common/openapi/responses';
import { BACKENDS } from '../support/db';
import { FOREMAN_A, newVehicle, TECH_A } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';

type Operation = { responses?: Record<string, { content?: Record<string, { schema?: unknown }> }> };

describe.each(BACKENDS)('response schemas in the OpenAPI document on the %s database', (backend) => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startApi(backend);
  });
  afterAll(async () => api?.close());

  it('gives every operation a success answer with a schema, and the error body', async () => {
    const doc = (await fetch(`${api.url}/api/openapi.json`).then((r) => r.json())) as { paths: Record<string, Record<string, Operation>> };
    const lacking: string[] = [];
    let operations = 0;
    for (const [path, item] of Object.entries(doc.paths)) {
      for (const [method, op] of Object.entries(item)) {
        operations++;
        const success = Object.entries(op.responses ?? {}).find(([status]) => /^2\d\d$/.test(status))?.[1];
        const schema = success?.content && Object.values(success.content)[0]?.schema;
        if (!schema) lacking.push(`${method.toUpperCase()} ${path}: no success schema`);
        if (!op.responses?.default?.content?.['application/json']?.schema) lacking.push(`${method.toUpperCase()} ${path}: no error schema`);
      }
    }
    expect(operations).toBeGreaterThan(30);
    expect(lacking).toEqual([]);
  });

  it('answers with bodies that fit the schemas it declares', async () => {
    const created = await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'Schema check', technicianId: TECH_A } });
    R.RepairOrder.parse(created.body);
    const id = created.body.id as string;
    R.RepairOrderList.parse((await api.call('GET', '/api/repair-orders', { user: FOREMAN_A })).body);
    const circuit = await api.call('POST', `/api/repair-orders/${id}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'TP', label: 'TP 1' } });
    R.Circuit.parse(circuit.body);
    R.CircuitList.parse((await api.call('GET', `/api/repair-orders/${id}/circuits`, { user: TECH_A })).body);
    const diagnosis = (await api.call('GET', `/api/repair-orders/${id}/circuits/${circuit.body.id}/diagnosis`, { user: TECH_A })).body;
    R.Diagnosis.parse(diagnosis);
    const reading = await api.call('POST', `/api/repair-orders/${id}/measurements`, {
      user: TECH_A,
      // Whatever the first test is, a value in its own unit (ohms or volts).
      body: { ...diagnosis.nextTest.request, circuitId: circuit.body.id, value: 0.75, unit: diagnosis.nextTest.request.quantity === 'ohms' ? 'Ω' : 'V' },
    });
    expect(reading.status, JSON.stringify(reading.body)).toBe(201);
    R.MeasurementAnswer.parse(reading.body);
    R.Measurement.parse(reading.body);
    R.MeasurementList.parse((await api.call('GET', `/api/repair-orders/${id}/measurements`, { user: TECH_A })).body);
    const second = await api.call('POST', `/api/repair-orders/${id}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'MAP', label: 'MAP 1' } });
    const group = await api.call('POST', `/api/repair-orders/${id}/reference-groups`, { user: TECH_A, body: { circuitIds: [circuit.body.id, second.body.id] } });
    R.ReferenceGroup.parse(group.body);
    R.ReferenceGroupList.parse((await api.call('GET', `/api/repair-orders/${id}/reference-groups`, { user: TECH_A })).body);
    R.OrderDiagnosis.parse((await api.call('GET', `/api/repair-orders/${id}/diagnosis`, { user: TECH_A })).body);
    R.ReferenceGroupCleared.parse((await api.call('DELETE', `/api/repair-orders/${id}/reference-groups/${group.body.id}`, { user: TECH_A })).body);
    R.Health.parse((await api.call('GET', '/api/health', {})).body);
    R.Me.parse((await api.call('GET', '/api/me', { user: TECH_A })).body);
    R.UserList.parse((await api.call('GET', '/api/users', { user: FOREMAN_A })).body);
    R.FaultTreeList.parse((await api.call('GET', '/api/fault-trees', { user: FOREMAN_A })).body);
    R.RepairList.parse((await api.call('GET', `/api/repair-orders/${id}/repairs`, { user: TECH_A })).body);
    R.ReviewList.parse((await api.call('GET', `/api/repair-orders/${id}/reviews`, { user: FOREMAN_A })).body);
    R.AuditList.parse((await api.call('GET', `/api/repair-orders/${id}/audit`, { user: FOREMAN_A })).body);
    R.VinCheck.parse((await api.call('GET', `/api/vins/${created.body.vehicle.vin}`, { user: TECH_A })).body);
    R.ErrorBody.parse((await api.call('GET', '/api/repair-orders/00000000-0000-4000-8000-000000000000', { user: FOREMAN_A })).body);
  });
});
