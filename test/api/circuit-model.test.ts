import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { HYPOTHESIS_IDS } from '../../src/engine/circuit';
import { TECH_A } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';

/** A measurement request in the shared vocabulary: key on, engine off, connector unplugged at the sensor. */
const koeo = (overrides: Record<string, unknown> = {}) => ({
  quantity: 'dc_volts',
  at: 'signal',
  against: 'battery_negative',
  location: 'sensor_connector',
  connector: 'unplugged',
  key: 'on',
  engine: 'off',
  ...overrides,
});
const keyOffOhms = (overrides: Record<string, unknown> = {}) => koeo({ quantity: 'ohms', key: 'off', ...overrides });
const scan = { quantity: 'scan_value', at: 'signal', location: 'module_connector', connector: 'plugged', key: 'on', engine: 'off', pid: 'signal_volts' };

/** Rows [title, body, path] → [title, path, body], so that the test name carries the path. */
const byPath = (rows: Array<[string, Record<string, unknown>, string]>) => rows.map(([name, body, path]) => [name, path, body] as const);

const paths = (res: { body: { error: { findings: Array<{ path: string }> } } }) => res.body.error.findings.map((f) => f.path);

describe.each(['postgresql'] as const)('circuit model over HTTP (%s database for the user check)', (backend) => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startApi(backend);
  });
  afterAll(async () => api?.close());

  const post = (path: string, body: unknown) => api.call('POST', path, { user: TECH_A, body });
  const predict = (body: Record<string, unknown>) => post('/api/circuit-model/predictions', body);
  const bands = (body: Record<string, unknown>) => post('/api/circuit-model/bands', body);
  const good = (res: { body: { rows: Array<{ id: string; reading: { value: number } }> } }) => res.body.rows.find((r) => r.id === 'good')!.reading;

  describe('predicted readings of the healthy circuit', () => {
    it.each([
      // Reading = V·Rm/(Rm + Rs): the textbook voltage divider (computed).
      ['reads a biased signal at 4.878 V on a 10 MΩ meter: 5 V through the default 250 kΩ bias (voltage divider, computed)', { kind: 'three_wire_5v' }, undefined, koeo(), 4.878, 0.002],
      ['reads the same signal at 4.000 V on a 1 MΩ meter (voltage divider 5·1/1.25, computed)', { kind: 'three_wire_5v' }, { inputOhms: 1e6 }, koeo(), 4.0, 0.002],
      [
        'reads 4.87 V on a signal biased through 267 kΩ (common practice, no source; voltage divider 4.870 V, computed)',
        { kind: 'three_wire_5v', module: { bias: { kind: 'pull_up', ohms: 267_000 } } },
        undefined,
        koeo(),
        4.87,
        0.002,
      ],
      ['holds the regulated reference at 5.000 V under the 10 MΩ meter (1 Ω behind 10 MΩ sags 0.5 µV, voltage divider, computed)', { kind: 'three_wire_5v' }, undefined, koeo({ at: 'reference' }), 5.0, 0.0005],
      [
        'shows 2.500 V on a thermistor input at 25 °C: 10 kΩ NTC under a 10 kΩ pull-up (Steinhart & Hart 1968, generic 10 kΩ set from memory; divider computed)',
        { kind: 'two_wire_thermistor', sensor: { kind: 'thermistor', temperatureC: 25 } },
        undefined,
        scan,
        2.5,
        0.003,
      ],
      [
        'shows 3.828 V on a thermistor input at 0 °C: 32 650 Ω under 10 kΩ (Steinhart & Hart 1968, generic set from memory; divider 3.8277 V computed)',
        { kind: 'two_wire_thermistor', sensor: { kind: 'thermistor', temperatureC: 0 } },
        undefined,
        scan,
        3.8277,
        0.002,
      ],
    ])('%s', async (_name, circuit, meter, request, expected, tolerance) => {
      const res = await predict({ circuit, request, ...(meter ? { meter } : {}), hypotheses: [] });
      expect(res.status).toBe(200);
      expect(res.body.rows).toHaveLength(1);
      expect(good(res).value).toBeGreaterThan(expected - tolerance);
      expect(good(res).value).toBeLessThan(expected + tolerance);
      expect(res.body.rows[0]).toMatchObject({ id: 'good', source: 'good', faults: [], reading: { unit: 'V', overload: false } });
    });

    it('answers the circuit it used: the default of its kind with the overrides laid over it', async () => {
      const res = await predict({ circuit: { kind: 'three_wire_5v', sensor: { kind: 'pressure', pressureKpa: 50 } }, request: koeo(), hypotheses: [] });
      expect(res.status).toBe(200);
      expect(res.body.circuit.sensor).toMatchObject({ kind: 'pressure', pressureKpa: 50, calibration: { lowKpa: 20 } });
      expect(res.body.circuit.module.bias).toEqual({ kind: 'pull_up', ohms: 250_000 });
    });
  });

  describe('one row per fault', () => {
    it('answers good first, then each hypothesis and fault set in the order asked, each with its faults', async () => {
      const res = await predict({
        circuit: { kind: 'three_wire_5v' },
        request: koeo({ connector: 'backprobed' }),
        hypotheses: ['signal_short_ground', 'signal_short_voltage'],
        faultSets: [{ name: 'chafed_signal', faults: [{ kind: 'short_to_ground', wire: 'signal', ohms: 250_000 }] }],
      });
      expect(res.status).toBe(200);
      expect(res.body.rows.map((r: { id: string; source: string }) => [r.id, r.source])).toEqual([
        ['good', 'good'],
        ['signal_short_ground', 'hypothesis'],
        ['signal_short_voltage', 'hypothesis'],
        ['chafed_signal', 'fault_set'],
      ]);
      const byId = Object.fromEntries(res.body.rows.map((r: { id: string; reading: { value: number } }) => [r.id, r.reading.value]));
      // Model physics: back-probed KOEO the signal is the wiper, 0.15 × 5 V; a hard short to ground ≈ 0 V; a short to
      // the battery ≈ 12.4 V (the default battery, engine off).
      expect(byId.good).toBeCloseTo(0.75, 1);
      expect(byId.signal_short_ground).toBeLessThan(0.01);
      expect(byId.signal_short_voltage).toBeGreaterThan(11.5);
      expect(res.body.rows[3].faults).toEqual([{ kind: 'short_to_ground', wire: 'signal', ohms: 250_000 }]);
    });

    it('tries every hypothesis that applies when none is named, and leaves the reference faults out on a two-wire circuit', async () => {
      const three = await predict({ circuit: { kind: 'three_wire_5v' }, request: koeo() });
      // A potentiometer has no shorted element: that variant belongs to pressure sensors and thermistors.
      expect(three.body.rows.map((r: { id: string }) => r.id)).toEqual(['good', ...HYPOTHESIS_IDS.filter((id) => id !== 'sensor_internal_shorted')]);
      const two = await predict({ circuit: { kind: 'two_wire_thermistor' }, request: scan });
      const ids = two.body.rows.map((r: { id: string }) => r.id);
      expect(ids).toContain('signal_open');
      expect(ids.filter((id: string) => id.startsWith('reference_') || id === 'signal_short_reference')).toEqual([]);
    });

    it('shows an ohms reading beyond the meter range as { value: null, overload: true }, never Infinity', async () => {
      // Key off, unplugged: the signal pin sees the 250 kΩ bias in series with the unpowered regulator's 1 kΩ (model
      // parts, sum computed); the ohms reading of the trade is about 253 kΩ (common practice, no source).
      const res = await predict({ circuit: { kind: 'three_wire_5v' }, request: keyOffOhms(), hypotheses: ['signal_open'] });
      expect(res.status).toBe(200);
      expect(res.body.rows[0].reading.value).toBeCloseTo(251_000, -2);
      expect(res.body.rows[0].reading.unit).toBe('Ω');
      expect(res.body.rows[1].reading).toEqual({ value: null, overload: true, unit: 'Ω' });
    });

    it('gives no reading, with the reason, where a fault powers the points an ohmmeter is on', async () => {
      const res = await predict({ circuit: { kind: 'three_wire_5v' }, request: keyOffOhms({ at: 'reference' }), hypotheses: ['reference_short_voltage'] });
      expect(res.status).toBe(200);
      expect(res.body.rows[1]).toMatchObject({ id: 'reference_short_voltage', reading: null, findings: [{ code: 'measurement.ohms_on_powered_circuit', path: 'request.at' }] });
    });
  });

  describe('Monte Carlo bands', () => {
    const referenceBands = {
      circuit: { kind: 'three_wire_5v' },
      request: koeo({ at: 'reference', connector: 'backprobed' }),
      hypotheses: ['reference_short_ground', 'reference_high_resistance'],
      // 5.00 ± 0.10 V is the usual expectation of a reference (common practice, no source).
      bands: [{ id: 'low', max: 4.9 }, { id: 'pass', min: 4.9, max: 5.1 }, { id: 'high', min: 5.1 }],
      samples: 2000,
      seed: 42,
    };

    it('gives the very same answer for the same seed and another for another seed', async () => {
      const a = await bands(referenceBands);
      const b = await bands(referenceBands);
      const c = await bands({ ...referenceBands, seed: 43 });
      expect(a.status).toBe(200);
      expect(b.body).toEqual(a.body);
      expect(c.body.rows[0].percentiles).not.toEqual(a.body.rows[0].percentiles);
    });

    it('puts the good reference in the 5.00 ± 0.10 V band and the shorted one in the low band', async () => {
      const res = await bands(referenceBands);
      expect(res.body).toMatchObject({ unit: 'V', samples: 2000, seed: 42 });
      const [ok, shorted] = res.body.rows;
      // Regulator drawn 4.9–5.1 V plus the meter's ±(0.5 % + 2 digits): nearly all inside 4.9–5.1 V.
      expect(ok.probabilities.pass).toBeGreaterThan(0.9);
      expect(ok.percentiles.p50.value).toBeCloseTo(5.0, 1);
      expect(shorted.probabilities.low).toBe(1);
      for (const row of res.body.rows) {
        const shares = Object.values(row.probabilities as Record<string, number>);
        expect(shares.reduce((s, x) => s + x, 0)).toBeCloseTo(1, 12);
      }
    });

    it('reports overload percentiles as { value: null, overload: true } and counts them in an open top band', async () => {
      const res = await bands({
        circuit: { kind: 'three_wire_5v' },
        request: keyOffOhms(),
        hypotheses: ['signal_open'],
        bands: [{ id: 'biased', min: 150_000, max: 400_000 }, { id: 'open', min: 10e6 }],
        samples: 500,
      });
      expect(res.status).toBe(200);
      expect(res.body.unit).toBe('Ω');
      expect(res.body.rows[0].probabilities.biased).toBe(1);
      expect(res.body.rows[1].percentiles.p50).toEqual({ value: null, overload: true });
      expect(res.body.rows[1].probabilities.open).toBe(1);
    });

    it.each(byPath([
      ['more than 20 000 samples per row', { samples: 20_001 }, 'body.samples'],
      ['more samples × rows than one request may solve (22 rows × 20 000)', { samples: 20_000, hypotheses: undefined }, 'body.samples'],
      ['a band whose max is not above its min', { bands: [{ id: 'odd', min: 5, max: 4 }] }, 'body.bands.0.max'],
      ['a band named "other"', { bands: [{ id: 'other', min: 5 }] }, 'body.bands.0.id'],
      ['a wire spread given as [max, min]', { spreads: { wireOhms: [0.3, 0.05] } }, 'body.spreads.wireOhms'],
      ['a fractional seed', { seed: 1.5 }, 'body.seed'],
    ]))('refuses %s with a 400 naming %s', async (_name, path, change) => {
      const res = await bands({ ...referenceBands, ...change });
      expect(res.status).toBe(400);
      expect(paths(res)).toContain(path);
    });
  });

  describe('wire identification', () => {
    it('names ground, unbiased signal, reference and biased signal of the four-cavity example', async () => {
      // Facts of the trade (common practice, no source): 4.87 V on a 10 MΩ meter is a biased input, the regulated
      // reference holds at 5.0 V, the sensor ground reads next to 0 Ω, a signal held down reads 0 V and ~250 kΩ.
      const res = await post('/api/wires/identify', {
        cavities: [
          { cavity: 'A', volts: 0.0, ohms: 0.2 },
          { cavity: 'B', volts: 0.0, ohms: 250_000 },
          { cavity: 'C', volts: 5.0 },
          { cavity: 'D', volts: 4.87 },
        ],
      });
      expect(res.status).toBe(200);
      expect(res.body.circuitKind).toBe('three_wire_5v');
      expect(Object.fromEntries(res.body.cavities.map((c: { cavity: string; role: string }) => [c.cavity, c.role]))).toEqual({
        A: 'ground',
        B: 'signal_pull_down',
        C: 'reference',
        D: 'signal_pull_up',
      });
      for (const c of res.body.cavities) expect(c.probabilities[c.role]).toBeGreaterThan(0.95);
      // Bias from 4.87 V on 10 MΩ: 10 MΩ·(5/4.87 − 1) ≈ 267 kΩ (voltage divider inverse, computed).
      expect(res.body.cavities[3].reason).toMatch(/267 kΩ/);
    });

    it('asks for the ohms reading that tells a ground from a held-down signal when both read 0 V', async () => {
      const res = await post('/api/wires/identify', { cavities: [{ cavity: 'A', volts: 0 }, { cavity: 'B', volts: 0 }, { cavity: 'C', volts: 5.0 }] });
      expect(res.status).toBe(200);
      expect(res.body.next).toMatchObject({ kind: 'ohms_key_off' });
      expect(res.body.next.instruction).toMatch(/airbag/);
    });
  });

  describe('bad input gets a 400 naming the field and why', () => {
    const base = { circuit: { kind: 'three_wire_5v' }, request: koeo(), hypotheses: [] };
    const wires = (list: unknown[]) => ({ ...base, circuit: { kind: 'three_wire_5v', wires: list } });
    it.each(byPath([
      ['an unknown wire role in the circuit', wires([{ role: 'reference', ohms: 0.1 }, { role: 'sgnal', ohms: 0.1 }, { role: 'ground', ohms: 0.1 }]), 'body.circuit.wires.1.role'],
      ['an unknown point for a lead', { ...base, request: koeo({ at: 'sensor_signal' }) }, 'body.request.at'],
      ['an unknown wire role in a fault', { ...base, faultSets: [{ name: 'mine', faults: [{ kind: 'open', wire: 'sig' }] }] }, 'body.faultSets.0.faults.0.wire'],
      ['an unknown hypothesis', { ...base, hypotheses: ['signal_melted'] }, 'body.hypotheses.0'],
      ['a negative wire resistance', wires([{ role: 'reference', ohms: -0.1 }, { role: 'signal', ohms: 0.1 }, { role: 'ground', ohms: 0.1 }]), 'body.circuit.wires.0.ohms'],
      ['a negative bias resistance', { ...base, circuit: { kind: 'three_wire_5v', module: { bias: { kind: 'pull_up', ohms: -250_000 } } } }, 'body.circuit.module.bias.ohms'],
      ['a meter of 0 Ω', { ...base, meter: { inputOhms: 0 } }, 'body.meter.inputOhms'],
      ['a wire list without a ground wire', wires([{ role: 'reference', ohms: 0.1 }, { role: 'signal', ohms: 0.1 }]), 'body.circuit.wires'],
      ['a wire list with the signal twice', wires([{ role: 'reference', ohms: 0.1 }, { role: 'signal', ohms: 0.1 }, { role: 'signal', ohms: 0.1 }, { role: 'ground', ohms: 0.1 }]), 'body.circuit.wires.2.role'],
      [
        'a reference wire on a two-wire thermistor circuit',
        { circuit: { kind: 'two_wire_thermistor', wires: [{ role: 'reference', ohms: 0.1 }, { role: 'signal', ohms: 0.1 }, { role: 'ground', ohms: 0.1 }] }, request: scan, hypotheses: [] },
        'body.circuit.wires.0.role',
      ],
      ['a thermistor in a three-wire circuit', { ...base, circuit: { kind: 'three_wire_5v', sensor: { kind: 'thermistor' } } }, 'body.circuit.sensor.kind'],
      ['a reference fault on a two-wire thermistor circuit', { circuit: { kind: 'two_wire_thermistor' }, request: scan, hypotheses: ['reference_open'] }, 'body.hypotheses.0'],
      ['a lead on the reference of a two-wire thermistor circuit', { circuit: { kind: 'two_wire_thermistor' }, request: koeo({ at: 'reference' }), hypotheses: [] }, 'body.request.at'],
      ['an ohms reading with the key on', { ...base, request: koeo({ quantity: 'ohms' }) }, 'body.request.key'],
      ['both leads on the same point', { ...base, request: koeo({ against: 'signal' }) }, 'body.request.against'],
      ['a fault set named "good"', { ...base, faultSets: [{ name: 'good', faults: [{ kind: 'open', wire: 'signal' }] }] }, 'body.faultSets.0.name'],
      ['a field the body does not have', { ...base, colour: 'red' }, 'body'],
    ]))('refuses %s with a 400 naming %s', async (_name, path, body) => {
      const res = await predict(body);
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('invalid_input');
      expect(paths(res)).toContain(path);
    });

    it.each(byPath([
      ['no cavities at all', { cavities: [] }, 'body.cavities'],
      ['nine cavities', { cavities: Array.from({ length: 9 }, (_, i) => ({ cavity: `C${i}`, volts: 0 })) }, 'body.cavities'],
      ['the same cavity twice', { cavities: [{ cavity: 'A', volts: 5 }, { cavity: 'A', volts: 0 }] }, 'body.cavities.1.cavity'],
      ['a negative ohms reading', { cavities: [{ cavity: 'A', ohms: -3 }, { cavity: 'B', volts: 5 }] }, 'body.cavities.0.ohms'],
      ['a meter of 0 Ω', { cavities: [{ cavity: 'A', volts: 4.87, meterOhms: 0 }, { cavity: 'B', volts: 0 }] }, 'body.cavities.0.meterOhms'],
      ['a loaded reading without its load', { cavities: [{ cavity: 'A', volts: 5, loaded: { volts: 4 } }, { cavity: 'B', volts: 0 }] }, 'body.cavities.0.loaded'],
      ['an unknown circuit kind', { circuitKind: 'four_wire', cavities: [{ cavity: 'A', volts: 5 }] }, 'body.circuitKind'],
    ]))('refuses a wire list with %s, naming %s', async (_name, path, body) => {
      const res = await post('/api/wires/identify', body);
      expect(res.status).toBe(400);
      expect(paths(res)).toContain(path);
    });

    it('refuses a call without a sign-in with a 401', async () => {
      const res = await api.call('POST', '/api/wires/identify', { body: { cavities: [{ cavity: 'A', volts: 5 }] } });
      expect(res.status).toBe(401);
    });
  });

  it('lists its endpoints in the OpenAPI document', async () => {
    const doc = await api.call('GET', '/api/openapi.json');
    for (const path of ['/api/circuit-model/predictions', '/api/circuit-model/bands', '/api/wires/identify']) {
      expect(doc.body.paths[path].post.security).toEqual([{ user: [] }]);
      expect(doc.body.paths[path].post.requestBody).toBeDefined();
    }
  });
});
