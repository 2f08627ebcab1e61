import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TECH_A } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';

/** Generic 10 kΩ Steinhart–Hart set (Steinhart & Hart 1968; coefficients from memory, generic). */
const GENERIC_10K = { kind: 'steinhart_hart', a: 1.12924e-3, b: 2.34108e-4, c: 8.7755e-8 };

/** Rows [title, body, path] → [title, path, body], so that the test name carries the path. */
const byPath = (rows: Array<[string, Record<string, unknown>, string]>) => rows.map(([name, body, path]) => [name, path, body] as const);

/** |actual − expected| ≤ tolerance, with both numbers in the failure message. */
function near(actual: number, expected: number, tolerance: number): void {
  expect(Math.abs(actual - expected), `${actual} vs ${expected} ± ${tolerance}`).toBeLessThanOrEqual(tolerance);
}

describe.each(['postgresql'] as const)('calculators over HTTP (%s database for the user check)', (backend) => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startApi(backend);
  });
  afterAll(async () => api?.close());

  const calc = (name: string, body: unknown) => api.call('POST', `/api/calculators/${name}`, { user: TECH_A, body });

  describe('meter loading (voltage divider, a textbook result)', () => {
    it.each([
      ['5 V behind 1 MΩ reads 4.5455 V on a 10 MΩ meter (computed)', { sourceVolts: 5, sourceOhms: 1e6 }, 4.5455, 5e-5],
      ['5 V behind 10 kΩ reads 4.9950 V on a 10 MΩ meter (computed)', { sourceVolts: 5, sourceOhms: 10e3, meterOhms: 10e6 }, 4.995, 5e-5],
      ['a regulator of 1 Ω output resistance sags by only 0.5 µV under 10 MΩ (computed)', { sourceVolts: 5, sourceOhms: 1 }, 4.9999995, 1e-9],
      ['5 V behind 250 kΩ reads 4.000 V on a 1 MΩ meter (computed)', { sourceVolts: 5, sourceOhms: 250e3, meterOhms: 1e6 }, 4.0, 1e-9],
    ])('%s', async (_name, body, expected, tolerance) => {
      const res = await calc('meter-loading', body);
      expect(res.status).toBe(200);
      near(res.body.readingVolts, expected, tolerance);
      expect(res.body.meterOhms).toBe((body as { meterOhms?: number }).meterOhms ?? 10e6);
    });
  });

  describe('bias resistance from a loaded reading', () => {
    it('finds about 267 kΩ behind a 5 V biased input that reads 4.87 V on 10 MΩ (common practice, no source; 10 MΩ·(5/4.87 − 1) = 266 940 Ω computed)', async () => {
      const res = await calc('bias-resistance', { readVolts: 4.87 });
      expect(res.status).toBe(200);
      near(res.body.biasOhms, 266_940, 1);
      expect(res.body).toMatchObject({ openVolts: 5, meterOhms: 10e6 });
    });

    it('finds 250 kΩ behind 4.000 V read on a 1 MΩ meter (voltage divider inverse, computed)', async () => {
      const res = await calc('bias-resistance', { openVolts: 5, readVolts: 4.0, meterOhms: 1e6 });
      near(res.body.biasOhms, 250_000, 1e-6);
    });

    it('says an ohms reading of 253 kΩ on the same path agrees with it within 10 % (common practice, no source)', async () => {
      const res = await calc('bias-resistance', { readVolts: 4.87, measuredOhms: 253_000 });
      expect(res.body.agreesWithMeasured).toBe(true);
      near(res.body.relativeDifference, (266_940.45 - 253_000) / 266_940.45, 1e-6);
    });
  });

  describe('the 5 V reference under a known load', () => {
    it('finds 1 Ω of source resistance when 5.00 V falls to 2.50 V under a 1 Ω load (voltage divider inverse, computed)', async () => {
      const res = await calc('reference-load', { openVolts: 5.0, loadedVolts: 2.5, loadOhms: 1 });
      expect(res.status).toBe(200);
      near(res.body.sourceOhms, 1, 1e-12);
      expect(res.body.openVerdict).toBe('pass');
      expect(res.body.recovery).toBeUndefined();
    });

    // A regulator dipping under a hard load recovers to about 4.8 V when released; one that stays down is shorted or
    // weak. 5.00 ± 0.10 V is the usual expectation (common practice, no source).
    it.each([
      ['calls a reference that comes back to 4.95 V healthy', { releasedVolts: 4.95 }, 'healthy', 'pass'],
      ['calls a reference that stays at 4.2 V shorted or weak', { releasedVolts: 4.2 }, 'shorted_or_weak', 'pass'],
      ['reads 4.85 V unloaded as low against 5.00 ± 0.10 V', { openVolts: 4.85, releasedVolts: 4.85 }, 'healthy', 'low'],
      ['accepts 4.85 V with a tolerance set to 0.2 V', { openVolts: 4.85, releasedVolts: 4.85, limits: { toleranceVolts: 0.2 } }, 'healthy', 'pass'],
      ['calls 4.85 V not recovered when the recovery limit is set to 4.9 V', { openVolts: 4.85, releasedVolts: 4.85, limits: { recoveryVolts: 4.9 } }, 'shorted_or_weak', 'low'],
    ])('%s', async (_name, change, recovery, verdict) => {
      const res = await calc('reference-load', { openVolts: 5.0, loadedVolts: 0.4, loadOhms: 0.1, ...change });
      expect(res.status).toBe(200);
      expect(res.body.recovery).toBe(recovery);
      expect(res.body.openVerdict).toBe(verdict);
    });
  });

  describe('voltage-drop verdicts (sensor-ground limit 0.1 V: common practice, no source)', () => {
    it.each([
      ['passes a 0.05 V drop on a sensor ground', { dropVolts: 0.05 }, 'pass'],
      ['calls a 0.2 V drop excessive', { dropVolts: 0.2 }, 'excessive'],
      ['passes 0.2 V against a limit set to 0.3 V', { dropVolts: 0.2, limitVolts: 0.3 }, 'pass'],
      ['judges the size of a negative drop', { dropVolts: -0.15 }, 'excessive'],
    ])('%s', async (_name, body, verdict) => {
      const res = await calc('voltage-drop', body);
      expect(res.status).toBe(200);
      expect(res.body.verdict).toBe(verdict);
    });

    it("finds 200 Ω in a ground dropping 0.2 V at the track's 1 mA (Ohm's law, computed)", async () => {
      const res = await calc('voltage-drop', { dropVolts: 0.2, amps: 0.001 });
      near(res.body.wireOhms, 200, 1e-9);
      expect(res.body.limitVolts).toBe(0.1);
    });
  });

  describe('NTC thermistors (Steinhart & Hart, Deep-Sea Research 15, 1968; beta equation)', () => {
    // Generic 10 kΩ set from memory; resistances computed, agreeing with published 10 kΩ tables within 0.1 % (0–100 °C).
    it.each([
      ['gives 10 000 Ω at 25 °C', 25, 10_000],
      ['gives 32 650 Ω at 0 °C', 0, 32_650],
      ['gives 3 601 Ω at 50 °C', 50, 3_601],
      ['gives 678 Ω at 100 °C', 100, 678],
    ])('%s with the generic 10 kΩ Steinhart–Hart set (computed)', async (_name, temperatureC, expected) => {
      const res = await calc('thermistor', { model: GENERIC_10K, temperatureC });
      expect(res.status).toBe(200);
      near(res.body.ohms, expected, expected * 0.001);
    });

    it.each([
      ['reads 25 °C from 10 000 Ω', 10_000, 25],
      ['reads 0 °C from 32 650 Ω', 32_650, 0],
      ['reads 100 °C from 678 Ω', 678, 100],
    ])('%s, Steinhart–Hart the other way (computed)', async (_name, ohms, expected) => {
      const res = await calc('thermistor', { ohms });
      expect(res.body.model).toEqual(GENERIC_10K);
      near(res.body.temperatureC, expected, 0.05);
    });

    it.each([
      ['gives R25 at 25 °C by definition', { temperatureC: 25 }, 'ohms', 10_000, 1e-9],
      ['gives 33 621 Ω at 0 °C with β = 3950 K (beta equation, computed)', { temperatureC: 0 }, 'ohms', 33_620.6, 0.1],
      ['reads 100 °C from 697.5 Ω with β = 3950 K (beta equation, computed)', { ohms: 697.5198 }, 'temperatureC', 100, 1e-4],
    ])('%s', async (_name, given, field, expected, tolerance) => {
      const res = await calc('thermistor', { model: { kind: 'beta', r25Ohms: 10_000, beta: 3950 }, ...given });
      expect(res.status).toBe(200);
      near(res.body[field], expected, tolerance);
    });

    // Divider from 5 V through Rp = 10 kΩ: V = 5·Rt/(Rt + Rp) (computed).
    it.each([
      ['shows 2.5000 V at 25 °C (Rt 10 kΩ)', { temperatureC: 25 }, 2.5, 0.0005],
      ['shows 3.8277 V at 0 °C (Rt 32 650 Ω)', { temperatureC: 0 }, 3.8277, 0.0005],
      ['shows 0.3177 V at Rt 678.4 Ω', { ohms: 678.4 }, 0.3177, 0.0001],
    ])('%s under a 10 kΩ module pull-up', async (_name, given, expected, tolerance) => {
      const res = await calc('thermistor', { ...given, divider: { pullUpOhms: 10_000 } });
      expect(res.status).toBe(200);
      near(res.body.divider.volts, expected, tolerance);
      expect(res.body.divider.supplyVolts).toBe(5);
    });

    it('reads 0 °C back from 3.8277 V at the module input (divider inverted, then Steinhart–Hart; computed)', async () => {
      const res = await calc('thermistor', { volts: 3.8277, divider: { pullUpOhms: 10_000 } });
      near(res.body.ohms, 32_650, 33);
      near(res.body.temperatureC, 0, 0.02);
    });
  });

  describe('pressure', () => {
    it.each([
      ['1 inHg is 3386.389 Pa (NIST SP 811, appendix B)', { value: 1, unit: 'inHg' }, 'pa', 3386.389, 1e-9],
      ['1 psi is 6894.757 Pa (NIST SP 811, appendix B)', { value: 1, unit: 'psi' }, 'pa', 6894.757, 1e-9],
      ['1 atm, 101.325 kPa, is 29.9213 inHg (NIST SP 811, computed)', { value: 101.325, unit: 'kPa' }, 'inHg', 29.9213, 5e-5],
      ['1 atm, 101.325 kPa, is 14.6959 psi (NIST SP 811, computed)', { value: 101.325, unit: 'kPa' }, 'psi', 14.6959, 5e-5],
      ['a typed "in hg" is read as inches of mercury', { value: 2, unit: 'in hg' }, 'kpa', 6.772778, 1e-9],
    ])('%s', async (_name, convert, field, expected, tolerance) => {
      const res = await calc('pressure', { convert });
      expect(res.status).toBe(200);
      near(res.body.convert[field], expected, tolerance);
    });

    it('turns 20 inHg of vacuum under a 101.325 kPa barometer into 33.597 kPa absolute (NIST SP 811, computed)', async () => {
      const res = await calc('pressure', { vacuum: { baroKpa: 101.325, vacuumInHg: 20 } });
      near(res.body.vacuum.absoluteKpa, 33.597, 5e-4);
    });

    it('turns 33.597 kPa absolute under 101.325 kPa back into 20.000 inHg of vacuum (NIST SP 811, computed)', async () => {
      const res = await calc('pressure', { vacuum: { baroKpa: 101.325, absoluteKpa: 33.59722 } });
      near(res.body.vacuum.vacuumInHg, 20, 1e-6);
    });

    it('reads a linear sensor through its two calibration points: 2.5 V on the 0.5 V/20 kPa–4.5 V/105 kPa line is 62.5 kPa (computed)', async () => {
      const points = [{ volts: 0.5, kpa: 20 }, { volts: 4.5, kpa: 105 }];
      const res = await calc('pressure', { sensor: { points, volts: 2.5 } });
      near(res.body.sensor.kpa, 62.5, 1e-9);
      near(res.body.sensor.voltsPerKpa, 4 / 85, 1e-12);
      const back = await calc('pressure', { sensor: { points, kpa: 62.5 } });
      near(back.body.sensor.volts, 2.5, 1e-12);
    });

    it('answers several sections of one request under their own names', async () => {
      const res = await calc('pressure', { convert: { value: 1, unit: 'psi' }, vacuum: { baroKpa: 100, vacuumInHg: 0 } });
      expect(Object.keys(res.body).sort()).toEqual(['convert', 'vacuum']);
      expect(res.body.vacuum.absoluteKpa).toBe(100);
    });
  });

  describe('scan data, SAE J1979 mode 01 (formulas as on the public "OBD-II PIDs" reference page)', () => {
    it.each([
      ['decodes PID 05 byte 7B as 83 °C coolant (A − 40, computed)', { pid: '05', bytes: '7B' }, 83, '°C'],
      ['decodes PID 0F byte 3C as 20 °C intake air (A − 40, computed)', { pid: '0F', bytes: '3C' }, 20, '°C'],
      ['decodes PID 0B byte 21 as 33 kPa manifold pressure (A, computed)', { pid: '0B', bytes: '21' }, 33, 'kPa'],
      ['decodes PID 0C bytes 1A F8 as 1726 rpm ((256A + B)/4, computed)', { pid: '0C', bytes: '1A F8' }, 1726, 'rpm'],
      ['decodes PID 0C given as numbers [26, 248] as 1726 rpm', { pid: 12, bytes: [0x1a, 0xf8] }, 1726, 'rpm'],
      ['decodes PID 42 bytes 31 2D as 12.589 V ((256A + B)/1000, computed)', { pid: '42', bytes: '31 2D' }, 12.589, 'V'],
      ['decodes PID 11 byte 80 as 50.196 % throttle (100·A/255, computed)', { pid: '11', bytes: '80' }, 50.196, '%'],
      ['decodes PID 49 byte 33 as 20.000 % pedal (100·A/255, computed)', { pid: '49', bytes: '33' }, 20.0, '%'],
    ])('%s', async (_name, body, expected, unit) => {
      const res = await calc('scan-decode', body);
      expect(res.status).toBe(200);
      near(res.body.value, expected, 5e-4);
      expect(res.body).toMatchObject({ kind: 'measurement', unit });
    });

    it('lists the supported PIDs of the reference page’s worked example BE 1F A8 13', async () => {
      const res = await calc('scan-decode', { pid: '00', bytes: 'BE 1F A8 13' });
      expect(res.body.value).toEqual(['01', '03', '04', '05', '06', '07', '0C', '0D', '0E', '0F', '10', '11', '13', '15', '1C', '1F', '20']);
    });
  });

  describe('trouble codes, SAE J2012 two-byte layout', () => {
    it.each([
      ['decodes C1 58 as U0158 (the reference page’s worked example)', 'C1 58', 'U0158', 'network'],
      ['decodes 01 04 as P0104 (computed)', '01 04', 'P0104', 'powertrain'],
      ['decodes 41 23 as C0123 (computed)', '41 23', 'C0123', 'chassis'],
      ['decodes 80 03 as B0003 (computed)', '80 03', 'B0003', 'body'],
      ['decodes 0A 12 as P0A12 (computed)', '0A 12', 'P0A12', 'powertrain'],
    ])('%s', async (_name, bytes, code, system) => {
      const res = await calc('trouble-code', { bytes });
      expect(res.status).toBe(200);
      expect(res.body).toMatchObject({ code, system, bytes });
    });

    it('reads 00 00 as no code stored', async () => {
      const res = await calc('trouble-code', { bytes: [0, 0] });
      expect(res.body.code).toBeNull();
    });

    it('gives the generic meaning of a typed P0122: throttle/pedal position "A" circuit, low input (SAE J2012 generic list)', async () => {
      const res = await calc('trouble-code', { code: 'p0122' });
      expect(res.body).toMatchObject({ code: 'P0122', bytes: '01 22', scope: 'sae_generic', genericMeaning: { variant: 'low input', circuitKind: 'three_wire_5v' } });
    });

    it('gives no generic meaning for P0640, which is not a reference-voltage code (SAE J2012 generic list)', async () => {
      const res = await calc('trouble-code', { code: 'P0640' });
      expect(res.body.genericMeaning).toBeNull();
    });
  });

  describe('bad input gets a 400 naming the field and why', () => {
    it.each(
      byPath([
        ['a meter of 0 Ω', { name: 'bias-resistance', body: { readVolts: 4.87, meterOhms: 0 } }, 'body.meterOhms'],
        ['a meter of 0 Ω', { name: 'meter-loading', body: { sourceVolts: 5, sourceOhms: 1e6, meterOhms: 0 } }, 'body.meterOhms'],
        ['a negative source resistance', { name: 'meter-loading', body: { sourceVolts: 5, sourceOhms: -1 } }, 'body.sourceOhms'],
        ['a negative thermistor resistance', { name: 'thermistor', body: { ohms: -10 } }, 'body.ohms'],
        ['a negative beta', { name: 'thermistor', body: { model: { kind: 'beta', r25Ohms: 10_000, beta: -3950 }, temperatureC: 20 } }, 'body.model.beta'],
        ['an unknown thermistor model', { name: 'thermistor', body: { model: { kind: 'ptc' }, temperatureC: 20 } }, 'body.model.kind'],
        ['a temperature and a resistance at once', { name: 'thermistor', body: { temperatureC: 20, ohms: 10_000 } }, 'body.ohms'],
        ['a divider voltage without its pull-up', { name: 'thermistor', body: { volts: 2.5 } }, 'body.divider'],
        ['a divider voltage above the supply', { name: 'thermistor', body: { volts: 5.5, divider: { pullUpOhms: 10_000 } } }, 'body.volts'],
        ['a loaded reading above the open-circuit voltage', { name: 'bias-resistance', body: { readVolts: 5.2 } }, 'body.readVolts'],
        ['a reference load of 0 Ω', { name: 'reference-load', body: { openVolts: 5, loadedVolts: 1, loadOhms: 0 } }, 'body.loadOhms'],
        ['a negative reference tolerance', { name: 'reference-load', body: { openVolts: 5, loadedVolts: 1, loadOhms: 1, limits: { toleranceVolts: -0.1 } } }, 'body.limits.toleranceVolts'],
        ['a drop limit of 0 V', { name: 'voltage-drop', body: { dropVolts: 0.05, limitVolts: 0 } }, 'body.limitVolts'],
        ['a volt unit in a pressure conversion', { name: 'pressure', body: { convert: { value: 5, unit: 'V' } } }, 'body.convert.unit'],
        ['an unknown pressure unit', { name: 'pressure', body: { convert: { value: 1, unit: 'bar' } } }, 'body.convert.unit'],
        ['more vacuum than the barometer allows', { name: 'pressure', body: { vacuum: { baroKpa: 101.325, vacuumInHg: 31 } } }, 'body.vacuum.vacuumInHg'],
        ['two calibration points at one pressure', { name: 'pressure', body: { sensor: { points: [{ volts: 0.5, kpa: 20 }, { volts: 4.5, kpa: 20 }] } } }, 'body.sensor.points.1'],
        ['an empty pressure request', { name: 'pressure', body: {} }, 'body'],
        ['a PID this service does not decode', { name: 'scan-decode', body: { pid: 'FE', bytes: '00' } }, 'body.pid'],
        ['a PID that is not hex', { name: 'scan-decode', body: { pid: 'XY', bytes: '00' } }, 'body.pid'],
        ['one byte for engine speed', { name: 'scan-decode', body: { pid: '0C', bytes: '1A' } }, 'body.bytes'],
        ['a byte that is not hex', { name: 'scan-decode', body: { pid: '0C', bytes: '1A ZZ' } }, 'body.bytes.1'],
        ['a byte above 255', { name: 'scan-decode', body: { pid: '05', bytes: [300] } }, 'body.bytes.0'],
        ['three bytes for a trouble code', { name: 'trouble-code', body: { bytes: 'C1 58 00' } }, 'body.bytes'],
        ['a trouble code with a first digit above 3', { name: 'trouble-code', body: { code: 'P4122' } }, 'body.code'],
        ['both bytes and a code', { name: 'trouble-code', body: { code: 'P0122', bytes: '01 22' } }, 'body.code'],
        ['a field the body does not have', { name: 'meter-loading', body: { sourceVolts: 5, sourceOhms: 1, volts: 5 } }, 'body'],
      ]),
    )('refuses %s with a 400 naming %s', async (_name, path, { name, body }) => {
      const res = await calc(name as string, body);
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('invalid_input');
      const found = res.body.error.findings as Array<{ path: string; message: string }>;
      expect(found.map((f) => f.path)).toContain(path);
      for (const f of found) expect(f.message.length).toBeGreaterThan(5);
    });

    it('refuses a call without a sign-in with a 401', async () => {
      const res = await api.call('POST', '/api/calculators/meter-loading', { body: { sourceVolts: 5, sourceOhms: 1 } });
      expect(res.status).toBe(401);
    });
  });

  it('lists every calculator in the OpenAPI document with its body and the user header', async () => {
    const doc = await api.call('GET', '/api/openapi.json');
    for (const name of ['bias-resistance', 'meter-loading', 'reference-load', 'voltage-drop', 'thermistor', 'pressure', 'scan-decode', 'trouble-code']) {
      const op = doc.body.paths[`/api/calculators/${name}`]?.post;
      expect(op, name).toBeDefined();
      expect(op.security).toEqual([{ user: [] }]);
      expect(op.tags).toEqual(['calculators']);
      expect(op.requestBody.content['application/json'].schema.type).toBe('object');
    }
  });
});
