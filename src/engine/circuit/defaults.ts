/**
 * Typical sensor circuits and meter. The values are representative of the trade (common practice, no source);
 * callers override any part through `options`.
 */
import { DEFAULT_METER_OHMS, type CircuitKind } from '../vocabulary';
import type { BiasSpec, CircuitSpec, MeterSpec, SensorSpec, WireSpec } from './types';

export interface DefaultCircuitOptions {
  /** Three-wire circuits: `potentiometer` (default) or `pressure`. Two-wire circuits always get a thermistor. */
  sensor?: 'potentiometer' | 'pressure';
  bias?: BiasSpec;
  /** Potentiometer wiper position (0…1 from the ground end). */
  position?: number;
  pressureKpa?: number;
  temperatureC?: number;
  /** Resistance of each wire, Ω. */
  wireOhms?: number;
  regulatorVolts?: number;
}

/** A wide-open throttle sits near 0.85; closed near 0.15. */
const DEFAULT_POSITION = 0.15;

/** The widely published 10 kΩ Steinhart–Hart set (from memory, generic). */
export const GENERIC_10K_STEINHART_HART = { kind: 'steinhart_hart', a: 1.12924e-3, b: 2.34108e-4, c: 8.7755e-8 } as const;

function sensorFor(kind: CircuitKind, options: DefaultCircuitOptions): SensorSpec {
  if (kind === 'two_wire_thermistor') {
    return { kind: 'thermistor', model: { ...GENERIC_10K_STEINHART_HART }, temperatureC: options.temperatureC ?? 20 };
  }
  if (options.sensor === 'pressure') {
    return {
      kind: 'pressure',
      pressureKpa: options.pressureKpa ?? 101.325,
      calibration: { lowKpa: 20, lowFraction: 0.1, highKpa: 105, highFraction: 0.9 },
      supplyOhms: 625,
      outputOhms: 100,
    };
  }
  return { kind: 'potentiometer', trackOhms: 5000, position: options.position ?? DEFAULT_POSITION, wiperOhms: 50 };
}

/**
 * A healthy circuit of the given kind. Three-wire 5 V: module 5 V regulator (1 Ω output; no current limit unless
 * `currentLimitAmps` is given, since limits differ widely between modules and the built-in trees are derived without
 * one; the module's own draw through its ground is left out unless `module.supplyAmps` is set), signal biased up to the
 * rail through 250 kΩ, 0.1 Ω wires, potentiometer (or pressure sensor). Two-wire thermistor: 10 kΩ module pull-up
 * as the bias, signal and ground wires only, 10 kΩ NTC at 20 °C.
 */
export function defaultCircuit(kind: CircuitKind, options: DefaultCircuitOptions = {}): CircuitSpec {
  const wireOhms = options.wireOhms ?? 0.1;
  const roles = kind === 'two_wire_thermistor' ? (['signal', 'ground'] as const) : (['reference', 'signal', 'ground'] as const);
  const wires: WireSpec[] = roles.map((role) => ({ role, ohms: wireOhms }));
  const bias: BiasSpec =
    options.bias ?? (kind === 'two_wire_thermistor' ? { kind: 'pull_up', ohms: 10_000 } : { kind: 'pull_up', ohms: 250_000 });
  return {
    kind,
    battery: { keyOffVolts: 12.6, volts: { off: 12.4, cranking: 10.0, running: 14.2 }, internalOhms: 0.01 },
    module: {
      regulator: { volts: options.regulatorVolts ?? 5.0, outputOhms: 1, offOhms: 1000, minInputVolts: 6 },
      bias,
      inputFilterOhms: 10_000,
      groundOhms: 0.01,
      sensorGroundOhms: 0.05,
    },
    wires,
    contactOhms: 0.005,
    chassisGroundOhms: 0.005,
    sensor: sensorFor(kind, options),
  };
}

/** A general-purpose digital meter: 10 MΩ on DC volts, 6000 counts, ±(0.5 % + 2 digits) on volts. */
export const DEFAULT_METER: MeterSpec = {
  inputOhms: DEFAULT_METER_OHMS,
  shuntOhms: 0.1,
  ohmsTestAmps: 1e-4,
  maxOhms: 60e6,
  counts: 6000,
  accuracy: {
    dc_volts: { percent: 0.5, digits: 2 },
    ohms: { percent: 0.8, digits: 3 },
    amps: { percent: 1.0, digits: 3 },
  },
};

/** Fills the missing fields of a partial meter from DEFAULT_METER. */
export function meterWith(overrides: Partial<MeterSpec> = {}): MeterSpec {
  return { ...DEFAULT_METER, ...overrides, accuracy: { ...DEFAULT_METER.accuracy, ...overrides.accuracy } };
}
