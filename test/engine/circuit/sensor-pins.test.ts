/**
 * Leads on the sensor's own pins, sensor unplugged (`location: sensor_pins`): the circuit model reads the sensor
 * alone, whatever the harness and the module do, and the request rules refuse what means nothing there.
 */
import { describe, expect, it } from 'vitest';
import { defaultCircuit, faultsFor, predictReading, validateRequest, type FaultSpec } from '../../../src/engine/circuit';
import { MeasurementRequestSchema, issueCode } from '../../../src/engine/request-schema';
import type { MeasurementRequest } from '../../../src/engine/vocabulary';

const pins: MeasurementRequest = { quantity: 'ohms', at: 'signal', against: 'ground', location: 'sensor_pins', connector: 'unplugged', key: 'off', engine: 'off', jumpers: [] };
const thermistorAt = (temperatureC: number) => defaultCircuit('two_wire_thermistor', { temperatureC });

function ohms(request: MeasurementRequest, faults: FaultSpec[] = [], circuit = thermistorAt(25)): number {
  const r = predictReading(circuit, faults, request);
  if (!r.ok) throw new Error(JSON.stringify(r.findings));
  return r.value;
}

describe("an ohmmeter on the sensor's own pins reads the sensor alone", () => {
  it.each([
    // Steinhart–Hart (Steinhart & Hart, Deep-Sea Research 15, 1968) with the widely published 10 kΩ set
    // A = 1.12924e-3, B = 2.34108e-4, C = 8.7755e-8 (from memory): computed values, within 0.1 % of 10 kΩ tables.
    [25, 10_000],
    [0, 32_650],
    [50, 3_601],
    [100, 678],
  ])('reads the thermistor at %i °C as %i Ω, no wire or terminal in series (computed)', (celsius, expected) => {
    expect(Math.abs(ohms(pins, [], thermistorAt(celsius)) - expected) / expected).toBeLessThan(2e-3);
  });

  it.each<[string, FaultSpec[]]>([
    ['a broken signal wire', faultsFor('signal_open')!],
    ['a broken sensor ground wire', faultsFor('ground_open')!],
    ['a signal wire shorted to ground', faultsFor('signal_short_ground')!],
    ['a module that has lost its 5 V supply', faultsFor('reference_supply_failed')!],
  ])('reads the same with %s behind it, the module connector plugged or not', (_name, faults) => {
    const healthy = ohms(pins);
    expect(ohms(pins, faults)).toBeCloseTo(healthy, 6);
    expect(ohms({ ...pins, otherConnector: 'unplugged' }, faults)).toBeCloseTo(healthy, 6);
  });

  it('reads an open thermistor as overload and a shorted one as its short, where the harness side reads open', () => {
    expect(ohms(pins, faultsFor('sensor_internal')!)).toBe(Number.POSITIVE_INFINITY);
    expect(ohms(pins, [{ kind: 'sensor_internal', variant: 'shorted', value: 1.5 }])).toBeCloseTo(1.5, 6);
    // The same leads on the harness side of the unplugged sensor connector see no sensor: open.
    expect(ohms({ ...pins, location: 'sensor_connector', otherConnector: 'unplugged' })).toBe(Number.POSITIVE_INFINITY);
  });

  it('reads a potentiometer end to end as its whole track (the two track segments in series, computed)', () => {
    const pot = defaultCircuit('three_wire_5v');
    if (pot.sensor.kind !== 'potentiometer') throw new Error('expected a potentiometer');
    expect(ohms({ ...pins, at: 'reference' }, [], pot)).toBeCloseTo(pot.sensor.trackOhms, 3);
  });
});

describe("the rules for leads on the sensor's own pins", () => {
  it('accepts ohms key off between two pins with the sensor unplugged, in the schema and in the circuit model', () => {
    expect(MeasurementRequestSchema.safeParse(pins).success).toBe(true);
    expect(validateRequest(pins, thermistorAt(25))).toEqual([]);
  });

  it.each<[string, Partial<MeasurementRequest>, string, string]>([
    ['volts on an unpowered sensor', { quantity: 'dc_volts', key: 'on' }, 'request.sensor_pins_not_ohms', 'quantity'],
    ['the sensor left plugged in', { connector: 'plugged' }, 'request.sensor_pins_plugged', 'connector'],
    ['the sensor back-probed', { connector: 'backprobed' }, 'request.sensor_pins_plugged', 'connector'],
    ['the second lead on a battery post', { against: 'battery_negative' }, 'request.sensor_pins_point', 'against'],
    ['the first lead on chassis ground', { at: 'chassis_ground' }, 'request.sensor_pins_point', 'at'],
    ['the second lead at the module connector', { againstLocation: 'module_connector' }, 'request.sensor_pins_far_lead', 'againstLocation'],
    ['a jumper on the pins', { jumpers: [{ from: 'signal', to: 'ground', via: { kind: 'fused_jumper' } }] }, 'request.sensor_pins_jumper', 'jumpers'],
    ['a harness lead paired with a lead on the pins', { location: 'sensor_connector', againstLocation: 'sensor_pins' }, 'request.sensor_pins_far_lead', 'againstLocation'],
  ])('refuses %s with a coded error naming the field', (_name, change, code, field) => {
    const request = { ...pins, ...change } as MeasurementRequest;
    const parsed = MeasurementRequestSchema.safeParse(request);
    expect(parsed.success).toBe(false);
    const issue = parsed.error!.issues.find((i) => issueCode(i) === code);
    expect(issue?.path).toEqual([field]);
    expect(validateRequest(request, thermistorAt(25)).find((f) => f.code === code)?.path).toBe(`request.${field}`);
  });
});
