/**
 * What technicians and foremen ran into on the bay and the board, over HTTP on both back ends: numbers typed with
 * digit grouping, who an order opened by a technician belongs to, and what a technician is told about an order
 * that is not theirs.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS } from '../support/db';
import { FOREMAN_A, newVehicle, TECH_A, TECH_A2, VIN_SAMPLE, VIN_TEXTBOOK } from '../support/fixtures';
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

  it('warns, without refusing, when the model year does not fit the VIN’s 10th character (49 CFR 565.15(c))', async () => {
    // VIN_TEXTBOOK 1M8GDM9AXKP042788: position 10 is "K", model year 1989 or 2019.
    const res = await open({ vehicle: newVehicle({ vin: VIN_TEXTBOOK, year: 2018 }), complaint: 'Year typo' });
    expect(res.status).toBe(201);
    const warning = res.body.warnings.find((w: { code: string }) => w.code === 'vehicle.year_not_vin_year');
    expect(warning).toMatchObject({ path: 'body.vehicle.year' });
    expect(warning.message).toContain('1989 or 2019, not 2018');
  });

  it('points out a VIN already on file with another model year, and the VIN check says what is on file', async () => {
    // 1G4AH59H45G118341: the 49 CFR 565 sample VIN, position 10 "5" (2005).
    expect((await open({ vehicle: newVehicle({ vin: VIN_SAMPLE, year: 2005 }), complaint: 'First visit' })).body.warnings).toBeUndefined();
    const again = await open({ vehicle: newVehicle({ vin: VIN_SAMPLE, year: 2006 }), complaint: 'Second visit' });
    expect(again.status).toBe(201);
    expect(again.body.warnings.map((w: { code: string }) => w.code)).toEqual(['vehicle.year_not_vin_year', 'vehicle.on_file_year_differs']);
    expect(again.body.warnings[1].message).toContain('already on file as a 2005 Testmake Testmodel');
    expect(again.body.vehicle).toMatchObject({ vin: VIN_SAMPLE });
    const check = await api.call('GET', `/api/vins/${VIN_SAMPLE}`, { user: FOREMAN_A });
    expect(check.body).toMatchObject({ ok: true, modelYearCandidates: [2005, 2035], onFile: { year: 2005, make: 'Testmake', model: 'Testmodel' } });
  });

  it.each([
    ['/bay/ordrs', 'text/html,application/xhtml+xml', 'html'],
    ['/bored', 'text/html', 'html'],
    ['/bay/ordrs', 'application/json', 'json'],
    ['/api/repair-ordrs', 'text/html', 'json'],
  ])('answers the mistyped address %s asked for as %s with a %s "Not found"', async (path, accept, kind) => {
    const res = await fetch(api.url + path, { headers: { accept } });
    expect(res.status).toBe(404);
    const body = await res.text();
    if (kind === 'html') {
      expect(res.headers.get('content-type')).toContain('text/html');
      expect(body).toContain('<h1>Not found</h1>');
      expect(body).toContain(`There is no page at ${path}`);
    } else {
      expect(JSON.parse(body).error.code).toBe('route.not_found');
    }
  });

  it('answers every probability of a diagnosis rounded to 4 decimals, without float noise', async () => {
    const ro = (await open({ vehicle: newVehicle(), complaint: 'Rounded', technicianId: TECH_A })).body;
    const circuit = (await api.call('POST', `/api/repair-orders/${ro.id}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'TP', label: 'TP 1' } })).body;
    const res = await api.call('GET', `/api/repair-orders/${ro.id}/circuits/${circuit.id}/diagnosis`, { user: TECH_A });
    expect(res.status).toBe(200);
    const probabilities = [...JSON.stringify(res.body).matchAll(/"probability":(-?[0-9.eE+-]+)/g)].map((m) => m[1]!);
    expect(probabilities.length).toBeGreaterThan(3);
    for (const p of probabilities) expect(p).toMatch(/^(0|1)(\.\d{1,4})?$/);
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
