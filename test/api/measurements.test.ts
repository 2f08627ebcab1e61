import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS } from '../support/db';
import { FOREMAN_A, newVehicle, TECH_A, TECH_B } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';

const koeoBackprobe = { location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off' } as const;

describe.each(BACKENDS)('circuits and measurements over HTTP on the %s database', (backend) => {
  let api: TestApi;
  let roId: string;
  let circuitId: string;

  beforeAll(async () => {
    api = await startApi(backend);
    const ro = await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'P0122 set', codes: ['P0122'], technicianId: TECH_A } });
    roId = ro.body.id;
    const circuit = await api.call('POST', `/api/repair-orders/${roId}/circuits`, {
      user: TECH_A,
      body: { kind: 'three_wire_5v', sensor: 'TP', label: 'TP sensor 1', cavities: { A: 'reference', B: 'signal', C: 'ground' } },
    });
    expect(circuit.status).toBe(201);
    circuitId = circuit.body.id;
  });
  afterAll(async () => api?.close());

  const reading = (overrides: Record<string, unknown> = {}) => ({
    circuitId,
    quantity: 'dc_volts',
    at: 'signal',
    against: 'battery_negative',
    ...koeoBackprobe,
    value: 4.87,
    unit: 'V',
    ...overrides,
  });
  const post = (body: unknown, user = TECH_A) => api.call('POST', `/api/repair-orders/${roId}/measurements`, { user, body });

  it('names the SAE J1930 sensor term of a new circuit', async () => {
    const list = await api.call('GET', `/api/repair-orders/${roId}/circuits`, { user: TECH_A });
    expect(list.body.items[0]).toMatchObject({ sensor: 'TP', sensorTerm: { term: 'TP', name: 'throttle position' } });
  });

  it.each([
    ['two cavities both marked signal', 'body.cavities.B', { kind: 'three_wire_5v', sensor: 'MAP', label: 'x', cavities: { A: 'signal', B: 'signal' } }],
    ['an unknown role', 'body.cavities.A', { kind: 'three_wire_5v', sensor: 'MAP', label: 'x', cavities: { A: 'power' } }],
    ['a reference on a two-wire thermistor', 'body.cavities.A', { kind: 'two_wire_thermistor', sensor: 'ECT', label: 'x', cavities: { A: 'reference' } }],
    ['an unknown circuit kind', 'body.kind', { kind: 'four_wire', sensor: 'MAP', label: 'x' }],
  ])('refuses a circuit with %s at %s', async (_name, path, body) => {
    const res = await api.call('POST', `/api/repair-orders/${roId}/circuits`, { user: TECH_A, body });
    expect(res.status).toBe(400);
    expect(res.body.error.findings.map((f: { path: string }) => f.path)).toContain(path);
  });

  it('records a reading with its value in SI, who took it, and starts the diagnosis', async () => {
    const res = await post(reading({ value: 4870, unit: 'mV', note: 'module side' }));
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      request: { quantity: 'dc_volts', at: 'signal', against: 'battery_negative', connector: 'backprobed', jumpers: [] },
      value: { entered: 4870, unit: 'mV', si: 4.87, siUnit: 'V' },
      meterOhms: 10_000_000,
      phase: 'diagnosis',
      takenBy: { id: TECH_A },
      supersededBy: null,
    });
    const ro = await api.call('GET', `/api/repair-orders/${roId}`, { user: TECH_A });
    expect(ro.body.status).toBe('diagnosing');
  });

  it('records a lead at each end: end-to-end ohms of the signal wire with both connectors unplugged, listed as posted', async () => {
    const endToEnd = { at: 'signal', against: 'signal', againstLocation: 'module_connector', location: 'sensor_connector', connector: 'unplugged', otherConnector: 'unplugged', key: 'off', engine: 'off' };
    const res = await post(reading({ ...endToEnd, quantity: 'ohms', value: 0.2, unit: 'Ω' }));
    expect(res.status).toBe(201);
    expect(res.body.request).toMatchObject({ at: 'signal', against: 'signal', againstLocation: 'module_connector', otherConnector: 'unplugged' });
    const listed = (await api.call('GET', `/api/repair-orders/${roId}/measurements`, { user: TECH_A })).body.items.find((m: { id: string }) => m.id === res.body.id);
    expect(listed.request).toEqual(res.body.request);
    // Without the far location the two leads would be on one point: a 400 naming the field.
    const same = await post(reading({ ...endToEnd, againstLocation: undefined, quantity: 'ohms', value: 0.2, unit: 'Ω' }));
    expect(same.status).toBe(400);
    expect(same.body.error.findings[0].path).toBe('body.against');
  });

  it('records a reading with the throttle pressed fully and held, lists it as posted, and reads an old request as at rest', async () => {
    const res = await post(reading({ value: 4.21, sensorInput: 'moved' }));
    expect(res.status).toBe(201);
    expect(res.body.request).toMatchObject({ at: 'signal', engine: 'off', sensorInput: 'moved' });
    const items = (await api.call('GET', `/api/repair-orders/${roId}/measurements`, { user: TECH_A })).body.items;
    expect(items.find((m: { id: string }) => m.id === res.body.id).request).toEqual(res.body.request);
    const rest = await post(reading({ value: 0.76 }));
    expect(rest.status).toBe(201);
    expect(rest.body.request.sensorInput).toBeUndefined();
  });

  it.each([
    ['an input state the vocabulary does not have', { sensorInput: 'half_way' }, 'body.invalid_value'],
    ['the input moved while the engine cranks', { sensorInput: 'moved', engine: 'cranking' }, 'request.input_moved_while_cranking'],
  ])('refuses %s with a 400 naming body.sensorInput', async (_name, overrides, code) => {
    const res = await post(reading({ value: 4.2, ...overrides }));
    expect(res.status).toBe(400);
    const hit = res.body.error.findings.find((f: { path: string }) => f.path === 'body.sensorInput');
    expect(hit, JSON.stringify(res.body.error.findings)).toMatchObject({ code });
    expect(hit.message).toMatch(/sensorInput|input/);
  });

  it('answers a reading on an order under diagnosis exactly as it lists it afterwards (a jumper, an over-range reading)', async () => {
    // A first reading puts the order under diagnosis, if an earlier test has not.
    expect((await post(reading({ clientKey: 'as-listed-0' }))).status).toBe(201);
    const jumpered = await post(reading({ jumpers: [{ from: 'signal', to: 'reference', via: { kind: 'resistor', ohms: 1000 } }], clientKey: 'as-listed-1' }));
    const overRange = await post(reading({ quantity: 'ohms', at: 'signal', against: 'ground', connector: 'unplugged', key: 'off', value: 'OL', unit: 'ohm', clientKey: 'as-listed-2' }));
    expect([jumpered.status, overRange.status]).toEqual([201, 201]);
    const listed = (await api.call('GET', `/api/repair-orders/${roId}/measurements`, { user: TECH_A })).body.items as Array<{ id: string }>;
    for (const answered of [jumpered.body, overRange.body]) {
      // Same keys in the same order too: a client may hash or compare the bodies.
      expect(JSON.stringify(listed.find((m) => m.id === answered.id))).toBe(JSON.stringify(answered));
    }
  });

  it('converts ohms, kilohms and pressure units to SI (NIST SP 811: 1 inHg = 3386.389 Pa)', async () => {
    const res = await post([
      reading({ quantity: 'ohms', key: 'off', connector: 'unplugged', value: 253, unit: 'kohm' }),
      reading({ quantity: 'scan_value', against: undefined, pid: '0B', value: 10, unit: 'inHg' }),
    ]);
    expect(res.status).toBe(201);
    expect(res.body.items.map((m: { value: { si: number } }) => m.value.si)).toEqual([253_000, 33_863.89]);
  });

  it('stores a batch all-or-nothing: one bad reading and none are kept, with the bad one’s path', async () => {
    const before = (await api.call('GET', `/api/repair-orders/${roId}/measurements`, { user: TECH_A })).body.items.length;
    const res = await post([reading({ value: 5.0 }), reading({ quantity: 'ohms', key: 'off', value: 4.8, unit: 'V' })]);
    expect(res.status).toBe(400);
    expect(res.body.error.findings[0]).toMatchObject({ path: 'body.1.unit', message: expect.stringContaining('Ω') });
    const after = (await api.call('GET', `/api/repair-orders/${roId}/measurements`, { user: TECH_A })).body.items.length;
    expect(after).toBe(before);
  });

  it.each([
    ['volts without the second lead', 'body.against', { against: undefined }],
    ['both leads on one point', 'body.against', { against: 'signal' }],
    ['a negative resistance', 'body.value', { quantity: 'ohms', key: 'off', value: -5, unit: 'ohm' }],
    ['a meter of 0 Ω', 'body.meterOhms', { meterOhms: 0 }],
    ['a value given as text', 'body.value', { value: '4.87 V' }],
    ['a jumper through an unknown device', 'body.jumpers.0.via.kind', { jumpers: [{ from: 'reference', to: 'signal', via: { kind: 'paperclip' } }] }],
    ['an unknown circuit', 'body.circuitId', { circuitId: '00000000-0000-4000-8000-000000000000' }],
    ['an unknown field', 'body', { colour: 'red' }],
    ['a scan value that does not name its parameter', 'body.pid', { quantity: 'scan_value', against: undefined }],
    ['the engine running with the key off', 'body.engine', { key: 'off', engine: 'running' }],
    ['ohms with the key on (a powered circuit)', 'body.key', { quantity: 'ohms', unit: 'ohm', key: 'on' }],
    ['a reading beyond any vehicle voltage (a slipped decimal point)', 'body.value', { value: 4870 }],
    ['a reading from before the repair order was opened', 'body.takenAt', { takenAt: '2001-01-01T00:00:00Z' }],
  ])('refuses %s with a 400 at %s', async (_name, path, overrides) => {
    const res = await post(reading(overrides));
    expect(res.status).toBe(400);
    expect(res.body.error.findings.map((f: { path: string }) => f.path)).toContain(path);
  });

  it('refuses a scan value in a unit its test cannot convert, naming the unit the test expects, and takes % of full scale', async () => {
    const scanTest = { quantity: 'scan_value', against: undefined, connector: 'plugged', pid: 'signal_volts' };
    const res = await post(reading({ ...scanTest, value: 101, unit: 'kPa' }));
    expect(res.status).toBe(400);
    expect(res.body.error.findings[0]).toMatchObject({ code: 'measurement.scan_unit_unexpected', path: 'body.unit' });
    expect(res.body.error.findings[0].message).toMatch(/in V/);
    expect((await post(reading({ ...scanTest, value: 15.3, unit: '%' }))).status).toBe(201);
  });

  it('keeps a corrected reading, hides it from the default list and shows it with includeSuperseded', async () => {
    const wrong = (await post(reading({ at: 'reference', value: 4.1 }))).body;
    const fixed = await post(reading({ at: 'reference', value: 5.01, supersedes: wrong.id }));
    expect(fixed.status).toBe(201);
    const visible = (await api.call('GET', `/api/repair-orders/${roId}/measurements`, { user: TECH_A })).body.items;
    expect(visible.map((m: { id: string }) => m.id)).not.toContain(wrong.id);
    const all = (await api.call('GET', `/api/repair-orders/${roId}/measurements?includeSuperseded=true`, { user: TECH_A })).body.items;
    expect(all.find((m: { id: string }) => m.id === wrong.id)).toMatchObject({ supersededBy: { id: fixed.body.id, by: { id: TECH_A } } });
    const otherTest = await post(reading({ at: 'ground', value: 0.02, supersedes: fixed.body.id }));
    expect(otherTest.body.error.findings[0]).toMatchObject({ code: 'measurement.other_test', path: 'body.supersedes' });
    const twice = await post(reading({ at: 'reference', value: 5.0, supersedes: wrong.id }));
    expect(twice.status).toBe(400);
    expect(twice.body.error.findings[0].code).toBe('measurement.already_corrected');
  });

  it('stores a re-sent reading once and refuses one key used twice in a batch', async () => {
    const first = await post(reading({ value: 4.86, clientKey: 'tablet-7-key-0001' }));
    expect(first.status).toBe(201);
    const again = await post(reading({ value: 4.86, clientKey: 'tablet-7-key-0001' }));
    expect(again.status).toBe(200);
    expect(again.body.id).toBe(first.body.id);
    const reused = await post(reading({ value: 1.23, clientKey: 'tablet-7-key-0001' }));
    expect(reused.status).toBe(409);
    const doubled = await post([reading({ clientKey: 'tablet-7-key-0002' }), reading({ value: 4.8, clientKey: 'tablet-7-key-0002' })]);
    expect(doubled.status).toBe(400);
    expect(doubled.body.error.findings[0]).toMatchObject({ code: 'measurement.client_key_twice', path: 'body.1.clientKey' });
  });

  it('refuses to change or delete a stored reading, even straight in the database', async () => {
    const row = await api.db.prisma.measurement.findFirstOrThrow({ where: { repairOrderId: roId } });
    await expect(api.db.prisma.measurement.update({ where: { id: row.id }, data: { valueSi: 1 } })).rejects.toThrow(/append-only/);
    await expect(api.db.prisma.measurement.delete({ where: { id: row.id } })).rejects.toThrow(/append-only/);
  });

  it('refuses diagnosis readings once the repair order is repaired, and takes verification readings', async () => {
    await api.call('POST', `/api/repair-orders/${roId}/repairs`, { user: TECH_A, body: { circuitId, part: 'signal', action: 'Repaired the signal wire' } });
    const diag = await post(reading());
    expect(diag.status).toBe(409);
    expect(diag.body.error).toMatchObject({ code: 'measurement.wrong_phase', acceptedPhases: ['verification'] });
    expect((await post(reading({ phase: 'verification', value: 0.61 }))).status).toBe(201);
  });

  it('hides the readings from another shop behind a 404', async () => {
    expect((await api.call('GET', `/api/repair-orders/${roId}/measurements`, { user: TECH_B })).status).toBe(404);
    expect((await post(reading({ phase: 'verification' }), TECH_B)).status).toBe(404);
  });
});
