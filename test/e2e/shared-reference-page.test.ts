/**
 * The bay's order page with a shared 5 V reference: the panel names the circuits on the reference and the next test
 * for the whole order, passes axe-core's serious and critical rules, and is screenshotted at tablet size.
 */
import { describe, expect, it } from 'vitest';
import { FIXTURE_EMAILS, FIXTURE_PASSWORD, FOREMAN_A, newVehicle, TECH_A } from '../support/fixtures';
import { pageAndApi, seriousViolations, snap } from './browser';

describe('the order page with a shared 5 V reference', () => {
  const s = pageAndApi();

  it('shows which circuits share the reference and the next test for the order', async () => {
    const ro = (await s.api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'TP, MAP and FTP all read low', codes: ['P0641'], technicianId: TECH_A } })).body;
    const ids: string[] = [];
    for (const term of ['TP', 'MAP', 'FTP']) ids.push((await s.api.call('POST', `/api/repair-orders/${ro.id}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: term, label: `${term} sensor` } })).body.id);
    expect((await s.api.call('POST', `/api/repair-orders/${ro.id}/reference-groups`, { user: TECH_A, body: { circuitIds: ids } })).status).toBe(201);
    const reference = { quantity: 'dc_volts', at: 'reference', against: 'battery_negative', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', value: 1.42, unit: 'V' };
    for (const id of ids.slice(0, 2)) expect((await s.api.call('POST', `/api/repair-orders/${ro.id}/measurements`, { user: TECH_A, body: { circuitId: id, ...reference } })).status).toBe(201);

    await s.page.goto(`${s.api.url}/sign-in`);
    await s.page.locator('#email').fill(FIXTURE_EMAILS[TECH_A]!);
    await s.page.locator('#password').fill(FIXTURE_PASSWORD);
    await s.page.getByRole('button', { name: 'Sign in' }).click();
    await s.page.waitForURL(/\/bay/);
    await s.page.goto(`${s.api.url}/bay/orders/${ro.id}`);
    const panel = s.page.locator('#order-view');
    await expect.poll(() => panel.isVisible()).toBe(true);
    const text = await panel.innerText();
    expect(text).toMatch(/One 5 V reference feeds: TP sensor, MAP sensor, FTP sensor/);
    expect(text).toMatch(/Next test for the order: Shared reference/);
    // The group's state is named as the shared reference's, and the order's next test carries its cautions.
    expect(text).toMatch(/Shared reference\s+TESTING/i);
    expect(text).toMatch(/Caution:\s+Follow the manufacturer/);
    expect(await seriousViolations(s.page)).toEqual([]);
    await snap(s.page, 'shared-reference-order');
  }, 60_000);
});
