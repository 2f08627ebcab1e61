import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS } from '../support/db';
import { FOREMAN_A, newVehicle, TECH_A } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';

const atPins = { quantity: 'ohms', at: 'signal', against: 'ground', location: 'sensor_pins', connector: 'unplugged', key: 'off', engine: 'off' } as const;
const ectScan = { quantity: 'scan_value', at: 'signal', location: 'sensor_connector', connector: 'plugged', key: 'on', engine: 'off', pid: '05' } as const;

describe.each(BACKENDS)("readings at the sensor's own pins and scan temperatures over HTTP on the %s database", (backend) => {
  let api: TestApi;
  let roId: string;
  let circuitId: string;

  beforeAll(async () => {
    api = await startApi(backend);
    const ro = await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'P0118 set', codes: ['P0118'], technicianId: TECH_A } });
    roId = ro.body.id;
    const circuit = await api.call('POST', `/api/repair-orders/${roId}/circuits`, { user: TECH_A, body: { kind: 'two_wire_thermistor', sensor: 'ECT', label: 'ECT sensor', cavities: { A: 'signal', B: 'ground' } } });
    expect(circuit.status).toBe(201);
    circuitId = circuit.body.id;
  });
  afterAll(async () => api?.close());

  const post = (body: Record<string, unknown>) => api.call('POST', `/api/repair-orders/${roId}/measurements`, { user: TECH_A, body: { circuitId, ...body } });

  it("records ohms across the sensor's pins and reads it back as posted, counted by the thermistor tree", async () => {
    // 10 kΩ thermistor at 25 °C: 10 000 Ω (Steinhart & Hart 1968 with the widely published 10 kΩ set, computed).
    const res = await post({ ...atPins, value: 10, unit: 'kΩ' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ request: { ...atPins, jumpers: [] }, value: { entered: 10, unit: 'kΩ', si: 10_000, siUnit: 'Ω' } });
    const listed = (await api.call('GET', `/api/repair-orders/${roId}/measurements`, { user: TECH_A })).body.items.find((m: { id: string }) => m.id === res.body.id);
    expect(listed.request).toEqual(res.body.request);
    const d = await api.call('GET', `/api/repair-orders/${roId}/circuits/${circuitId}/diagnosis`, { user: TECH_A });
    expect(d.status).toBe(200);
    expect(d.body.path.find((p: { readingId: string }) => p.readingId === res.body.id)).toMatchObject({ testId: 'thermistor_ohms_at_pins', verdict: 'counted', outcomeId: 'in_range' });
  });

  it.each([
    ['volts at the pins', { quantity: 'dc_volts', key: 'on', value: 1, unit: 'V' }, 'body.quantity'],
    ['the sensor left plugged in', { connector: 'plugged', value: 10, unit: 'kΩ' }, 'body.connector'],
    ['the black lead on battery negative', { against: 'battery_negative', value: 10, unit: 'kΩ' }, 'body.against'],
    ['the black lead at the module connector', { againstLocation: 'module_connector', value: 10, unit: 'kΩ' }, 'body.againstLocation'],
  ])('refuses %s with a 400 naming the field', async (_name, change, path) => {
    const res = await post({ ...atPins, ...change });
    expect(res.status).toBe(400);
    expect(res.body.error.findings.map((f: { path: string }) => f.path)).toContain(path);
  });

  it('flags a coolant temperature at the PID floor, and one far from the ambient of a cold-soaked engine', async () => {
    // PID 05 reads A − 40 °C: −40 °C is its floor (SAE J1979, mode 01 scaling).
    const floor = await post({ ...ectScan, value: -40, unit: '°C' });
    expect(floor.status).toBe(201);
    const plain = await api.call('GET', `/api/repair-orders/${roId}/circuits/${circuitId}/diagnosis`, { user: TECH_A });
    expect(plain.body.findings).toContainEqual(expect.objectContaining({ code: 'scan_temperature.at_floor' }));
    const warm = await post({ ...ectScan, value: 60, unit: '°C', supersedes: floor.body.id });
    expect(warm.status).toBe(201);
    // 60 °C on an engine cold-soaked in 15 °C air: more than 8 °C apart (common practice, no source).
    const soaked = await api.call('GET', `/api/repair-orders/${roId}/circuits/${circuitId}/diagnosis?ambientC=15&coldSoaked=true`, { user: TECH_A });
    expect(soaked.status).toBe(200);
    expect(soaked.body.findings.map((f: { code: string }) => f.code)).toEqual(expect.arrayContaining(['scan_temperature.far_from_ambient_cold_soaked']));
    expect(soaked.body.findings.map((f: { code: string }) => f.code)).not.toContain('scan_temperature.at_floor');
    expect(soaked.body.path.find((p: { readingId: string }) => p.readingId === warm.body.id).note).toMatch(/cold-soaked/);
  });

  it.each<[string, Record<string, unknown>, string, number]>([
    // Steinhart & Hart (1968) with the widely published 10 kΩ set (from memory): R(25 °C) ≈ 10 000 Ω (computed).
    ['10.0 kΩ at 25 °C on the 10 kΩ Steinhart–Hart chart', { chart: 'generic_10k_steinhart_hart', ohms: 10_000, temperatureC: 25 }, 'within', 10_000],
    // R(0 °C) ≈ 32 650 Ω on the same chart (computed): 10 kΩ is far below it.
    ['10.0 kΩ at 0 °C on the same chart', { chart: 'generic_10k_steinhart_hart', ohms: 10_000, temperatureC: 0 }, 'below', 32_650],
    // Beta form R = R25·exp(β(1/T − 1/298.15 K)), β 3950: R(0 °C) ≈ 33 621 Ω (computed); OL is above any band.
    ['OL at 0 °C on a β 3950 model', { model: { kind: 'beta', r25Ohms: 10_000, beta: 3950 }, ohms: 'overload', temperatureC: 0 }, 'above', 33_621],
  ])('compares %s with its chart over the calculator API', async (_name, body, verdict, expected) => {
    const res = await api.call('POST', '/api/calculators/thermistor-chart', { user: TECH_A, body });
    expect(res.status).toBe(200);
    expect(res.body.verdict).toBe(verdict);
    expect(Math.abs(res.body.expectedOhms - expected) / expected).toBeLessThan(2e-4);
  });

  it.each([
    ['neither a chart nor a model', { ohms: 10_000, temperatureC: 25 }, 'body.chart'],
    ['a temperature below the PID floor of −40 °C (SAE J1979)', { chart: 'generic_10k_steinhart_hart', ohms: 10_000, temperatureC: -60 }, 'body.temperatureC'],
    ['a beta of zero', { model: { kind: 'beta', r25Ohms: 10_000, beta: 0 }, ohms: 10_000, temperatureC: 25 }, 'body.model.beta'],
  ])('refuses a chart comparison with %s, naming the field', async (_name, body, path) => {
    const res = await api.call('POST', '/api/calculators/thermistor-chart', { user: TECH_A, body });
    expect(res.status).toBe(400);
    expect(res.body.error.findings.map((f: { path: string }) => f.path)).toContain(path);
  });

  it('refuses an ambient that is no temperature with a 400 naming the field', async () => {
    const res = await api.call('GET', `/api/repair-orders/${roId}/circuits/${circuitId}/diagnosis?ambientC=hot`, { user: TECH_A });
    expect(res.status).toBe(400);
    expect(res.body.error.findings.map((f: { path: string }) => f.path)).toContain('query.ambientC');
  });

  it("shows the chart comparison of the pins reading on the test screen, and the sensor's own pins in the leads", async () => {
    const { cookie } = await api.sessionOf(TECH_A);
    const get = (query: string) => fetch(`${api.url}/bay/orders/${roId}/circuits/${circuitId}${query}`, { redirect: 'manual', headers: { cookie } });
    const page = await get('?chart=generic_10k_steinhart_hart&knownC=25');
    expect(page.status).toBe(200);
    const text = await page.text();
    expect(text).toContain('Temperatures you know');
    // 10 kΩ at 25 °C on the 10 kΩ Steinhart–Hart chart (computed): inside ±5 %.
    expect(text).toMatch(/10\.0 kΩ lies inside the chart/);
    const bad = await get('?chart=generic_10k_steinhart_hart&knownC=hot');
    expect(await bad.text()).toContain('Sensor temperature: expected a number of °C');
  });
});
