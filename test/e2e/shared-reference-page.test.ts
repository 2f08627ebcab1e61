/**
 * The bay's order page with a shared 5 V reference: the panel names the circuits on the reference and the next test
 * for the whole order, passes axe-core's serious and critical rules, and is screenshotted at tablet size.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { FIXTURE_EMAILS, FIXTURE_PASSWORD, FOREMAN_A, newVehicle, TECH_A } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';
import { launch, PORTRAIT, seriousViolations, snap } from './browser';

describe('the order page with a shared 5 V reference', () => {
  let api: TestApi;
  let browser: Browser;
  let page: Page;

  beforeAll(async () => {
    api = await startApi('postgresql');
    browser = await launch();
    page = await (await browser.newContext({ viewport: PORTRAIT, deviceScaleFactor: 1 })).newPage();
  });
  afterAll(async () => {
    await browser?.close();
    await api?.close();
  });

  it('shows which circuits share the reference and the next test for the order', async () => {
    const ro = (await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'TP, MAP and FTP all read low', codes: ['P0641'], technicianId: TECH_A } })).body;
    const ids: string[] = [];
    for (const term of ['TP', 'MAP', 'FTP']) ids.push((await api.call('POST', `/api/repair-orders/${ro.id}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: term, label: `${term} sensor` } })).body.id);
    expect((await api.call('POST', `/api/repair-orders/${ro.id}/reference-groups`, { user: TECH_A, body: { circuitIds: ids } })).status).toBe(201);
    const reference = { quantity: 'dc_volts', at: 'reference', against: 'battery_negative', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', value: 1.42, unit: 'V' };
    for (const id of ids.slice(0, 2)) expect((await api.call('POST', `/api/repair-orders/${ro.id}/measurements`, { user: TECH_A, body: { circuitId: id, ...reference } })).status).toBe(201);

    await page.goto(`${api.url}/sign-in`);
    await page.locator('#email').fill(FIXTURE_EMAILS[TECH_A]!);
    await page.locator('#password').fill(FIXTURE_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(/\/bay/);
    await page.goto(`${api.url}/bay/orders/${ro.id}`);
    const panel = page.locator('#order-view');
    await expect.poll(() => panel.isVisible()).toBe(true);
    const text = await panel.innerText();
    expect(text).toMatch(/One 5 V reference feeds: TP sensor, MAP sensor, FTP sensor/);
    expect(text).toMatch(/Next test for the order: Shared reference/);
    // The group's state is named as the shared reference's, and the order's next test carries its cautions.
    expect(text).toMatch(/Shared reference\s+TESTING/i);
    expect(text).toMatch(/Caution:\s+Follow the manufacturer/);
    expect(await seriousViolations(page)).toEqual([]);
    await snap(page, 'shared-reference-order');
  }, 60_000);
});
