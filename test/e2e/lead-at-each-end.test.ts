// The test screen draws a lead at each end of the harness: both ends named, both connectors' states, a screenshot for review.
import { afterAll, beforeAll, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { builtInTrees } from '../../src/engine/diagnosis';
import { FIXTURE_PASSWORD, FOREMAN_A, newVehicle, TECH_A } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';
import { launch, PORTRAIT, snap } from './browser';

let api: TestApi;
let browser: Browser;
let page: Page;
beforeAll(async () => {
  api = await startApi('postgresql');
  browser = await launch();
  page = await (await browser.newContext({ viewport: PORTRAIT })).newPage();
}, 60_000);
afterAll(async () => {
  await browser?.close();
  await api?.close();
});

it('draws a wire ohmed end to end with both ends named', async () => {
  const ro = (await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'P0122 stored', technicianId: TECH_A } })).body;
  const circuit = (await api.call('POST', `/api/repair-orders/${ro.id}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'TP', label: 'TP sensor 1', cavities: { A: 'reference', B: 'signal', C: 'ground' } } })).body;
  const request = builtInTrees()['three-wire-5v']!.tests.find((t) => t.id === 'signal_end_to_end')!.request;
  const posted = await api.call('POST', `/api/repair-orders/${ro.id}/measurements`, { user: TECH_A, body: { circuitId: circuit.id, ...request, value: 0.3, unit: 'ohm', clientKey: 'lead-at-each-end-1' } });
  expect(posted.status, JSON.stringify(posted.body)).toBe(201);
  await page.goto(`${api.url}/sign-in`);
  await page.locator('#email').fill('one@a.test');
  await page.locator('#password').fill(FIXTURE_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
  await page.goto(`${api.url}/bay/orders/${ro.id}/circuits/${circuit.id}?correct=${posted.body.id}`);
  const text = await page.locator('.leads').innerText();
  expect(text).toContain('signal wire (cavity B) at the sensor connector');
  expect(text).toContain('signal wire, its pin at the module connector');
  await snap(page, 'lead-at-each-end');
}, 60_000);
