/**
 * Debian's Chromium driven by playwright-core: launching it, screenshots at tablet size for review, and an
 * accessibility check with axe-core (Deque's open-source rules for WCAG 2.x).
 */
import { existsSync, mkdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';
import { afterAll, beforeAll } from 'vitest';
import { startApi, type TestApi } from '../support/http';

export const CHROMIUM = '/usr/bin/chromium';
export const SCREENSHOTS = resolve(__dirname, '..', '..', 'artifacts', 'screenshots');

/** A 10-inch tablet in CSS pixels upright, and a smaller one on its side. */
export const PORTRAIT = { width: 800, height: 1280 };
export const LANDSCAPE = { width: 1024, height: 768 };

export async function launch(): Promise<Browser> {
  if (!existsSync(CHROMIUM)) throw new Error(`${CHROMIUM} is missing: apt-get install -y chromium (.ci/run does it)`);
  // playwright-core gives every launch a fresh temporary profile (its own --user-data-dir) and adds --headless.
  return chromium.launch({
    executablePath: CHROMIUM,
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}

/** Full-page screenshots of the current page, portrait then landscape, back in portrait afterwards. */
export async function snap(page: Page, name: string): Promise<string[]> {
  mkdirSync(SCREENSHOTS, { recursive: true });
  const files: string[] = [];
  for (const [label, size] of [['portrait', PORTRAIT], ['landscape', LANDSCAPE]] as const) {
    await page.setViewportSize(size);
    const file = join(SCREENSHOTS, `${name}-${label}.png`);
    await page.screenshot({ path: file, fullPage: true });
    files.push(file);
  }
  await page.setViewportSize(PORTRAIT);
  return files;
}

const AXE_SOURCE = readFileSync(require.resolve('axe-core/axe.min.js'), 'utf8');

export interface AxeProblem {
  id: string;
  impact: string;
  help: string;
  targets: string[];
}

/** Serious and critical axe-core violations on the page as it is now (WCAG 2.0/2.1/2.2 A and AA rules, best practices). */
export async function seriousViolations(page: Page): Promise<AxeProblem[]> {
  // Evaluated in the page (strings: this project type-checks without the DOM library).
  // Evaluated through the debugging protocol, not as an inline <script>: the pages' CSP rightly refuses those.
  if (!(await page.evaluate(`'axe' in window`))) await page.evaluate(AXE_SOURCE);
  const violations = (await page.evaluate(`axe.run(document, { resultTypes: ['violations'] }).then((r) =>
    r.violations.map((v) => ({ id: v.id, impact: v.impact, help: v.help, targets: v.nodes.slice(0, 3).map((n) => n.target.join(' ')) })))`)) as AxeProblem[];
  return violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
}

/** What the person sees right now: the viewport only, not the whole page. */
export async function snapView(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOTS, { recursive: true });
  const file = join(SCREENSHOTS, `${name}-view.png`);
  await page.screenshot({ path: file, fullPage: false });
  return file;
}

/** An API on PostgreSQL and a portrait tablet page for a test file: started before its tests, closed after them. */
export function pageAndApi(): { readonly api: TestApi; readonly page: Page } {
  const s = {} as { api: TestApi; page: Page; browser?: Browser };
  beforeAll(async () => {
    s.api = await startApi('postgresql');
    s.browser = await launch();
    s.page = await (await s.browser.newContext({ viewport: PORTRAIT, deviceScaleFactor: 1 })).newPage();
  }, 60_000);
  afterAll(async () => {
    await s.browser?.close();
    await s.api?.close();
  });
  return s;
}
