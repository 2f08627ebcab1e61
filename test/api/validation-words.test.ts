/**
 * Every refused input is answered with a 400 whose findings name the field (its path) and say in plain words what
 * was expected, never the validation library's wording ("Invalid input: expected string, received undefined").
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS } from '../support/db';
import { FOREMAN_A, newVehicle } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';

const LIBRARY_WORDING = /Invalid input|Invalid option|Invalid string|Invalid UUID|Too small|Too big|Unrecognized key|received/;

describe.each(BACKENDS)('validation messages in plain words on the %s database', (backend) => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startApi(backend);
  });
  afterAll(async () => api?.close());

  it.each([
    ['a missing complaint', '/api/repair-orders', { vehicle: newVehicle() }, 'body.complaint', 'missing; expected text'],
    ['a complaint that is a number', '/api/repair-orders', { vehicle: newVehicle(), complaint: 12 }, 'body.complaint', 'expected text, not 12'],
    ['a missing odometer unit choice given wrong', '/api/repair-orders', { vehicle: newVehicle({ odometerUnit: 'miles' }), complaint: 'x' }, 'body.vehicle.odometerUnit', 'expected one of "mi", "km", not the text "miles"'],
    ['a technician id that is no UUID', '/api/repair-orders', { vehicle: newVehicle(), complaint: 'x', technicianId: 'bob' }, 'body.technicianId', 'expected an id (a UUID'],
    ['a field the endpoint does not take', '/api/repair-orders', { vehicle: newVehicle(), complaint: 'x', colour: 'red' }, 'body', 'field "colour" not accepted here'],
    ['a missing status', '/api/repair-orders/00000000-0000-4000-8000-000000000000/status', {}, 'body.to', 'missing; expected one of "open"'],
    ['a make left out of a new vehicle', '/api/repair-orders', { vehicle: { ...newVehicle(), make: undefined }, complaint: 'x' }, 'body.vehicle.make', 'missing; expected text'],
  ])('answers %s with the field and what was expected', async (_name, path, body, field, words) => {
    const res = await api.call('POST', path, { user: FOREMAN_A, body: JSON.parse(JSON.stringify(body)) });
    expect(res.status).toBe(400);
    const finding = (res.body.error.findings as Array<{ path: string; message: string }>).find((f) => f.path === field);
    expect(finding?.message).toContain(words);
    expect(res.body.error.message).toContain(field);
    for (const f of res.body.error.findings) expect(f.message).not.toMatch(LIBRARY_WORDING);
  });

  it('keeps a message the schema gives itself', async () => {
    const res = await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'x'.repeat(4001) } });
    expect(res.body.error.findings[0]).toMatchObject({ path: 'body.complaint', message: 'at most 4000 characters' });
  });
});
