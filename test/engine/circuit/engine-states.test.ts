/**
 * The circuit model with the engine cranking or running and with the sensor's input moved: what the 5 V reference
 * does when the battery dips, and where the signal goes with the pedal pressed or the engine idling.
 */
import { describe, expect, it } from 'vitest';
import { defaultCircuit, predictReading, sampleReadings, type CircuitSpec, type FaultSpec } from '../../../src/engine/circuit';
import type { MeasurementRequest } from '../../../src/engine/vocabulary';
import { issueCode, MeasurementRequestSchema } from '../../../src/engine/request-schema';
import { requestKey } from '../../../src/engine/diagnosis/request-key';

const backprobe: MeasurementRequest = { quantity: 'dc_volts', at: 'signal', against: 'battery_negative', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', jumpers: [] };
const threeWire = (change: (c: CircuitSpec) => void = () => undefined): CircuitSpec => {
  const c = defaultCircuit('three_wire_5v');
  change(c);
  return c;
};
const battery = (cranking: number) => (c: CircuitSpec) => void (c.battery.volts.cranking = cranking);
const dropOut = (minInputVolts: number) => (c: CircuitSpec) => void (c.module.regulator.minInputVolts = minInputVolts);
const stuckAtRest: FaultSpec = { kind: 'sensor_internal', variant: 'stuck', atRest: true };
const volts = (circuit: CircuitSpec, faults: FaultSpec[], change: Partial<MeasurementRequest>): number => {
  const r = predictReading(circuit, faults, { ...backprobe, ...change });
  if (!r.ok) throw new Error(JSON.stringify(r.findings));
  return r.value;
};

describe('the 5 V reference at the sensor while the engine cranks and after it starts', () => {
  it.each<[string, CircuitSpec, Partial<MeasurementRequest>, number, number]>([
    // Common practice, no source: a sound supply holds about 5 V while cranking and reads 4.8–5.1 V running.
    ['a sound supply holds 5 V while a good battery cranks at 10 V', threeWire(), { engine: 'cranking' }, 4.99, 5.0],
    ['and reads 5 V again once the engine runs', threeWire(), { engine: 'running' }, 4.99, 5.0],
    // Computed: below its 6 V drop-out the output follows the battery less 1 V of headroom, 5.5 − 1 = 4.5 V.
    ['a weak battery falling to 5.5 V while cranking pulls the reference to 4.5 V', threeWire(battery(5.5)), { engine: 'cranking' }, 4.49, 4.5],
    ['and the reference recovers once the engine runs and charges', threeWire(battery(5.5)), { engine: 'running' }, 4.99, 5.0],
    // Computed: a supply needing 11.5 V (6.5 V of headroom) on a battery cranking at 10 V gives 10 − 6.5 = 3.5 V.
    ['a supply that needs 11.5 V falls to 3.5 V while a good battery cranks', threeWire(dropOut(11.5)), { engine: 'cranking' }, 3.49, 3.5],
    ['yet holds 5 V key on, engine stopped, on a 12.4 V battery', threeWire(dropOut(11.5)), {}, 4.99, 5.0],
    ['and after the engine starts (14.2 V charging)', threeWire(dropOut(11.5)), { engine: 'running' }, 4.99, 5.0],
  ])('%s', (_name, circuit, change, lo, hi) => {
    const v = volts(circuit, [], { at: 'reference', ...change });
    expect(v).toBeGreaterThanOrEqual(lo);
    expect(v).toBeLessThanOrEqual(hi);
  });

  it('a weak supply (500 Ω behind it) sags the same whatever the engine does: the load, not the battery, pulls it down', () => {
    const weak: FaultSpec[] = [{ kind: 'module_internal', variant: 'weak_regulator', ohms: 500 }];
    const states = (['off', 'cranking', 'running'] as const).map((engine) => volts(threeWire(), weak, { at: 'reference', engine }));
    // Computed: the 5 kΩ track beside the 250 kΩ bias path through the wiper (about 4.9 kΩ in all) under 500 Ω:
    // 5 × 4.9 / 5.4 ≈ 4.54 V.
    for (const v of states) expect(v).toBeCloseTo(4.54, 2);
    expect(new Set(states.map((v) => v.toFixed(6))).size).toBe(1);
  });
});

describe('the signal with the sensor’s input moved', () => {
  it.each<[string, CircuitSpec, FaultSpec[], Partial<MeasurementRequest>, number, number]>([
    // Computed: the wiper at 0.86 of a 5 kΩ track under 5 V reads 4.30 V (250 kΩ bias adds about 2 mV).
    ['a throttle pressed fully moves the wiper from 0.15 to 0.86 of the reference', threeWire(), [], { sensorInput: 'moved' }, 4.29, 4.31],
    // Computed: 5 × 0.15 = 0.75 V, plus the bias current through the wiper's 688 Ω, (5 − 0.75) × 688 / 250 688 ≈ 12 mV.
    ['a sensor stuck where it rests reads the same at rest', threeWire(), [stuckAtRest], {}, 0.755, 0.77],
    ['and does not follow the throttle pressed fully', threeWire(), [stuckAtRest], { sensorInput: 'moved' }, 0.755, 0.77],
    // Computed: 5 × 0.14 = 0.70 V plus about 12 mV of bias current through the wiper.
    ['a sensor resting high (falling with travel) goes to 0.14 of the reference', threeWire((c) => c.sensor.kind === 'potentiometer' && (c.sensor.position = 0.85)), [], { sensorInput: 'moved' }, 0.705, 0.72],
    // A worn spot is where the wiper rests: at rest the bias pulls the signal up to about 5 V, moved it reads the track.
    ['a wiper lifted where it rests reads the bias at rest', threeWire(), [{ kind: 'sensor_internal', variant: 'worn_spot', value: 1e7 }], {}, 4.0, 5.0],
    ['and the track once the throttle is pressed', threeWire(), [{ kind: 'sensor_internal', variant: 'worn_spot', value: 1e7 }], { sensorInput: 'moved' }, 4.29, 4.31],
    // Computed: 35 kPa on the 20 kPa → 10 %, 105 kPa → 90 % line is 10 % + 15 × 80 % / 85 = 24.1 % of 5 V = 1.206 V.
    ['a manifold pressure sensor with the engine idling reads manifold vacuum', threeWire((c) => (c.sensor = defaultCircuit('three_wire_5v', { sensor: 'pressure' }).sensor)), [], { engine: 'running', sensorInput: 'moved' }, 1.19, 1.22],
  ])('%s', (_name, circuit, faults, change, lo, hi) => {
    const v = volts(circuit, faults, change);
    expect(v).toBeGreaterThanOrEqual(lo);
    expect(v).toBeLessThanOrEqual(hi);
  });

  it('an old request without the field reads the input at rest, as one that says at_rest', () => {
    expect(volts(threeWire(), [], {})).toBe(volts(threeWire(), [], { sensorInput: 'at_rest' }));
  });

  it('draws the moved position in the Monte Carlo too, and a stuck sensor stays put in every sample', () => {
    const run = (faults: FaultSpec[]) => sampleReadings({ circuit: threeWire(), faults, request: { ...backprobe, sensorInput: 'moved' }, samples: 400, seed: 7, spreads: { meterError: false } });
    const moved = run([]);
    const stuck = run([stuckAtRest]);
    if (!moved.ok || !stuck.ok) throw new Error('no samples');
    // Computed: the wiper pressed fully at 0.76–0.96 of the track under 4.9–5.1 V: about 3.7 to 4.9 V.
    expect(moved.percentiles.p1).toBeGreaterThan(3.7);
    expect(moved.percentiles.p99).toBeLessThan(4.9);
    expect(moved.percentiles.p50).toBeCloseTo(4.3, 1);
    expect(stuck.percentiles.p99).toBeLessThan(0.85);
  });

  it.each<[string, CircuitSpec, Partial<MeasurementRequest>, string]>([
    ['a thermistor has no input to move', defaultCircuit('two_wire_thermistor'), { sensorInput: 'moved' }, 'request.input_not_movable'],
    ['a pressure sensor moves only with the engine running', threeWire((c) => (c.sensor = defaultCircuit('three_wire_5v', { sensor: 'pressure' }).sensor)), { sensorInput: 'moved' }, 'request.input_needs_running_engine'],
    ['an input state the vocabulary does not have', threeWire(), { sensorInput: 'half' as MeasurementRequest['sensorInput'] }, 'request.unknown_sensor_input'],
  ])('refuses with a finding on request.sensorInput: %s', (_name, circuit, change, code) => {
    const r = predictReading(circuit, [], { ...backprobe, ...change });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.findings[0]).toMatchObject({ code, path: 'request.sensorInput' });
  });
});

describe('the sensor’s input in the request: schema and key', () => {
  it.each<[string, Record<string, unknown>, string | undefined]>([
    ['an old request without the field is valid', {}, undefined],
    ['the input at rest, said', { sensorInput: 'at_rest' }, undefined],
    ['the throttle pressed fully, key on engine off', { sensorInput: 'moved' }, undefined],
    ['a pressure sensor at idle, engine running', { sensorInput: 'moved', engine: 'running' }, undefined],
    ['an input state the vocabulary does not have', { sensorInput: 'pressed' }, 'invalid_value'],
    // Common practice, no source: a throttle held fully open while cranking cuts fuel on many engines.
    ['the input moved while cranking', { sensorInput: 'moved', engine: 'cranking' }, 'request.input_moved_while_cranking'],
  ])('%s', (_name, change, code) => {
    const parsed = MeasurementRequestSchema.safeParse({ ...backprobe, ...change });
    if (code === undefined) expect(parsed.success, JSON.stringify(parsed.error?.issues)).toBe(true);
    else {
      expect(parsed.success).toBe(false);
      const issue = parsed.error!.issues.find((i) => i.path.join('.') === 'sensorInput');
      expect(issue && issueCode(issue)).toBe(code);
    }
  });

  it('keys an old request and one at rest alike, and one with the input moved apart', () => {
    expect(requestKey({ ...backprobe, sensorInput: 'at_rest' })).toBe(requestKey(backprobe));
    expect(requestKey({ ...backprobe, sensorInput: 'moved' })).not.toBe(requestKey(backprobe));
  });
});
