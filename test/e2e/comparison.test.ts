// The test screen draws a comparison: both readings, the PID of each, which one the pad takes now, the difference
// and what each outcome means; a screenshot for review.
import { expect, it } from 'vitest';
import { builtInTrees } from '../../src/engine/diagnosis';
import { FIXTURE_PASSWORD, FOREMAN_A, newVehicle, TECH_A } from '../support/fixtures';
import { pageAndApi, snap } from './browser';

const s = pageAndApi();

it('draws the coolant against intake-air comparison with the coolant reading taken and intake air to take now', async () => {
  const tree = builtInTrees()['two-wire-thermistor']!;
  const ro = (await s.api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'Hard start cold, P0128 stored', technicianId: TECH_A } })).body;
  const circuit = (await s.api.call('POST', `/api/repair-orders/${ro.id}/circuits`, { user: TECH_A, body: { kind: 'two_wire_thermistor', sensor: 'ECT', label: 'ECT sensor' } })).body;
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
    const posted = await s.api.call('POST', `/api/repair-orders/${ro.id}/measurements`, { user: TECH_A, body: { circuitId: circuit.id, ...request, value, unit, clientKey: key } });
    expect(posted.status, JSON.stringify(posted.body)).toBe(201);
  }
  await s.page.goto(`${s.api.url}/sign-in`);
  await s.page.locator('#email').fill('one@a.test');
  await s.page.locator('#password').fill(FIXTURE_PASSWORD);
  await s.page.getByRole('button', { name: 'Sign in' }).click();
  await s.page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
  await s.page.goto(`${s.api.url}/bay/orders/${ro.id}/circuits/${circuit.id}`);
  await expect.poll(() => s.page.locator('#entry-h').innerText()).toContain('Intake air temperature (IAT), PID 0F');
  const table = await s.page.locator('table.comparison').innerText();
  expect(table).toContain('Engine coolant temperature (ECT), PID 05');
  expect(table).toContain('41 °C');
  expect(table).toContain('take it now');
  expect(table).toContain('first − second');
  expect(await s.page.locator('.comparison-outcomes').innerText()).toContain('Coolant reads warmer than intake air');
  // What each likely cause would make the difference: in °C, signed.
  expect(await s.page.locator('table.expect').innerText()).toMatch(/[−+]?\d+ °C to [−+]?\d+ °C \(first less second\)/);
  // The pad offers °C first for a temperature PID.
  expect(await s.page.locator('input[name="unit"]').first().getAttribute('value')).toBe('°C');
  await snap(s.page, 'comparison-cold-soak');
}, 60_000);
