/**
 * The bay tablet and the foreman's board in a real browser (Debian's Chromium): a technician opens a repair order,
 * identifies the wires, follows the guided tests on a three-wire 5 V circuit with an open signal wire until the
 * cause is found (one reading entered offline, one whose answer is lost), records the repair, proves it, and the
 * foreman approves; the proof PDF carries the approval. Every page is screenshotted at tablet size and checked
 * with axe-core.
 *
 * The readings typed are what the circuit model predicts (`predictReading` on the default three-wire 5 V circuit,
 * with the `signal_open` faults before the repair and none after), so the test follows whatever the tree asks.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { defaultCircuit, faultsFor, predictReading } from '../../src/engine/circuit';
import type { MeasurementRequest } from '../../src/engine/vocabulary';
import { formatEntered } from '../../src/modules/pages/words';
import { readPdf } from '../proof-render/pdf-tools';
import { FIXTURE_PASSWORD, TECH_A, VIN_SAMPLE } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';
import { LANDSCAPE, launch, PORTRAIT, seriousViolations, snap, snapView } from './browser';

interface Entry {
  request: MeasurementRequest;
  phase: 'diagnosis' | 'verification';
  supersedes: string | null;
  mode: string;
  title: string;
}

/** What the meter (or scan tool) would show, as typed: value text and unit. */
function typed(request: MeasurementRequest, faults: 'signal_open' | 'good'): { value: string; unit: string } {
  const p = predictReading(defaultCircuit('three_wire_5v'), faultsFor(faults), request);
  if (!p.ok) throw new Error(`no prediction for ${JSON.stringify(request)}: ${JSON.stringify(p.findings)}`);
  if (p.overload) return { value: 'OL', unit: 'Ω' };
  if (request.quantity === 'ohms') {
    if (p.value >= 1e6) return { value: (p.value / 1e6).toFixed(2), unit: 'MΩ' };
    if (p.value >= 1e3) return { value: (p.value / 1e3).toFixed(2), unit: 'kΩ' };
    return { value: p.value.toFixed(2), unit: 'Ω' };
  }
  return { value: p.value.toFixed(request.quantity === 'scan_value' ? 2 : 3), unit: 'V' };
}

async function tap(page: Page, text: string): Promise<void> {
  if (text === 'OL') return page.locator('.key[data-key="OL"]').click();
  for (const ch of text) await page.locator(`.key[data-key="${ch}"]`).click();
}

async function entryOf(page: Page): Promise<Entry | null> {
  const form = page.locator('#reading-form');
  if ((await form.count()) === 0) return null;
  return JSON.parse((await form.getAttribute('data-entry'))!) as Entry;
}

/** Where an element sits in the viewport now (evaluated in the page: this project type-checks without the DOM library). */
async function box(page: Page, selector: string): Promise<{ top: number; bottom: number; viewport: number } | null> {
  return (await page.evaluate(`(() => {
    const el = document.querySelector(${JSON.stringify(selector)});
    if (!el) return null;
    const r = el.getBoundingClientRect();
    return { top: r.top, bottom: r.bottom, viewport: window.innerHeight };
  })()`)) as { top: number; bottom: number; viewport: number } | null;
}

/** The computed background colours of every element matching the selector. */
async function backgrounds(page: Page, selector: string): Promise<string[]> {
  return (await page.evaluate(`[...document.querySelectorAll(${JSON.stringify(selector)})].map((el) => getComputedStyle(el).backgroundColor)`)) as string[];
}

describe('bay tablet and foreman board in Chromium', () => {
  let api: TestApi;
  let browser: Browser;
  let context: BrowserContext;
  let page: Page;
  let orderId = '';
  let roNumber = '';
  const dialogs: string[] = [];
  const cspViolations: string[] = [];
  const axe: Record<string, unknown[]> = {};
  const check = async (name: string) => {
    await snap(page, name);
    axe[name] = await seriousViolations(page);
  };
  const steps = () => page.locator('.path .step');
  const stored = async (includeSuperseded = true) =>
    (await api.call('GET', `/api/repair-orders/${orderId}/measurements?includeSuperseded=${includeSuperseded}`, { user: TECH_A })).body.items as Array<{ clientKey: string | null; supersedes: string | null; note: string }>;

  /** Enters one reading on the pad (or by typing) and waits until the service has it and the screen shows it. */
  async function enter(value: string, unit: string, options: { typeIt?: boolean; note?: string; waitSaved?: boolean } = {}): Promise<void> {
    const before = await steps().count();
    if (options.typeIt && value !== 'OL') await page.locator('#reading-value').fill(value);
    else await tap(page, value);
    await page.locator(`label.unit:has(input[value="${unit}"])`).click();
    if (options.note) await page.locator('#reading-note').fill(options.note);
    await page.getByRole('button', { name: 'Save reading' }).click();
    if (options.waitSaved !== false) {
      await expect.poll(() => steps().count(), { timeout: 15_000 }).toBe(before + 1);
      await expect.poll(() => page.locator('#unsent').isHidden()).toBe(true);
    }
  }

  beforeAll(async () => {
    api = await startApi('postgresql');
    browser = await launch();
    context = await browser.newContext({ viewport: PORTRAIT, deviceScaleFactor: 1, hasTouch: true });
    page = await context.newPage();
    // Anything the Content Security Policy blocks shows in the console: the pages must need no inline script or style.
    page.on('console', (m) => {
      if (/Content Security Policy/i.test(m.text())) cspViolations.push(m.text());
    });
    page.on('dialog', (d) => {
      dialogs.push(d.message());
      void d.dismiss();
    });
  });

  afterAll(async () => {
    await browser?.close();
    await api?.close();
  });

  /** Signs in on the sign-in page as a person at the tablet would. */
  async function signIn(email: string): Promise<void> {
    await page.locator('#email').fill(email);
    await page.locator('#password').fill(FIXTURE_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
  }

  it('sends a visitor who is not signed in to the sign-in page, and the technician lands on their repair orders', async () => {
    await page.goto(`${api.url}/`);
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await check('01-sign-in');
    await page.locator('#email').fill('one@a.test');
    await page.locator('#password').fill('not the password at all');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect.poll(() => page.locator('.form-error').textContent()).toContain('not right');
    await signIn('one@a.test');
    await page.waitForURL('**/bay');
    await expect.poll(() => page.locator('.who-name').textContent()).toBe('Tech One');
    await check('02-bay-home');
  });

  it('opens a repair order with the VIN checked as it is typed (49 CFR 565 check digit)', async () => {
    await page.getByRole('link', { name: 'New repair order' }).click();
    await page.waitForURL('**/bay/new');
    // The regulation's sample VIN with position 9 changed from 4 to 5: the check digit no longer matches.
    const wrong = `${VIN_SAMPLE.slice(0, 8)}5${VIN_SAMPLE.slice(9)}`;
    await page.locator('#vin').fill(wrong.toLowerCase());
    await expect.poll(() => page.locator('#vin-state').textContent()).toMatch(/check digit/i);
    await expect.poll(() => page.locator('#vin').getAttribute('aria-invalid')).toBe('true');
    await page.locator('#vin').fill(VIN_SAMPLE);
    await expect.poll(() => page.locator('#vin-state').textContent()).toMatch(/Check digit correct/);
    // Position 10 of the VIN is "5": model year 2005 or 2035 (49 CFR 565.15(c)). Another year is pointed out.
    await expect.poll(() => page.locator('#year').inputValue()).toBe('2005');
    await page.locator('#year').fill('2006');
    await expect.poll(() => page.locator('#year-state').textContent()).toContain('stands for 2005 or 2035, not 2006');
    await page.locator('#year').fill('2005');
    await expect.poll(() => page.locator('#year-state').textContent()).toBe('');
    await page.locator('#make').fill('Testmake');
    await page.locator('#model').fill('Testmodel');
    await page.locator('#odometer').fill('88,120');
    await page.locator('#complaint').fill('Reduced power warning; pedal feels dead at times.');
    await page.locator('#codes').fill('p0122');
    await check('03-new-order');
    await page.getByRole('button', { name: 'Open the repair order' }).click();
    await page.waitForURL(/\/bay\/orders\/[0-9a-f-]{36}$/);
    orderId = page.url().split('/').pop()!;
    roNumber = (await page.locator('.order-head .ro-number').textContent())!.trim();
    expect(await page.locator('.codes').textContent()).toContain('P0122');
    await check('04-order');
  });

  it('identifies the wires from one reading per cavity and carries the roles into a new circuit', async () => {
    await page.getByRole('link', { name: /Identify the wires first/ }).click();
    await page.waitForURL('**/wires');
    // Key on, unplugged, to battery negative: 5.00 V reference, 4.87 V biased signal on a 10 MΩ meter, 0 V ground.
    const readings = [['5.00', '', true], ['4.87', '', true], ['0.00', '0.2', false]] as const;
    for (const [i, [volts, ohms, open]] of readings.entries()) {
      await page.locator(`#w-volts-${i}`).fill(volts);
      if (open) await page.locator('[data-row]').nth(i).getByLabel('Meter shows OL').check();
      else await page.locator(`#w-ohms-${i}`).fill(ohms);
    }
    await page.getByRole('button', { name: 'Propose the roles' }).click();
    await expect.poll(() => page.locator('#wires-result').textContent()).toContain('Cavity A: 5 V reference');
    const result = (await page.locator('#wires-result').textContent())!;
    expect(result).toContain('Cavity B: Signal (biased up)');
    expect(result).toContain('Cavity C: Sensor ground');
    await check('05-wires');
    await page.getByRole('link', { name: 'Use these roles for a new circuit' }).click();
    await page.waitForURL(/cavities=/);
    expect(await page.locator('#cav-role-0').inputValue()).toBe('reference');
    expect(await page.locator('#cav-role-1').inputValue()).toBe('signal');
    expect(await page.locator('#cav-role-2').inputValue()).toBe('ground');
    await page.locator('#sensor').fill('TP');
    await page.locator('#label').fill('TP sensor 1');
    await page.getByRole('button', { name: 'Add the circuit and start testing' }).click();
    await page.waitForURL(/\/circuits\/[0-9a-f-]{36}$/);
    await expect.poll(() => page.locator('#entry-h').count()).toBe(1);
  });

  it('follows the guided tests to the cause, with a correction, an offline reading and a lost answer, none stored twice', async () => {
    let saves = 0;
    for (let i = 0; i < 14; i++) {
      const entry = await entryOf(page);
      if (!entry) break;
      expect(entry.phase).toBe('diagnosis');
      // Still testing: nothing is proven, so no repair is offered.
      expect(await page.locator('#repair-form').count()).toBe(0);
      const { value, unit } = typed(entry.request, 'signal_open');
      if (i === 0) {
        await check('06-test');
        // Cautions show as text with an icon, not by colour alone.
        expect(await page.locator('.caution').first().textContent()).toContain('Caution:');
        // On the smaller tablet on its side, where the leads go is on the first screen, under the specific cautions;
        // the general "follow the service information" line is compact, below them.
        await page.setViewportSize(LANDSCAPE);
        await page.evaluate('window.scrollTo(0, 0)');
        const black = await box(page, '.lead-black');
        expect(black!.bottom).toBeLessThanOrEqual(LANDSCAPE.height);
        expect(await page.locator('.caution', { hasText: 'service information' }).count()).toBe(0);
        expect(await page.locator('.caution-general').textContent()).toContain('service information');
        // "Before you start" comes before the steps, in the instructions' own type.
        const order = (await page.evaluate(`[...document.querySelectorAll('.before-start, .procedure')].map((e) => e.className)`)) as string[];
        expect(order).toEqual(['before-start', 'procedure']);
        // The caution colour is the cautions' own: no badge, notice or panel shares it.
        const caution = (await backgrounds(page, '.caution'))[0]!;
        expect(await backgrounds(page, '.tag, .notice, .panel, .conclusion, .saved-note, .condition')).not.toContain(caution);
        // Each badge says what it is about.
        expect(await page.locator('.test-head .tag').allTextContents()).toEqual([expect.stringMatching(/^Order:?\s*Open$/), expect.stringMatching(/^Circuit:?\s*Testing$/)]);
        // What each likely cause would show: a range a meter can display, never a negative resistance.
        expect(await page.locator('.expect').textContent()).not.toMatch(/−|-\d[\d.]* (m|k|M)?Ω/);
        await snapView(page, '06a-test-first-screen');
        await page.setViewportSize(PORTRAIT);
        // Scrolled down to the pad, as a technician is after typing.
        await page.locator('#reading-form button[type=submit]').scrollIntoViewIfNeeded();
        const firstTitle = entry.title;
        await enter(value, unit);
        saves++;
        // The save is confirmed with the value and the test, and the title of the test now asked for is in view.
        await expect.poll(() => page.locator('#saved').textContent()).toContain(`Saved: ${value} ${unit}`);
        expect(await page.locator('#saved').textContent()).toContain(firstTitle);
        const title = await box(page, '#entry-h');
        expect(title!.top).toBeGreaterThanOrEqual(0);
        expect(title!.bottom).toBeLessThanOrEqual(title!.viewport);
        const next = await entryOf(page);
        if (next && next.title !== firstTitle) {
          expect(await page.locator('#saved .test-changed').textContent()).toContain(`The test has changed. Next: ${next.title}`);
          expect(await page.locator('.entry.entry-changed').count()).toBe(1);
        }
        await snapView(page, '06b-test-saved');
        // Correct the first reading (same value, re-read): the old one stays on record, marked corrected.
        await page.locator('.path .step').first().getByRole('link', { name: 'Correct this reading' }).click();
        await page.waitForURL(/correct=/);
        expect((await entryOf(page))!.mode).toBe('correct');
        // The correction screen names the test and the reading on record.
        expect(await page.locator('#entry-h').textContent()).toBe(firstTitle);
        expect(await page.locator('.correcting').textContent()).toContain(`the reading on record is ${value === 'OL' ? formatEntered(null, unit, true) : formatEntered(Number(value), unit)}`);
        await snap(page, '06c-correct');
        await enter(value, unit, { typeIt: true, note: '<script>alert(1)</script> re-read with a sharper probe' });
        saves++;
        expect(await page.locator('.path .verdict-superseded').count()).toBe(1);
        expect(await page.locator('.step-note').first().textContent()).toContain('<script>alert(1)</script>');
      } else if (i === 1) {
        await context.setOffline(true);
        await enter(value, unit, { waitSaved: false });
        await expect.poll(() => page.locator('#unsent').textContent()).toContain('Not yet saved');
        await expect.poll(() => page.locator('#connection').textContent()).toContain('No connection');
        // Evaluated in the page (a string: this project type-checks without the DOM library).
        const [queued] = (await page.evaluate(`JSON.parse(localStorage.getItem('tracebay.unsent.v1') ?? '[]')`)) as Array<{ key: string }>;
        await snap(page, '07-test-offline');
        expect((await stored()).some((m) => m.clientKey === queued!.key)).toBe(false);
        await context.setOffline(false);
        await page.evaluate(`window.dispatchEvent(new Event('online'))`);
        await expect.poll(() => steps().count(), { timeout: 15_000 }).toBe(saves + 1);
        saves++;
        expect((await stored()).filter((m) => m.clientKey === queued!.key)).toHaveLength(1);
      } else if (i === 2) {
        // The service stores the reading but the answer never reaches the tablet: the retry carries the same key.
        let dropped = 0;
        await page.route('**/api/repair-orders/*/measurements', async (route) => {
          if (route.request().method() === 'POST' && dropped === 0) {
            dropped++;
            await route.fetch();
            await route.abort('connectionreset');
            return;
          }
          await route.continue();
        });
        await enter(value, unit, { typeIt: true });
        saves++;
        await page.unroute('**/api/repair-orders/*/measurements');
        expect(dropped).toBe(1);
      } else {
        await enter(value, unit, { typeIt: i % 2 === 1 });
        saves++;
      }
    }
    const all = await stored();
    expect(all).toHaveLength(saves);
    const keys = all.map((m) => m.clientKey);
    expect(new Set(keys).size).toBe(keys.length);
    expect(dialogs).toEqual([]);
    await expect.poll(() => page.locator('#conclusion-h').count()).toBe(1);
    expect(await page.locator('.conclusion').textContent()).toContain('Signal wire open');
    await check('08-test-concluded');
  });

  it('offers no repair while no cause is found, and leaves "What you did" for the technician to write', async () => {
    // Before the cause was found the test screen had no repair form: checked on the first screen of the next test.
    const action = page.locator('#repair-action');
    expect(await action.inputValue()).toBe('');
    expect(await action.getAttribute('placeholder')).toMatch(/\S/);
    await page.getByRole('button', { name: 'Save the repair' }).click();
    await expect.poll(() => page.locator('#repair-form .form-error').isVisible()).toBe(true);
    await action.fill('Cut out the broken section of the signal wire and spliced in new wire with a sealed crimp splice.');
  });

  it('records the repair, takes the verification readings again and marks the repair verified', async () => {
    await page.locator('#repair-location').fill('signal wire 12 cm from the sensor connector');
    await page.locator('#part-name-0').fill('Sealed crimp splice');
    await page.getByRole('button', { name: 'Save the repair' }).click();
    await expect.poll(() => page.locator('#verify-h').count()).toBe(1);
    let first = true;
    for (let i = 0; i < 10; i++) {
      const entry = await entryOf(page);
      if (!entry) break;
      expect(entry.phase).toBe('verification');
      if (first) await check('09-verification');
      first = false;
      const { value, unit } = typed(entry.request, 'good');
      await enter(value, unit, { typeIt: true });
    }
    expect(await page.locator('.verify-list li.todo').count()).toBe(0);
    await page.getByRole('button', { name: 'Mark the repair verified' }).click();
    await expect.poll(() => page.locator('.test-head').textContent()).toContain('Verified');
    await check('10-test-verified');
  });

  it('shows the foreman the verified order waiting for approval, filters by technician, and takes the approval', async () => {
    await page.getByRole('link', { name: 'Sign out' }).click();
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL('**/sign-in');
    await signIn('fore@a.test');
    await page.waitForURL('**/board');
    const card = page.locator(`.board-card[data-order-number="${roNumber}"]`);
    expect(await card.textContent()).toContain('Waiting for your approval');
    await check('11-board');
    await page.locator('#f-tech').selectOption({ label: 'Tech Two' });
    await page.getByRole('button', { name: 'Show' }).click();
    await page.waitForURL(/technician=/);
    expect(await card.count()).toBe(0);
    await page.locator('#f-tech').selectOption({ label: 'Tech One' });
    await page.getByRole('button', { name: 'Show' }).click();
    await page.waitForURL(/technician=/);
    await card.locator('a').click();
    await page.waitForURL(/\/board\/orders\//);
    expect(await page.locator('.path .step').count()).toBeGreaterThan(3);
    // The technician who opened it works on it; the foreman can give it to someone else from here.
    expect((await page.locator('#assign-tech option:checked').textContent())!.trim()).toBe('Tech One');
    await check('12-board-review');
    await page.locator('#review-comment').fill('Clean splice, readings back in range.');
    await page.getByRole('button', { name: 'Approve' }).click();
    await expect.poll(() => page.locator('.review-approved').count()).toBe(1);
    await check('13-board-approved');
  });

  it('opens the proof PDF, which carries the approval', async () => {
    const href = await page.locator('a[data-proof]').getAttribute('href');
    const response = await context.request.get(`${api.url}${href}`);
    expect(response.status()).toBe(200);
    expect(response.headers()['content-type']).toContain('application/pdf');
    const pdf = await response.body();
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    const text = (await readPdf(pdf)).pages.map((p) => p.text).join('\n');
    expect(text).toContain('Fore Person');
    expect(text).toContain(roNumber);
  });

  it('has an accessibility check that does catch a serious violation (an image without text, a button without a name)', async () => {
    const probe = await context.newPage();
    await probe.setContent('<!doctype html><html lang="en"><title>probe</title><main><img src="x.png"><button></button></main></html>');
    const ids = (await seriousViolations(probe)).map((v) => v.id);
    await probe.close();
    expect(ids).toEqual(expect.arrayContaining(['image-alt', 'button-name']));
  });

  it('loads every page under the strict Content Security Policy without a blocked script or style', () => {
    expect(cspViolations).toEqual([]);
  });

  it('finds no serious or critical accessibility violations on any page (axe-core)', () => {
    expect(Object.keys(axe).length).toBeGreaterThanOrEqual(12);
    expect(Object.fromEntries(Object.entries(axe).filter(([, v]) => v.length > 0))).toEqual({});
  });
});

