/**
 * What a scan tool shows for a parameter of the circuit's module, for comparisons of two readings:
 * - the sensor under test's own PID: the converter's volts turned into the PID's unit the way the module does it,
 *   then encoded and decoded through the PID's SAE J1979 scaling (src/engine/scan); `signal_volts` is the
 *   converter's volts as they are;
 * - another sensor's PID (intake air on a coolant circuit), which the single-circuit model does not draw: the true
 *   measurand of this circuit's sensor (a cold-soaked engine sits at ambient) plus that sensor's own tolerance
 *   (common practice, no source: an intake-air thermistor within ±2 °C of the air around it).
 */
import { PID_DEFINITIONS, type PidDefinition } from '../scan';
import { steinhartHartTemperature, betaTemperature } from '../calc/thermistor';
import type { CircuitSpec, ThermistorModel } from './types';

export const OTHER_SENSOR_TOLERANCE = { intakeAirC: 2 } as const;

/** Draws a sample needs besides the converter's volts: `draws` from the Monte Carlo, `u()` uniform on [−1, 1]. */
export interface ReadoutContext {
  circuit: CircuitSpec;
  draws: ReadonlyMap<string, number>;
  u: () => number;
  /** The module's 5 V at its pull-up, against module ground, where the solve gives it. */
  railVolts?: number;
}

export interface ScanReadout {
  /** True when the value comes from this circuit's converter; false for another sensor's parameter. */
  own: boolean;
  value(volts: number, ctx: ReadoutContext): number;
}

const pidDef = (pid: string) => PID_DEFINITIONS.find((p) => p.pid === pid)!;

/** Through the PID's one-byte scaling and back, as a scan tool would show it (clamped to the byte's range). */
function throughPid(def: PidDefinition, value: number): number {
  const range = def.range!;
  const clamped = Math.min(range.max, Math.max(range.min, value));
  // Temperature PIDs encode A = T + 40; pressure PIDs A = kPa (SAE J1979 scalings).
  const byte = Math.round(def.unit === '°C' ? clamped + 40 : clamped);
  const decoded = def.decode([Math.min(255, Math.max(0, byte))]);
  return decoded.kind === 'measurement' ? decoded.value : Number.NaN;
}

function curveTemperature(model: ThermistorModel, ohms: number): number {
  const r = model.kind === 'beta' ? betaTemperature(ohms, model) : steinhartHartTemperature(ohms, model);
  // Below the curve's reach (a resistance near zero) the coefficients give no temperature: the hottest there is.
  return r.ok ? r.value : Infinity;
}

/**
 * The module's temperature from its converter: the thermistor's resistance from the divider with its own pull-up and
 * its own 5 V as it stands at the pull-up (a ratiometric converter: a sagging supply cancels), then the curve (Steinhart & Hart, Deep-Sea Research 15, 1968). An input at or above the
 * supply is an open sensor (the scale's bottom); at or below 0 V a shorted one (its top).
 */
function moduleTemperature(volts: number, ctx: ReadoutContext): number {
  const sensor = ctx.circuit.sensor;
  if (sensor.kind !== 'thermistor') return Number.NaN;
  const bias = ctx.circuit.module.bias;
  const pullUp = ctx.draws.get('bias.ohms') ?? (bias.kind === 'none' ? Number.NaN : bias.ohms);
  const supply = ctx.railVolts ?? ctx.draws.get('regulator.volts') ?? ctx.circuit.module.regulator.volts;
  if (volts >= supply) return -Infinity;
  if (volts <= 0) return Infinity;
  return curveTemperature(sensor.model, (pullUp * volts) / (supply - volts));
}

const READOUTS: Record<string, (kind: CircuitSpec['kind']) => ScanReadout | undefined> = {
  signal_volts: () => ({ own: true, value: (volts) => volts }),
  // Engine coolant temperature on a thermistor circuit: the circuit's own sensor.
  '05': (kind) => (kind === 'two_wire_thermistor' ? { own: true, value: (v, ctx) => throughPid(pidDef('05'), moduleTemperature(v, ctx)) } : undefined),
  // Intake air temperature beside a coolant circuit after a cold soak: ambient, the engine's own temperature.
  '0F': (kind) =>
    kind === 'two_wire_thermistor'
      ? { own: false, value: (_v, ctx) => throughPid(pidDef('0F'), (ctx.circuit.sensor as { temperatureC: number }).temperatureC + OTHER_SENSOR_TOLERANCE.intakeAirC * ctx.u()) }
      : undefined,
};

/** How the module reports `pid` on a circuit of this kind, or undefined when the model cannot answer it. */
export function scanReadout(pid: string | undefined, kind: CircuitSpec['kind']): ScanReadout | undefined {
  return Object.hasOwn(READOUTS, pid ?? 'signal_volts') ? READOUTS[pid ?? 'signal_volts']!(kind) : undefined;
}

