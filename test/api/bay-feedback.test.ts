/**
 * What technicians and foremen ran into on the bay and the board, over HTTP on both back ends: numbers typed with
 * digit grouping, who an order opened by a technician belongs to, and what a technician is told about an order
 * that is not theirs.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS } from '../support/db';
import { FOREMAN_A, newVehicle, TECH_A, TECH_A2 } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';

describe.each(BACKENDS)('the bay’s and the board’s rules over HTTP on the %s database', (backend) => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startApi(backend);
  });
  afterAll(async () => api?.close());

  const open = (body: Record<string, unknown>, user = FOREMAN_A) => api.call('POST', '/api/repair-orders', { user, body });

  it.each([
    ['148,220', 148_220],
    ['148 220', 148_220],
    ['148.220', 148_220],
    ["1'048'220", 1_048_220],
    ['148220', 148_220],
  ])('accepts the odometer typed as %j (digit grouping) and stores %i', async (typed, stored) => {
    const res = await open({ vehicle: newVehicle({ odometer: typed, year: '2019' }), complaint: 'Grouped digits' });
    expect(res.status).toBe(201);
    expect(res.body.odometerIn).toBe(stored);
  });

  it.each([
    ['148,22', 'vehicle.odometer'],
    ['1,48,220', 'vehicle.odometer'],
    ['twelve', 'vehicle.odometer'],
  ])('refuses the odometer %j with a 400 naming the field and saying what is expected', async (typed, field) => {
    const res = await open({ vehicle: newVehicle({ odometer: typed }), complaint: 'Bad digits' });
    expect(res.status).toBe(400);
    const finding = res.body.error.findings.find((f: { path: string }) => f.path === `body.${field}`);
    expect(finding.message).toContain('whole number');
    expect(finding.message).not.toMatch(/Invalid input|received/);
  });

  it('accepts a part quantity typed as text on a repair', async () => {
    const ro = (await open({ vehicle: newVehicle(), complaint: 'Parts count', technicianId: TECH_A })).body;
    await api.call('POST', `/api/repair-orders/${ro.id}/status`, { user: TECH_A, body: { to: 'diagnosing' } });
    const res = await api.call('POST', `/api/repair-orders/${ro.id}/repairs`, {
      user: TECH_A,
      body: { part: 'signal', action: 'Spliced the signal wire', parts: [{ name: 'Crimp splice', quantity: '2' }] },
    });
    expect(res.status).toBe(201);
    expect(res.body.parts[0].quantity).toBe(2);
  });

  it('assigns an order a technician opens to that technician, so it is on "My repair orders"', async () => {
    const ro = (await open({ vehicle: newVehicle(), complaint: 'Opened at the bay' }, TECH_A)).body;
    expect(ro.technician).toMatchObject({ id: TECH_A });
    const mine = (await api.call('GET', `/api/repair-orders?technicianId=${TECH_A}&pageSize=200`, { user: FOREMAN_A })).body.items as Array<{ id: string }>;
    expect(mine.map((o) => o.id)).toContain(ro.id);
  });

  it('leaves an order the foreman opens without a technician unassigned, and the board asks the foreman to assign it', async () => {
    const ro = (await open({ vehicle: newVehicle(), complaint: 'Nobody on it yet' })).body;
    expect(ro.technician).toBeNull();
    const { cookie } = await api.sessionOf(FOREMAN_A);
    const board = await (await fetch(`${api.url}/board`, { headers: { cookie } })).text();
    const card = board.slice(board.indexOf(`data-order-number="${ro.number}"`));
    expect(card.slice(0, card.indexOf('</li>'))).toContain('No technician assigned');
    const attention = board.slice(board.indexOf('id="attention-h"'), board.indexOf('id="rest-h"'));
    expect(attention).toContain(ro.number);
  });

  it('tells a technician truthfully that another technician’s order is not theirs, still with no data', async () => {
    const ro = (await open({ vehicle: newVehicle(), complaint: 'Someone else’s', technicianId: TECH_A2 })).body;
    const res = await api.call('GET', `/api/repair-orders/${ro.id}`, { user: TECH_A });
    expect(res.status).toBe(404);
    expect(res.body.error.message).toContain('is not among yours');
    expect(res.body.error.message).not.toContain('in this shop.');
    expect(JSON.stringify(res.body)).not.toContain('Someone else');
    // The foreman, who sees every order of the shop, gets the plain answer for an id that does not exist.
    const missing = await api.call('GET', '/api/repair-orders/00000000-0000-4000-8000-000000000000', { user: FOREMAN_A });
    expect(missing.body.error.message).toContain('No repair order with id');
  });
});
