import { describe, expect, it } from 'vitest';
import {
  defaultCircuit,
  faultsFor,
  GENERIC_10K_STEINHART_HART,
  meterWith,
  predictReading,
  ADC_STEP_VOLTS,
  adcReading,
  type CircuitSpec,
  type FaultSpec,
} from '../../../src/engine/circuit';
import { steinhartHartResistance, thermistorDividerVolts } from '../../../src/engine/calc';
import type { MeasurementRequest, Point } from '../../../src/engine/vocabulary';

const threeWire = defaultCircuit('three_wire_5v'); // pot at 0.15, 250 kΩ pull-up, 5 V regulator behind 1 Ω
const thermistor = defaultCircuit('two_wire_thermistor'); // 10 kΩ pull-up, generic 10 kΩ NTC at 20 °C

function request(overrides: Partial<MeasurementRequest> = {}): MeasurementRequest {
  return {
    quantity: 'dc_volts',
    at: 'reference',
    against: 'battery_negative',
    location: 'sensor_connector',
    connector: 'backprobed',
    key: 'on',
    engine: 'off',
    jumpers: [],
    ...overrides,
  };
}

function volts(circuit: CircuitSpec, faults: FaultSpec[], at: Point, overrides: Partial<MeasurementRequest> = {}): number {
  const r = predictReading(circuit, faults, request({ at, ...overrides }));
  if (!r.ok) throw new Error(JSON.stringify(r.findings));
  return r.value;
}

function scan(circuit: CircuitSpec, faults: FaultSpec[], overrides: Partial<MeasurementRequest> = {}): number {
  const r = predictReading(circuit, faults, request({ quantity: 'scan_value', at: undefined as never, against: undefined, ...overrides }));
  if (!r.ok) throw new Error(JSON.stringify(r.findings));
  return r.value;
}

describe('KOEO back-probe at the sensor connector, one row per fault (physics of the model, worked in the comments)', () => {
  // Each row: hypothesis, point, [min, max] V to battery negative on a 10 MΩ meter. Healthy: reference 5 V, signal
  // = wiper 0.15 × 5 V = 0.75 V, ground ≈ 0 V.
  it.each([
    ['the good circuit shows 5 V on the reference', 'good', 'reference', 4.95, 5.01],
    ['the good circuit shows the wiper voltage, 0.15 × 5 V, on the signal', 'good', 'signal', 0.74, 0.78],
    ['the good circuit shows about 0 V on the sensor ground', 'good', 'ground', -0.001, 0.01],
    ['a reference open leaves the sensor side of the reference pulled to ground through the track', 'reference_open', 'reference', -0.001, 0.05],
    ['a reference shorted to ground reads about 0 V', 'reference_short_ground', 'reference', -0.01, 0.1],
    ['a reference shorted to battery voltage reads battery voltage', 'reference_short_voltage', 'reference', 11.5, 12.5],
    ['a signal open leaves the sensor side at the wiper voltage', 'signal_open', 'signal', 0.74, 0.76],
    ['a signal shorted to ground reads about 0 V', 'signal_short_ground', 'signal', -0.01, 0.01],
    ['a signal shorted to battery voltage reads battery voltage', 'signal_short_voltage', 'signal', 11.5, 12.5],
    ['a signal shorted to the reference reads 5 V', 'signal_short_reference', 'signal', 4.9, 5.01],
    ['a sensor ground open lets the ground float up to the reference through the track', 'ground_open', 'ground', 4.9, 5.01],
    // 200 Ω in the ground carries the track's 1 mA: about 0.2 V, above the 0.1 V limit (common practice, no source).
    ['a 200 Ω sensor ground shows about 0.2 V of drop', 'ground_high_resistance', 'ground', 0.18, 0.21],
    ['an open track pulls the signal to ground through the lower track', 'sensor_internal_open', 'signal', -0.001, 0.03],
    // Wiper off the track by 1 MΩ: the 250 kΩ pull-up wins: (5·1M + 0.75·250k)/1.25M ≈ 4.15 V.
    ['a worn spot lets the pull-up lift the signal', 'sensor_internal_worn_spot', 'signal', 4.0, 4.3],
    ['a stuck wiper holds the signal at half the reference', 'sensor_internal_stuck', 'signal', 2.45, 2.52],
    ['a dead regulator leaves the reference at 0 V', 'module_internal_regulator', 'reference', -0.001, 0.01],
    // 500 Ω regulator output into the 5 kΩ track: 5 · 5000/5500 ≈ 4.55 V.
    ['a weak regulator sags under the sensor’s load', 'module_internal_weak_regulator', 'reference', 4.5, 4.6],
    ['a dead module input still shows a good signal at the connector', 'module_internal_input', 'signal', 0.74, 0.78],
  ] as const)('%s', (_name, hypothesis, point, min, max) => {
    const v = volts(threeWire, faultsFor(hypothesis), point);
    expect(v).toBeGreaterThanOrEqual(min);
    expect(v).toBeLessThanOrEqual(max);
  });
});

describe('what the module reads (scan value, key on)', () => {
  it.each([
    ['the good circuit', 'good', 0.74, 0.78],
    // No meter on the module side of the break: the 250 kΩ pull-up lifts the input to the full rail.
    ['a signal open', 'signal_open', 4.99, 5.0],
    ['a dead module input', 'module_internal_input', -0.001, 0.001],
    ['a reference open', 'reference_open', -0.001, 0.05],
  ] as const)('reads %s correctly', (_name, hypothesis, min, max) => {
    const v = scan(threeWire, faultsFor(hypothesis));
    expect(v).toBeGreaterThanOrEqual(min);
    expect(v).toBeLessThanOrEqual(max);
  });

  it('reads the thermistor divider V = 5·Rt/(Rt + Rp) (voltage-divider rule, computed; wires add well under 1 mV)', () => {
    const rt = steinhartHartResistance(20, GENERIC_10K_STEINHART_HART);
    const expected = rt.ok ? thermistorDividerVolts({ supplyVolts: 5, pullUpOhms: 10_000, thermistorOhms: rt.value }) : rt;
    // Within half a converter step: the module reads through a 10-bit, 5.00 V converter (4.9 mV steps).
    expect(Math.abs(scan(thermistor, []) - (expected.ok ? expected.value : Number.NaN))).toBeLessThanOrEqual(ADC_STEP_VOLTS / 2 + 1e-3);
  });

  it('reads 5 V on an unplugged thermistor through the pull-up (open circuit)', () => {
    expect(scan(thermistor, [], { connector: 'unplugged' })).toBeCloseTo(5.0, 3);
  });
});

describe('the meter is part of the circuit', () => {
  // Signal open, probed at the module connector: 5 V through 250 kΩ into 10 MΩ = 5·10/10.25 = 4.878 V
  // (meter loading: voltage-divider rule, Horowitz & Hill, The Art of Electronics, ch. 1, from memory); the model's rail sits 1 mV low (the track's 1 mA through the regulator's 1 Ω).
  it('reads 4.878 V on a 250 kΩ pull-up input from the module connector with a 10 MΩ meter', () => {
    const v = volts(threeWire, faultsFor('signal_open'), 'signal', { location: 'module_connector' });
    expect(Math.abs(v - (5 * 10e6) / (10e6 + 250e3))).toBeLessThan(2e-3);
  });

  it('reads 4.87 V on a 267 kΩ bias (common practice, no source: about 4.87 V on 10 MΩ)', () => {
    const circuit = defaultCircuit('three_wire_5v', { bias: { kind: 'pull_up', ohms: 267_000 } });
    expect(volts(circuit, [], 'signal', { connector: 'unplugged' })).toBeCloseTo(4.87, 2);
  });

  it('reads lower on a 1 MΩ meter: 5·1/1.25 = 4.0 V (voltage-divider rule, Horowitz & Hill, The Art of Electronics, ch. 1, from memory)', () => {
    const r = predictReading(threeWire, [], request({ at: 'signal', connector: 'unplugged' }), meterWith({ inputOhms: 1e6 }));
    expect(r.ok && r.value).toBeCloseTo(4.0, 2);
  });

  it('reads 4.9950 V on a thermistor signal behind 10 kΩ, unplugged (voltage-divider rule: 5 V behind 10 kΩ on 10 MΩ, computed)', () => {
    expect(volts(thermistor, [], 'signal', { connector: 'unplugged' })).toBeCloseTo(4.995, 3);
  });

  it('does not sag the regulated reference under the meter', () => {
    expect(volts(threeWire, [], 'reference', { connector: 'unplugged' })).toBeCloseTo(5.0, 5);
  });

  it('holds 5 V on the reference while cranking drops the battery to 10 V', () => {
    expect(volts(threeWire, [], 'battery_positive', { engine: 'cranking' })).toBeCloseTo(10.0, 2);
    expect(volts(threeWire, [], 'reference', { engine: 'cranking' })).toBeCloseTo(5.0, 2);
  });

  it('reads 0 V on the reference at an unplugged module connector (the harness no longer reaches the regulator)', () => {
    expect(volts(threeWire, [], 'reference', { location: 'module_connector', connector: 'unplugged' })).toBeCloseTo(0, 6);
  });
});

describe('ohms on an unpowered circuit, amps as a shunt', () => {
  const ohms = (faults: FaultSpec[], at: Point, overrides: Partial<MeasurementRequest> = {}) =>
    predictReading(threeWire, faults, request({ quantity: 'ohms', at, key: 'off', connector: 'unplugged', ...overrides }));

  it('reads the 250 kΩ bias plus the unpowered regulator’s 1 kΩ on the signal, key off', () => {
    const r = ohms([], 'signal');
    expect(r.ok && r.value).toBeCloseTo(251_000, -1);
  });

  it('reads a fraction of an ohm on the sensor ground to battery negative', () => {
    // wire 0.1 + contact 0.005 + sensor-ground 0.05 + module ground 0.01 Ω.
    const r = ohms([], 'ground');
    expect(r.ok && r.value).toBeCloseTo(0.165, 6);
  });

  it('shows overload on an open signal wire', () => {
    const r = ohms(faultsFor('signal_open'), 'signal');
    expect(r).toMatchObject({ ok: true, overload: true, value: Number.POSITIVE_INFINITY });
  });

  it('refuses ohms with the key on as a meaningless reading', () => {
    const r = ohms([], 'signal', { key: 'on' });
    expect(!r.ok && r.findings[0]?.code).toBe('measurement.ohms_on_powered_circuit');
  });

  it('refuses ohms on a wire shorted to battery voltage even with the key off', () => {
    const r = ohms(faultsFor('signal_short_voltage'), 'signal');
    expect(!r.ok && r.findings[0]).toMatchObject({ code: 'measurement.ohms_on_powered_circuit', path: 'request.at' });
  });

  it('passes the reference’s short-circuit current through a 0.1 Ω shunt (Ohm’s law over the loop) on a regulator without a limit', () => {
    const r = predictReading(threeWire, [], request({ quantity: 'amps', at: 'reference', against: 'ground', connector: 'unplugged' }));
    // 5 V over regulator 1 Ω + 2 × (contact 0.005 + wire 0.1) + shunt 0.1 + sensor-ground 0.05 Ω.
    expect(r.ok && r.value).toBeCloseTo(5 / (1 + 0.21 + 0.1 + 0.05), 3);
  });

  it('holds the short-circuit current at the regulator’s 100 mA limit when one is given (common practice, no source)', () => {
    const limited = structuredClone(threeWire);
    limited.module.regulator.currentLimitAmps = 0.1;
    const r = predictReading(limited, [], request({ quantity: 'amps', at: 'reference', against: 'ground', connector: 'unplugged' }));
    expect(r.ok && r.value).toBeCloseTo(0.1, 6);
  });
});

describe('jumpers', () => {
  it.each([
    ['a fused jumper from signal to ground drives the module input to 0 V', { from: 'signal', to: 'ground', via: { kind: 'fused_jumper' } }, 0, 0.001],
    ['a fused jumper from signal to reference drives the module input to 5 V', { from: 'signal', to: 'reference', via: { kind: 'fused_jumper' } }, 4.99, 5.0],
    ['a 2.5 V source on the signal is what the module reads', { from: 'signal', to: 'battery_negative', via: { kind: 'voltage_source', volts: 2.5 } }, 2.49, 2.51],
    // 250 kΩ pull-up against 250 kΩ to ground: half the rail.
    ['a 250 kΩ resistor to ground halves the pulled-up input', { from: 'signal', to: 'ground', via: { kind: 'resistor', ohms: 250_000 } }, 2.49, 2.51],
  ] as const)('%s', (_name, jumper, min, max) => {
    const v = scan(threeWire, [], { connector: 'unplugged', jumpers: [jumper] });
    expect(v).toBeGreaterThanOrEqual(min);
    expect(v).toBeLessThanOrEqual(max);
  });
});

describe('several faults at once', () => {
  it('sees a short to ground on the sensor side of an open signal only from the sensor side', () => {
    const faults: FaultSpec[] = [{ kind: 'open', wire: 'signal' }, { kind: 'short_to_ground', wire: 'signal' }];
    expect(volts(threeWire, faults, 'signal')).toBeCloseTo(0, 2);
    expect(scan(threeWire, faults)).toBeCloseTo(5.0, 2);
  });

  it('adds two high resistances in series', () => {
    const one = volts(threeWire, [{ kind: 'high_resistance', wire: 'ground', ohms: 100 }], 'ground');
    const two = volts(threeWire, [{ kind: 'high_resistance', wire: 'ground', ohms: 100 }, { kind: 'high_resistance', wire: 'ground', ohms: 100 }], 'ground');
    expect(two).toBeGreaterThan(one * 1.8);
  });
});

describe('bad input comes back as coded, path-addressed findings', () => {
  const broken = (patch: (c: CircuitSpec) => void): CircuitSpec => {
    const c = structuredClone(threeWire);
    patch(c);
    return c;
  };
  it.each([
    ['a negative wire resistance', broken((c) => (c.wires[1]!.ohms = -1)), [], request(), 'input.negative_resistance', 'circuit.wires[1].ohms'],
    ['an unknown wire role', broken((c) => ((c.wires[0] as { role: string }).role = 'shield')), [], request(), 'circuit.unknown_wire_role', 'circuit.wires[0].role'],
    ['a wire list without a ground', broken((c) => c.wires.pop()), [], request(), 'circuit.missing_wire', 'circuit.wires'],
    ['the same wire twice', broken((c) => (c.wires[2]!.role = 'signal')), [], request(), 'circuit.duplicate_wire', 'circuit.wires[2].role'],
    ['a thermistor on a three-wire circuit', broken((c) => (c.sensor = structuredClone(thermistor.sensor))), [], request(), 'circuit.sensor_not_in_kind', 'circuit.sensor.kind'],
    ['a wiper position above 1', broken((c) => ((c.sensor as { position: number }).position = 1.5)), [], request(), 'input.out_of_range', 'circuit.sensor.position'],
    ['an unknown fault kind', threeWire, [{ kind: 'gremlin' } as never], request(), 'fault.unknown_kind', 'faults[0].kind'],
    ['a stuck variant the sensor lacks', threeWire, [{ kind: 'sensor_internal', variant: 'shorted' }], request(), 'fault.variant_not_applicable', 'faults[0].variant'],
    ['an unknown point', threeWire, [], request({ at: 'shield' as never }), 'request.unknown_point', 'request.at'],
    ['the engine cranking with the key off', threeWire, [], request({ key: 'off', engine: 'cranking' }), 'request.engine_without_key', 'request.engine'],
    ['a scan value with the key off', threeWire, [], request({ quantity: 'scan_value', key: 'off' }), 'measurement.scan_needs_key_on', 'request.key'],
    ['a jumper resistor of −5 Ω', threeWire, [], request({ jumpers: [{ from: 'signal', to: 'ground', via: { kind: 'resistor', ohms: -5 } }] }), 'input.negative_resistance', 'request.jumpers[0].via.ohms'],
    ['both leads on one point', threeWire, [], request({ against: 'reference' }), 'request.same_point_twice', 'request.against'],
  ] as const)('reports %s', (_name, circuit, faults, req, code, path) => {
    const r = predictReading(circuit, faults as unknown as FaultSpec[], req);
    expect(r.ok).toBe(false);
    expect(!r.ok && r.findings).toContainEqual(expect.objectContaining({ code, path }));
  });

  it('reports a reference reading on a two-wire thermistor circuit', () => {
    const r = predictReading(thermistor, [], request());
    expect(!r.ok && r.findings[0]).toMatchObject({ code: 'request.point_not_in_circuit', path: 'request.at' });
  });

  it('reports a reference fault on a two-wire thermistor circuit', () => {
    const r = predictReading(thermistor, faultsFor('reference_open'), request({ at: 'signal' }));
    expect(!r.ok && r.findings[0]).toMatchObject({ code: 'fault.wire_not_in_circuit', path: 'faults[0].wire' });
  });

  it('reports a meter of 0 Ω', () => {
    const r = predictReading(threeWire, [], request(), meterWith({ inputOhms: 0 }));
    expect(!r.ok && r.findings[0]).toMatchObject({ code: 'input.zero_resistance', path: 'meter.inputOhms' });
  });

  it('knows no faults for an unknown hypothesis id', () => {
    expect(faultsFor('flux_capacitor')).toBeUndefined();
    expect(faultsFor('constructor')).toBeUndefined();
  });
});

describe('sensor-internal fault values are checked', () => {
  it.each([
    ['a wiper stuck at 1.4', { kind: 'sensor_internal', variant: 'stuck', value: 1.4 }, 'input.out_of_range'],
    ['a worn spot of −1 Ω', { kind: 'sensor_internal', variant: 'worn_spot', value: -1 }, 'input.negative_resistance'],
    ['a stuck value that is not a number', { kind: 'sensor_internal', variant: 'stuck', value: Number.NaN }, 'input.not_a_number'],
  ] as const)('reports %s on faults[0].value', (_name, fault, code) => {
    const r = predictReading(threeWire, [fault], request({ at: 'signal' }));
    expect(!r.ok && r.findings[0]).toMatchObject({ code, path: 'faults[0].value' });
  });
});

describe('a thermistor described by the beta equation', () => {
  it('reads half the reference at 25 °C when R25 equals the 10 kΩ pull-up (voltage-divider rule, computed: 10 kΩ → 2.5000 V)', () => {
    const circuit = structuredClone(thermistor);
    circuit.sensor = { kind: 'thermistor', model: { kind: 'beta', r25Ohms: 10_000, beta: 3950 }, temperatureC: 25 };
    expect(Math.abs(scan(circuit, []) - 2.5)).toBeLessThanOrEqual(ADC_STEP_VOLTS / 2);
  });

  it('reports an unknown thermistor model', () => {
    const circuit = structuredClone(thermistor);
    circuit.sensor = { kind: 'thermistor', model: { kind: 'table' } as never, temperatureC: 25 };
    const r = predictReading(circuit, [], request({ at: 'signal' }));
    expect(!r.ok && r.findings[0]).toMatchObject({ code: 'sensor.unknown_thermistor_model', path: 'circuit.sensor.model.kind' });
  });
});

describe('the module converter behind a scan value (common practice, no source: 10-bit, 5.00 V full scale)', () => {
  it.each<[string, number, number]>([
    ['a wire driven to battery voltage reads full scale', 12.4, 5.0],
    ['a negative offset reads zero', -0.03, 0],
    ['a mid value lands on the nearest step', 0.7616, Math.round(0.7616 / ADC_STEP_VOLTS) * ADC_STEP_VOLTS],
  ])('%s', (_name, volts, expected) => {
    expect(adcReading(volts)).toBeCloseTo(expected, 9);
  });

  it('shows a signal shorted to battery voltage as 5.00 V on the scan tool while the meter reads battery voltage', () => {
    expect(scan(threeWire, [{ kind: 'short_to_voltage', wire: 'signal' }])).toBeCloseTo(5.0, 9);
    expect(volts(threeWire, [{ kind: 'short_to_voltage', wire: 'signal' }], 'signal')).toBeGreaterThan(11);
  });
});
