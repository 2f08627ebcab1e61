// The test screen draws a lead at each end of the harness: both ends named, both connectors' states, a screenshot for review.
import { expect, it } from 'vitest';
import { builtInTrees } from '../../src/engine/diagnosis';
import { FIXTURE_PASSWORD, FOREMAN_A, newVehicle, TECH_A } from '../support/fixtures';
import { pageAndApi, snap } from './browser';

const s = pageAndApi();

it('draws a wire ohmed end to end with both ends named', async () => {
  const ro = (await s.api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'P0122 stored', technicianId: TECH_A } })).body;
  const circuit = (await s.api.call('POST', `/api/repair-orders/${ro.id}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'TP', label: 'TP sensor 1', cavities: { A: 'reference', B: 'signal', C: 'ground' } } })).body;
  const request = builtInTrees()['three-wire-5v']!.tests.find((t) => t.id === 'signal_end_to_end')!.request;
  const posted = await s.api.call('POST', `/api/repair-orders/${ro.id}/measurements`, { user: TECH_A, body: { circuitId: circuit.id, ...request, value: 0.3, unit: 'ohm', clientKey: 'lead-at-each-end-1' } });
  expect(posted.status, JSON.stringify(posted.body)).toBe(201);
  await s.page.goto(`${s.api.url}/sign-in`);
  await s.page.locator('#email').fill('one@a.test');
  await s.page.locator('#password').fill(FIXTURE_PASSWORD);
  await s.page.getByRole('button', { name: 'Sign in' }).click();
  await s.page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
  await s.page.goto(`${s.api.url}/bay/orders/${ro.id}/circuits/${circuit.id}?correct=${posted.body.id}`);
  const text = await s.page.locator('.leads').innerText();
  expect(text).toContain('signal wire (cavity B) at the sensor connector');
  expect(text).toContain('signal wire, its pin at the module connector');
  await snap(s.page, 'lead-at-each-end');
}, 60_000);
