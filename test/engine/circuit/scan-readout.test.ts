/**
 * The scan values a comparison subtracts: the coolant PID decoded by the module from its converter, the intake-air
 * PID of the sensor the single-circuit model does not draw, and their difference on one sampled circuit.
 */
import { describe, expect, it } from 'vitest';
import { defaultCircuit, sampleDifferences, scanReadout, OTHER_SENSOR_TOLERANCE, type FaultSpec } from '../../../src/engine/circuit';
import type { MeasurementRequest } from '../../../src/engine/vocabulary';

const ect: MeasurementRequest = { quantity: 'scan_value', at: 'signal', location: 'sensor_connector', connector: 'plugged', key: 'on', engine: 'off', jumpers: [], pid: '05' };
const iat: MeasurementRequest = { ...ect, pid: '0F' };
const thermistor = defaultCircuit('two_wire_thermistor');
const ctx = { circuit: thermistor, draws: new Map([['bias.ohms', 10_000], ['regulator.volts', 5]]), u: () => 0 };

describe('the coolant PID as the module reports it', () => {
  // The generic 10 kΩ Steinhart–Hart set of src/engine/circuit/thermistor-curves.ts (a = 1.12924e-3, b = 2.34108e-4,
  // c = 8.7755e-8), the divider solved for the sensor, Rt = 10 kΩ · V / (5 V − V), then 1/T = a + b·ln R + c·(ln R)³
  // (Steinhart & Hart, Deep-Sea Research 15, 1968), shown in whole degrees (SAE J1979 PID 05: A − 40).
  it.each([
    ['2.5 V is 10 kΩ: 25.0 °C (computed)', 2.5, 25],
    ['1.0 V is 2.5 kΩ: 59.9 °C (computed)', 1.0, 60],
    ['4.0 V is 40 kΩ: −3.9 °C (computed)', 4.0, -4],
    ['the supply itself is an open sensor: the scale\'s bottom, −40 °C (SAE J1979 PID 05 range)', 5.0, -40],
    ['0 V is a shorted sensor: the scale\'s top, 215 °C (SAE J1979 PID 05 range)', 0, 215],
  ])('reads %s', (_name, volts, celsius) => {
    expect(scanReadout('05', 'two_wire_thermistor')!.value(volts, ctx)).toBe(celsius);
  });

  it('answers the intake-air PID as the circuit\'s own temperature within the stated tolerance (common practice, no source: ±2 °C)', () => {
    const readout = scanReadout('0F', 'two_wire_thermistor')!;
    expect(readout.own).toBe(false);
    expect(readout.value(Number.NaN, { ...ctx, u: () => 1 })).toBe(20 + OTHER_SENSOR_TOLERANCE.intakeAirC);
    expect(readout.value(Number.NaN, { ...ctx, u: () => -1 })).toBe(20 - OTHER_SENSOR_TOLERANCE.intakeAirC);
  });

  it('has no answer for a temperature PID on a three-wire circuit', () => {
    expect(scanReadout('05', 'three_wire_5v')).toBeUndefined();
  });
});

describe('the difference of two readings on one sampled circuit', () => {
  const sample = (temperatureC: number, faults: FaultSpec[]) => {
    const r = sampleDifferences({ circuit: defaultCircuit('two_wire_thermistor', { temperatureC }), faults, request: ect, compare: iat, samples: 400, seed: 7, spreads: { meterError: false } });
    if (!r.ok) throw new Error(JSON.stringify(r.findings));
    return r.values;
  };

  it.each<[string, number, FaultSpec[], number, number]>([
    // Healthy: the coolant PID is the circuit's temperature (2 % part tolerance, under a degree), the intake air within ±2 °C.
    ['a healthy sensor agrees with intake air within 3 °C (the two tolerances and whole degrees)', -20, [], -3, 3],
    ['a healthy sensor agrees at 80 °C too', 80, [], -3, 3],
    // Skewed 20 °C warm (the model's default): the difference is the skew within the same 3 °C.
    ['a sensor skewed 20 °C warm reads 17–23 °C above intake air', 20, [{ kind: 'sensor_internal', variant: 'skewed', value: 20 }], 17, 23],
    // Open: the input sits at the supply, less what leaks through the converter's input: the PID's floor (−40 °C) or
    // near it on the lowest pull-ups, against 20 °C of intake air.
    ['an open sensor reads 35 °C or more below intake air at 20 °C, at most the PID floor less 22 °C', 20, [{ kind: 'sensor_internal', variant: 'open_track' }], -62, -35],
  ])('%s', (_name, temperatureC, faults, lo, hi) => {
    const values = sample(temperatureC, faults);
    expect(values[0]).toBeGreaterThanOrEqual(lo);
    expect(values.at(-1)).toBeLessThanOrEqual(hi);
  });

  it('refuses a PID the model cannot answer, with a coded finding', () => {
    const r = sampleDifferences({ circuit: thermistor, faults: [], request: ect, compare: { ...iat, pid: '0B' }, samples: 10, seed: 1 });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.findings[0]).toMatchObject({ code: 'sampling.pid_not_modelled', path: 'request.pid' });
  });
});
