/**
 * The bay and board pages over plain HTTP: sign-in (session cookie), where each person lands, the VIN check
 * the new-order page calls, escaping of everything a person typed, and who may see the board.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { html, raw } from '../../src/modules/pages/html';
import { conditions, leads, requestLine } from '../../src/modules/pages/words';
import type { MeasurementRequest } from '../../src/engine/vocabulary';
import { BACKENDS } from '../support/db';
import { FIXTURE_PASSWORD, FOREMAN_A, INACTIVE_A, newVehicle, TECH_A, TECH_B, VIN_SAMPLE, VIN_TEXTBOOK } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';

describe('the html template', () => {
  it.each([
    ['<script>alert(1)</script>', '&lt;script&gt;alert(1)&lt;/script&gt;'],
    ['" onmouseover="x', '&quot; onmouseover=&quot;x'],
    ["it's & <b>", 'it&#39;s &amp; &lt;b&gt;'],
    ['`back`', '&#96;back&#96;'],
  ])('escapes %j as %j', (input, expected) => {
    expect(html`<p title="${input}">${input}</p>`.value).toBe(`<p title="${expected}">${expected}</p>`);
  });

  it('names both ends when a lead goes to each end of the harness, and the state of both connectors', () => {
    const request: MeasurementRequest = { quantity: 'ohms', at: 'signal', against: 'signal', location: 'sensor_connector', againstLocation: 'module_connector', connector: 'unplugged', otherConnector: 'unplugged', key: 'off', engine: 'off', jumpers: [] };
    const l = leads(request, { B: 'signal' });
    expect(l.red).toBe('signal wire (cavity B) at the sensor connector');
    expect(l.black).toBe('signal wire, its pin at the module connector');
    expect(requestLine(request, { B: 'signal' })).toBe('ohms: signal wire (cavity B) at the sensor connector to signal wire, its pin at the module connector, a lead at each end of the harness, key off, engine stopped, sensor connector unplugged, module connector unplugged');
    expect(conditions(request)).toEqual(expect.arrayContaining([{ label: 'Sensor connector', value: 'unplugged' }, { label: 'Module connector', value: 'unplugged' }]));
  });

  it("draws leads on the sensor's own pins as on the component, with the sensor unplugged", () => {
    const request: MeasurementRequest = { quantity: 'ohms', at: 'signal', against: 'ground', location: 'sensor_pins', connector: 'unplugged', key: 'off', engine: 'off', jumpers: [] };
    expect(leads(request, { B: 'signal' })).toEqual({
      red: 'signal pin on the sensor itself',
      black: 'sensor ground pin on the sensor itself',
      where: "Leads on the sensor's own pins, sensor unplugged: on the component itself, not the harness connector",
    });
    expect(conditions(request)).toContainEqual({ label: 'Sensor', value: 'unplugged, leads on its own pins' });
    expect(requestLine({ ...request, otherConnector: 'plugged' })).toContain('sensor unplugged, module connector plugged in');
  });

  it('says plainly to press the throttle fully and hold when a test moves the input, and nothing when it stays at rest', () => {
    const request: MeasurementRequest = { quantity: 'dc_volts', at: 'signal', against: 'battery_negative', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', sensorInput: 'moved', jumpers: [] };
    expect(conditions(request)).toContainEqual({ label: 'Input', value: 'press the throttle fully and hold' });
    expect(requestLine(request)).toMatch(/press the throttle fully and hold$/);
    expect(conditions({ ...request, sensorInput: undefined }).map((c) => c.label)).not.toContain('Input');
  });

  it('keeps nested templates and raw markup as they are, joins lists and drops null, undefined and booleans', () => {
    const items = ['a<', 'b'].map((s) => html`<li>${s}</li>`);
    expect(html`<ul>${items}</ul>${raw('<hr>')}${null}${undefined}${false}${0}`.value).toBe('<ul><li>a&lt;</li><li>b</li></ul><hr>0');
  });
});

describe.each(BACKENDS)('bay and board pages over HTTP on the %s database', (backend) => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startApi(backend);
  });
  afterAll(async () => api?.close());

  const sessions = new Map<string, Promise<{ cookie: string; csrf: string }>>();
  const session = (user: string) => {
    if (!sessions.has(user)) sessions.set(user, api.sessionOf(user));
    return sessions.get(user)!;
  };
  const page = async (path: string, user?: string) =>
    fetch(api.url + path, { redirect: 'manual', headers: user ? { cookie: (await session(user)).cookie } : {} });

  it.each(['/', '/bay', '/board', '/bay/new'])('sends %s without a sign-in to the sign-in page', async (path) => {
    const res = await page(path);
    expect(res.status).toBe(303);
    expect(res.headers.get('location')).toBe(path === '/' ? '/sign-in' : `/sign-in?next=${encodeURIComponent(path)}`);
  });

  it('sends a session cookie the service never issued to the sign-in page too, and clears it', async () => {
    const res = await fetch(`${api.url}/bay`, { redirect: 'manual', headers: { cookie: 'tracebay_session=AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA' } });
    expect(res.status).toBe(303);
    expect(res.headers.get('set-cookie')).toMatch(/^tracebay_session=;/);
  });

  it('lets nobody inactive sign in: the page stays on sign-in', async () => {
    const { cookie } = await session(INACTIVE_A);
    expect(cookie).not.toContain('tracebay_session=');
    const res = await page('/bay', INACTIVE_A);
    expect(res.headers.get('location')).toBe('/sign-in?next=%2Fbay');
  });

  it('shows a sign-in form that lists nobody: no names, no shops before sign-in', async () => {
    const res = await page('/sign-in');
    const text = await res.text();
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toContain('text/html');
    expect(text).toContain('name="password"');
    expect(text).toContain('name="_csrf"');
    for (const name of ['Fore Person', 'Tech One', 'Other Tech', 'Test Bay One']) expect(text).not.toContain(name);
  });

  /** Signs in through the form as a browser would: the pre-session cookie and the hidden field must match. */
  async function formSignIn(email: string, next?: string) {
    const form = await fetch(`${api.url}/sign-in`);
    const pre = form.headers.getSetCookie().map((c) => c.split(';')[0]!).join('; ');
    const token = /name="_csrf" value="([^"]+)"/.exec(await form.text())![1]!;
    const fields = new URLSearchParams({ _csrf: token, email, password: FIXTURE_PASSWORD, ...(next ? { next } : {}) });
    return fetch(`${api.url}/sign-in`, { method: 'POST', redirect: 'manual', headers: { 'content-type': 'application/x-www-form-urlencoded', cookie: pre }, body: fields.toString() });
  }

  it.each([
    ['one@a.test', '/bay'],
    ['fore@a.test', '/board'],
  ])('signs %s in with a SameSite=Lax, HttpOnly session cookie and sends them to %s', async (email, home) => {
    const res = await formSignIn(email);
    expect(res.status).toBe(303);
    expect(res.headers.get('location')).toBe(home);
    const cookie = res.headers.getSetCookie().find((c) => c.startsWith('tracebay_session='))!;
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
  });

  it('returns to the page asked for after signing in, but never to another site', async () => {
    expect((await formSignIn('one@a.test', '/bay/new')).headers.get('location')).toBe('/bay/new');
    expect((await formSignIn('one@a.test', '//elsewhere.example/x')).headers.get('location')).toBe('/bay');
    expect((await formSignIn('one@a.test', 'https://elsewhere.example/')).headers.get('location')).toBe('/bay');
  });

  it('keeps the board from technicians with a page that says why', async () => {
    const res = await page('/board', TECH_A);
    expect(res.status).toBe(403);
    expect(await res.text()).toContain('for the foreman');
  });

  it('answers a repair order of another shop with a not-found page', async () => {
    const created = await api.call('POST', '/api/repair-orders', { user: TECH_A, body: { vehicle: newVehicle(), complaint: 'Stalls' } });
    const res = await page(`/bay/orders/${created.body.id}`, TECH_B);
    expect(res.status).toBe(404);
    expect(res.headers.get('content-type')).toContain('text/html');
  });

  it.each([
    // 49 CFR 565 sample VIN (check digit 4) and the textbook one (check digit X).
    [VIN_SAMPLE, true, 'valid'],
    [VIN_TEXTBOOK.toLowerCase(), true, 'valid'],
    ['1M8GDM9A1KP042788', false, 'vin.check_digit_mismatch'],
    ['1M8GDM9AXKP04278', false, 'vin.wrong_length'],
  ])('checks the VIN %s as typed with the service rule (ok: %s, %s)', async (vin, ok, code) => {
    const res = await api.call('GET', `/api/vins/${vin}`, { user: TECH_A });
    expect(res.status).toBe(200);
    expect(res.body.ok).toBe(ok);
    if (ok) expect(res.body.checkDigit).toBe(code);
    else expect(res.body.findings[0].code).toBe(code);
  });

  it('shows the high-voltage caution first on every test screen of a hybrid, and fuel vapour care at the tank sensor', async () => {
    const screen = async (vehicle: Record<string, unknown>, sensor: string) => {
      const order = await api.call('POST', '/api/repair-orders', { user: TECH_A, body: { vehicle, complaint: 'Evap code' } });
      const circuit = await api.call('POST', `/api/repair-orders/${order.body.id}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor, label: `${sensor} sensor` } });
      return (await page(`/bay/orders/${order.body.id}/circuits/${circuit.body.id}`, TECH_A)).text();
    };
    const hybrid = await screen(newVehicle({ vin: VIN_SAMPLE, highVoltageSystem: true }), 'FTP');
    const cautions = hybrid.slice(hybrid.indexOf('class="cautions"'));
    expect(cautions).toContain('high-voltage system (hybrid or electric): only people qualified');
    expect(cautions.indexOf('high-voltage system')).toBeLessThan(cautions.indexOf('Caution:', cautions.indexOf('Caution:') + 1));
    expect(hybrid).toContain('Fuel vapour at the tank');
    const plain = await screen(newVehicle(), 'MAP');
    expect(plain).not.toContain('only people qualified');
    expect(plain).not.toContain('Fuel vapour');
  });

  it('shows on the test screen which of the order’s codes weighed the causes, in plain words, without the caution colour', async () => {
    const order = await api.call('POST', '/api/repair-orders', { user: TECH_A, body: { vehicle: newVehicle(), complaint: 'Reduced power', codes: ['P0123', 'P0107'] } });
    const circuit = await api.call('POST', `/api/repair-orders/${order.body.id}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'TP A', label: 'TP sensor 1' } });
    const text = await (await page(`/bay/orders/${order.body.id}/circuits/${circuit.body.id}`, TECH_A)).text();
    const panel = text.slice(text.indexOf('id="codes-h"'), text.indexOf('</section>', text.indexOf('id="codes-h"')));
    // P0123: TP "A" circuit high input (SAE J2012, generic code list); window: common practice, no source
    expect(panel).toContain('<span class="code">P0123</span>');
    expect(panel).toContain('high input');
    expect(panel).toContain('Read as: signal above about 4.8 V');
    expect(panel).toContain('It makes likelier:');
    const [likelier, less] = panel.slice(panel.indexOf('It makes likelier:')).split('Less likely:');
    // Its prior is 0.04 of the priors summed (1.12 on the three-wire tree): 3.6 %.
    expect(likelier).toMatch(/signal wire shorted to a battery-voltage circuit \(3\.6 % → \d+ %\)/);
    // A high signal cannot come from a signal wire held at ground.
    expect(less).toContain('signal wire shorted to ground');
    expect(panel).toContain('Not weighed: concerns MAP, not this circuit.');
    expect(panel).not.toContain('caution');
  });

  it('draws a comparison on the test screen: both readings, the PID of each, their difference and its outcome', async () => {
    const order = await api.call('POST', '/api/repair-orders', { user: TECH_A, body: { vehicle: newVehicle(), complaint: 'Hard start cold' } });
    const circuit = await api.call('POST', `/api/repair-orders/${order.body.id}/circuits`, { user: TECH_A, body: { kind: 'two_wire_thermistor', sensor: 'ECT', label: 'ECT sensor' } });
    const base = { circuitId: circuit.body.id, quantity: 'scan_value', at: 'signal', location: 'sensor_connector', connector: 'plugged', key: 'on', engine: 'off', jumpers: [] };
    // SAE J1979 PID 05 (coolant) against PID 0F (intake air) after a cold soak: 20 °C apart.
    for (const [pid, value] of [['05', 41], ['0F', 21]] as const)
      expect((await api.call('POST', `/api/repair-orders/${order.body.id}/measurements`, { user: TECH_A, body: { ...base, pid, value, unit: '°C', clientKey: `page-cmp-${pid}` } })).status).toBe(201);
    const text = await (await page(`/bay/orders/${order.body.id}/circuits/${circuit.body.id}`, TECH_A)).text();
    const panel = text.slice(text.indexOf('id="cmp-h"'), text.indexOf('</section>', text.indexOf('id="cmp-h"')));
    expect(panel).toContain('Coolant against intake-air temperature after a cold soak');
    expect(panel).toContain('Engine coolant temperature (ECT), PID 05');
    expect(panel).toContain('Intake air temperature (IAT), PID 0F');
    expect(panel).toMatch(/41 °C[\s\S]*21 °C[\s\S]*\+20 °C/);
    expect(panel).toContain('Coolant reads warmer than intake air');
  });

  it('shows MAP against BARO key on engine off on a MAP circuit, and says when they disagree', async () => {
    const order = await api.call('POST', '/api/repair-orders', { user: TECH_A, body: { vehicle: newVehicle(), complaint: 'Rich at idle' } });
    const circuit = await api.call('POST', `/api/repair-orders/${order.body.id}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'MAP', label: 'MAP sensor' } });
    const base = { circuitId: circuit.body.id, quantity: 'scan_value', at: 'signal', location: 'sensor_connector', connector: 'plugged', key: 'on', engine: 'off', jumpers: [] };
    // Key on engine off both read the air's pressure; 12 kPa apart is more than the 5 kPa they agree within (common practice, no source).
    for (const [pid, value] of [['0B', 113], ['33', 101]] as const)
      expect((await api.call('POST', `/api/repair-orders/${order.body.id}/measurements`, { user: TECH_A, body: { ...base, pid, value, unit: 'kPa', clientKey: `page-map-${pid}` } })).status).toBe(201);
    const text = await (await page(`/bay/orders/${order.body.id}/circuits/${circuit.body.id}`, TECH_A)).text();
    const panel = text.slice(text.indexOf('id="mapbaro-h"'), text.indexOf('</section>', text.indexOf('id="mapbaro-h"')));
    expect(panel).toContain('113 kPa');
    expect(panel).toContain('101 kPa');
    expect(panel).toContain('+12 kPa');
    expect(panel).toContain('MAP reads 12 kPa above barometric pressure');
  });

  it('renders what a person typed as inert text: complaint, circuit label and a reading note', async () => {
    const evil = '<script>alert(1)</script><img src=x onerror=alert(2)>';
    const order = await api.call('POST', '/api/repair-orders', { user: TECH_A, body: { vehicle: newVehicle(), complaint: evil } });
    const circuit = await api.call('POST', `/api/repair-orders/${order.body.id}/circuits`, {
      user: TECH_A,
      body: { kind: 'three_wire_5v', sensor: 'TP', label: `TP ${'"'}><b>x</b>`, cavities: { A: 'reference', B: 'signal', C: 'ground' } },
    });
    const reading = await api.call('POST', `/api/repair-orders/${order.body.id}/measurements`, {
      user: TECH_A,
      body: { circuitId: circuit.body.id, quantity: 'dc_volts', at: 'signal', against: 'battery_negative', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', value: 0.75, unit: 'V', note: evil },
    });
    expect(reading.status).toBe(201);
    for (const path of [`/bay/orders/${order.body.id}`, `/bay/orders/${order.body.id}/circuits/${circuit.body.id}`]) {
      const text = await (await page(path, TECH_A)).text();
      expect(text).not.toContain('<script>alert(1)');
      expect(text).not.toContain('<img src=x');
      expect(text).not.toContain('<b>x</b>');
      expect(text).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    }
  });

  it('serves the page assets from public/ without a build step', async () => {
    const css = await fetch(`${api.url}/assets/css/tracebay.css`);
    expect(css.status).toBe(200);
    expect(css.headers.get('content-type')).toContain('text/css');
    const js = await fetch(`${api.url}/assets/js/reading-queue.js`);
    expect(js.headers.get('content-type')).toMatch(/javascript/);
    expect(await js.text()).toContain('clientKey');
    const escape = await fetch(`${api.url}/assets/%2e%2e/package.json`);
    expect(escape.status).not.toBe(200);
    expect(await escape.text()).not.toContain('"name": "tracebay"');
  });

  it('keeps the page routes out of the OpenAPI document, and the VIN check in it', async () => {
    const doc = await api.call('GET', '/api/openapi.json');
    const paths = Object.keys(doc.body.paths);
    expect(paths).toContain('/api/vins/{vin}');
    expect(paths.filter((p) => !p.startsWith('/api/'))).toEqual([]);
  });
});
