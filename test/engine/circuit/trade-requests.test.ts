import { describe, expect, it } from 'vitest';
import { defaultCircuit, faultsFor, predictReading, thermistorOhms, type CircuitSpec, type FaultSpec } from '../../../src/engine/circuit';
import { MeasurementRequestSchema } from '../../../src/engine/request-schema';
import type { MeasurementRequest } from '../../../src/engine/vocabulary';

// A lead at each end, the module's own draw, the regulator's limit, cranking, and the faults no tree used before.
// Part values are the model's defaults (src/engine/circuit/defaults.ts): 0.1 Ω wires, 0.005 Ω terminal pairs,
// 5 kΩ track at 0.15, 1 Ω regulator output with a 100 mA limit (common practice, no source).
const threeWire = defaultCircuit('three_wire_5v');
const base: MeasurementRequest = { quantity: 'dc_volts', at: 'signal', against: 'battery_negative', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', jumpers: [] };
const read = (request: Partial<MeasurementRequest>, faults: FaultSpec[] = [], circuit: CircuitSpec = threeWire) => {
  const r = predictReading(circuit, faults, { ...base, ...request });
  if (!r.ok) throw new Error(JSON.stringify(r.findings));
  return r.value;
};
const endToEnd = (wire: 'reference' | 'signal' | 'ground'): Partial<MeasurementRequest> => ({
  quantity: 'ohms',
  at: wire,
  against: wire,
  againstLocation: 'module_connector',
  connector: 'unplugged',
  otherConnector: 'unplugged',
  key: 'off',
});
const wireToWire: Partial<MeasurementRequest> = { quantity: 'ohms', at: 'signal', against: 'reference', connector: 'unplugged', otherConnector: 'unplugged', key: 'off' };
const groundDrop: Partial<MeasurementRequest> = { at: 'ground', location: 'sensor_connector', against: 'ground', againstLocation: 'module_connector', connector: 'backprobed', otherConnector: 'backprobed' };

describe('a lead at each end', () => {
  it.each<[string, Partial<MeasurementRequest>, FaultSpec[], number]>([
    // Ohm's law over the wire alone (computed): both connectors unplugged, nothing else in the loop.
    ['end to end, a healthy signal wire: its own 0.1 Ω', endToEnd('signal'), [], 0.1],
    ['end to end, 10 kΩ in the signal wire: 10 000.1 Ω', endToEnd('signal'), faultsFor('signal_high_resistance'), 10_000.1],
    ['end to end, 200 Ω in the reference: 200.1 Ω', endToEnd('reference'), faultsFor('reference_high_resistance'), 200.1],
    ['wire to wire, a 2 kΩ chafe between signal and reference: 2 kΩ plus two half wires', wireToWire, [{ kind: 'short_between', wires: ['signal', 'reference'], ohms: 2000 }], 2000.1],
  ])('%s', (_name, request, faults, expected) => {
    expect(read(request, faults)).toBeCloseTo(expected, 3);
  });

  it.each<[string, Partial<MeasurementRequest>, FaultSpec[]]>([
    ['end to end, a broken signal wire reads over-range', endToEnd('signal'), faultsFor('signal_open')],
    ['wire to wire with both ends unplugged reads over-range on a healthy harness', wireToWire, []],
  ])('%s', (_name, request, faults) => {
    expect(read(request, faults)).toBe(Number.POSITIVE_INFINITY);
  });

  it('sees the module bias between the wires when the module stays plugged: why both ends must be unplugged', () => {
    // 250 kΩ pull-up between reference and signal inside the module (defaults.ts), so the ohmmeter reads about that.
    expect(read({ ...wireToWire, otherConnector: undefined })).toBeCloseTo(250_000, -3);
  });

  it.each<[string, FaultSpec[], number]>([
    // The track's current through the wire, I × R (computed): 5 V / (5 000 Ω + loop) × 0.1 Ω ≈ 0.1 mV.
    ['a healthy sensor ground drops about 0.1 mV with the sensor working', [], 0.0001],
    // 200 Ω in the ground: 5 V × 200.1 / (5 000 + 200.1 + 1.4) = 0.192 V, plus the module bias's 17 µA (computed).
    ['200 Ω in the sensor ground drops about 0.19 V with current flowing', faultsFor('ground_high_resistance'), 0.192],
  ])('loaded voltage drop along the sensor ground, sensor pin to module pin: %s', (_name, faults, expected) => {
    expect(read(groundDrop, faults)).toBeCloseTo(expected, expected < 0.01 ? 4 : 2);
  });

  it('drops about 0.19 V along a reference with 200 Ω in it, module pin to sensor pin, sensor working', () => {
    // Ohm's law over the series loop (computed): 5 V × (200 + 0.1 + 2 × 0.005) / (5 000 + 200.1 + 1 + 0.11 + 0.05 + 0.01)
    // ≈ 0.1924 V; the module bias feeding the wiper takes about 0.6 mV off it, within ±5 mV.
    const drop = { at: 'reference', against: 'reference', location: 'module_connector', againstLocation: 'sensor_connector', connector: 'backprobed', otherConnector: 'backprobed' } as const;
    expect(read(drop, faultsFor('reference_high_resistance'))).toBeCloseTo((5 * 200.11) / (5000 + 200.11 + 1 + 0.11 + 0.05 + 0.01), 2);
    expect(Math.abs(read(drop))).toBeLessThan(0.001);
  });

  it('reads a signal wire chafed onto the sensor ground wire as the chafe plus two half wires, both connectors unplugged', () => {
    // Series resistances add (computed): 470 Ω + 0.05 Ω + 0.05 Ω.
    const chafe: FaultSpec[] = [{ kind: 'short_between', wires: ['signal', 'ground'], ohms: 470 }];
    expect(read({ ...wireToWire, against: 'ground' }, chafe)).toBeCloseTo(470.1, 3);
  });

  it('reads a thermistor through its wires from the module connector as its Steinhart–Hart resistance plus the loop', () => {
    // Steinhart & Hart (Deep-Sea Research 15, 1968): 1/T = A + B ln R + C (ln R)³, coefficients of the generic 10 kΩ set
    // (from memory, generic); inverted in closed form by Cardano's formula for the depressed cubic (computed).
    const [a, b, c] = [1.12924e-3, 2.34108e-4, 8.7755e-8];
    const inverse = (celsius: number) => {
      const x = (a - 1 / (celsius + 273.15)) / c;
      const y = Math.sqrt((b / (3 * c)) ** 3 + x ** 2 / 4);
      return Math.exp(Math.cbrt(y - x / 2) - Math.cbrt(y + x / 2));
    };
    const ntc = defaultCircuit('two_wire_thermistor', { temperatureC: 80 });
    const fromModule = { quantity: 'ohms', at: 'signal', against: 'ground', location: 'module_connector', connector: 'unplugged', key: 'off' } as const;
    // Two 0.1 Ω wires and the two mated terminal pairs at the sensor, 0.005 Ω each.
    expect(read(fromModule, [], ntc)).toBeCloseTo(inverse(80) + 0.21, 0);
    expect(read(fromModule, faultsFor('sensor_internal_open'), ntc)).toBe(Number.POSITIVE_INFINITY);
  });

  it('keeps old requests valid: without the new fields a request reads exactly as before', () => {
    const old = read({});
    expect(read({ againstLocation: undefined, otherConnector: 'plugged' })).toBe(old);
    expect(MeasurementRequestSchema.safeParse(base).success).toBe(true);
  });

  it.each<[string, Partial<MeasurementRequest>, string]>([
    ['the same point at one connector', { against: 'signal' }, 'request.same_point'],
    ['a far location on a scan value', { quantity: 'scan_value', against: undefined, pid: '11', againstLocation: 'module_connector' }, 'request.against_location_on_scan'],
    ['a far location on a fixed point', { againstLocation: 'module_connector' }, 'request.against_location_on_fixed_point'],
  ])('refuses %s with a coded finding', (_name, change, code) => {
    const r = MeasurementRequestSchema.safeParse({ ...base, ...change });
    expect(r.success).toBe(false);
    expect(JSON.stringify(r.error!.issues)).toContain(code);
  });
});

describe('the module and its 5 V supply under load', () => {
  const drawing = structuredClone(threeWire);
  drawing.module.supplyAmps = 0.5;

  it('shows a resistive module ground as an offset: 12.4 V over the module’s 24.8 Ω draw and a 1 Ω ground (computed)', () => {
    const offset = read({ at: 'ground', connector: 'backprobed' }, [{ kind: 'module_ground_resistance', ohms: 1 }], drawing);
    expect(offset).toBeCloseTo((12.4 * 1) / (24.8 + 1 + 0.01), 2);
    expect(read({ at: 'ground' }, [], drawing)).toBeLessThan(0.01);
  });

  it('sags the 5 V reference under a load beyond its current limit and recovers once the load is unplugged', () => {
    const limited = structuredClone(threeWire);
    limited.module.regulator.currentLimitAmps = 0.1;
    // 33 Ω across reference and ground at the harness: 5 V / 34 Ω = 147 mA wanted, 100 mA given: 100 mA × 33.2 Ω ≈ 3.3 V.
    const loaded = read({ at: 'reference', connector: 'unplugged', jumpers: [{ from: 'reference', to: 'ground', via: { kind: 'resistor', ohms: 33 } }] }, [], limited);
    expect(loaded).toBeCloseTo(0.1 * 33.155, 1);
    expect(read({ at: 'reference', connector: 'unplugged' }, [], limited)).toBeCloseTo(5.0, 3);
  });

  it('dips the reference while a weak battery cranks at 5.5 V, and comes back to 4.8–5.1 V running (common practice, no source)', () => {
    const weak = structuredClone(threeWire);
    weak.battery.volts.cranking = 5.5;
    const cranking = read({ at: 'reference', engine: 'cranking' }, [], weak);
    const running = read({ at: 'reference', engine: 'running' }, [], weak);
    expect(cranking).toBeLessThan(4.8);
    expect(running).toBeGreaterThanOrEqual(4.8);
    expect(running).toBeLessThanOrEqual(5.1);
  });
});

describe('faults the model supports beyond the trees', () => {
  const healthySignal = read({});
  it.each<[string, FaultSpec[], Partial<MeasurementRequest>, (v: number) => void]>([
    // Values within the module bias's pull of a few tens of mV (computed, ±0.05 V).
    // 200 Ω at the sensor-ground terminal lifts the whole track: 5 V × (200 + 750) / 5 201 ≈ 0.91 V.
    ['a corroded ground terminal at the sensor lifts the signal', [{ kind: 'poor_terminal', connector: 'sensor_connector', wire: 'ground', ohms: 200 }], {}, (v) => expect(v).toBeCloseTo(0.913, 1)],
    ['a skewed position sensor reads in range but 0.1 of travel high: 0.25 × 5 V', [{ kind: 'sensor_internal', variant: 'skewed' }], {}, (v) => expect(v).toBeCloseTo(1.25, 1)],
    ['a stuck sensor reads mid-travel whatever the throttle does', [{ kind: 'sensor_internal', variant: 'stuck', value: 0.5 }], {}, (v) => expect(v).toBeCloseTo(2.5, 1)],
    ['the sensor ground shorted to battery voltage pulls the ground pin up', faultsFor('ground_short_voltage'), { at: 'ground' }, (v) => expect(v).toBeGreaterThan(1)],
    ['200 Ω in the reference barely moves a 5 kΩ track’s signal', faultsFor('reference_high_resistance'), {}, (v) => expect(Math.abs(v - healthySignal)).toBeLessThan(0.05)],
  ])('%s', (_name, faults, request, check) => {
    check(read(request, faults));
  });

  it('reads a skewed thermistor as 20 °C warmer than it is (Steinhart–Hart curve of the model)', () => {
    const ntc = defaultCircuit('two_wire_thermistor', { temperatureC: 20 });
    const ohms = (t: number) => thermistorOhms(ntc.sensor.kind === 'thermistor' ? ntc.sensor.model : { kind: 'beta', r25Ohms: 1, beta: 1 }, t)!;
    const v = read({ connector: 'backprobed' }, [{ kind: 'sensor_internal', variant: 'skewed' }], ntc);
    // 10 kΩ pull-up: V = 5 × R(40 °C) / (R(40 °C) + 10 kΩ + loop), computed.
    expect(v).toBeCloseTo((5 * ohms(40)) / (ohms(40) + 10_000), 1);
  });
});
