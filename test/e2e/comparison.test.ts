// The test screen draws a comparison: both readings, the PID of each, which one the pad takes now, the difference
// and what each outcome means; a screenshot for review.
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

it('draws the coolant against intake-air comparison with the coolant reading taken and intake air to take now', async () => {
  const tree = builtInTrees()['two-wire-thermistor']!;
  const ro = (await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'Hard start cold, P0128 stored', technicianId: TECH_A } })).body;
  const circuit = (await api.call('POST', `/api/repair-orders/${ro.id}/circuits`, { user: TECH_A, body: { kind: 'two_wire_thermistor', sensor: 'ECT', label: 'ECT sensor' } })).body;
  const request = (id: string) => tree.tests.find((t) => t.id === id)!.request;
  // A signal in the working range on the meter and the scan tool, a sound sensor ground, then the coolant PID (SAE
  // J1979 PID 05) read after a cold soak: the comparison is the next test whether or not the planner has time to look
  // two steps ahead.
  const taken = [
    [request('signal_backprobed'), 2.1, 'V'],
    [request('scan_signal_plugged'), 2.09, 'V'],
    [request('ground_drop_backprobed'), 0.01, 'V'],
    [request('coolant_against_intake_cold_soak'), 41, '°C'],
  ] as const;
  for (const [i, [request, value, unit]] of taken.entries()) {
    const key = `cmp-e2e-${i}`;
    const posted = await api.call('POST', `/api/repair-orders/${ro.id}/measurements`, { user: TECH_A, body: { circuitId: circuit.id, ...request, value, unit, clientKey: key } });
    expect(posted.status, JSON.stringify(posted.body)).toBe(201);
  }
  await page.goto(`${api.url}/sign-in`);
  await page.locator('#email').fill('one@a.test');
  await page.locator('#password').fill(FIXTURE_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
  await page.goto(`${api.url}/bay/orders/${ro.id}/circuits/${circuit.id}`);
  await expect.poll(() => page.locator('#entry-h').innerText()).toContain('Intake air temperature (IAT), PID 0F');
  const table = await page.locator('table.comparison').innerText();
  expect(table).toContain('Engine coolant temperature (ECT), PID 05');
  expect(table).toContain('41 °C');
  expect(table).toContain('take it now');
  expect(table).toContain('first − second');
  expect(await page.locator('.comparison-outcomes').innerText()).toContain('Coolant reads warmer than intake air');
  // What each likely cause would make the difference: in °C, signed.
  expect(await page.locator('table.expect').innerText()).toMatch(/[−+]?\d+ °C to [−+]?\d+ °C \(first less second\)/);
  // The pad offers °C first for a temperature PID.
  expect(await page.locator('input[name="unit"]').first().getAttribute('value')).toBe('°C');
  await snap(page, 'comparison-cold-soak');
}, 60_000);
