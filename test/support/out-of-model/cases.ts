/**
 * Out-of-model cases: a second population of circuits, drawn independently of the circuit model the trees'
 * likelihoods were derived from (src/engine/circuit is not used). Each case is a true cause (a tree hypothesis id,
 * or `no_fault_now` for a healthy circuit, or `reference_supply_failed` for a dead or weak module 5 V supply), a
 * concrete circuit with its part values, fault severity and location, and the technician's instruments.
 *
 * Part ranges are common practice, no source, unless marked: supply 4.75–5.10 V, bias 47 kΩ–1 MΩ pull-up or
 * pull-down on a three-wire input (1.5–10 kΩ pull-up on a thermistor input), harness wire with its terminals
 * 0.02–0.4 Ω, sensor anywhere in its travel (thermistor −30…120 °C on a generic Steinhart–Hart curve).
 * Faults cover hard and partial severities (ground resistance 200 Ω–5 kΩ, partial shorts 200 Ω–2 kΩ).
 */
import { hashString, splitmix32, type Random } from './random';
import type { MeasurementRequest } from '../../../src/engine/vocabulary';
import type { CircuitCase, Fault, Sensor, Wire } from './circuits';
import { SHARED_SENSORS, sharedReading, sharedTrueValue, type SharedCase, type SharedSensor } from './shared-reference';
import { instrumentReading, METER, statedError, trueValue, type Instruments } from './instruments';
import { NTC_CURVES } from './ntc';

export type OomTreeId = 'three-wire-5v' | 'two-wire-thermistor' | 'shared-reference';

export interface OomCase {
  tree: OomTreeId;
  /** The true cause, as the trees name their hypotheses. */
  cause: string;
  /** Which form of the cause (e.g. "partial 640 Ω"), for reading failures. */
  variant: string;
  /** A single sensor circuit, or a 5 V reference shared by three sensors. */
  circuit: CircuitCase | SharedCase;
  instruments: Instruments;
  noiseSeed: number;
  /** The module input misreads: its ADC reports this value whatever the circuit does. */
  adcStuck?: number;
}

/** Causes per tree, in report order: every modelled hypothesis (not `unknown`) plus a healthy circuit and a failed supply. */
export const OOM_CAUSES: Record<OomTreeId, readonly string[]> = {
  'three-wire-5v': [
    'no_fault_now',
    'reference_open',
    'reference_short_ground',
    'reference_short_voltage',
    'reference_supply_failed',
    'signal_open',
    'signal_short_ground',
    'signal_short_voltage',
    'signal_short_reference',
    'ground_open',
    'ground_high_resistance',
    'sensor_internal',
    'module_internal',
    'reference_high_resistance',
    'signal_high_resistance',
    'ground_short_voltage',
    'signal_short_sensor_ground',
  ],
  'two-wire-thermistor': [
    'no_fault_now',
    'reference_supply_failed',
    'signal_open',
    'signal_short_ground',
    'signal_short_voltage',
    'ground_open',
    'ground_high_resistance',
    'sensor_internal',
    'sensor_internal_shorted',
    'module_internal',
    'signal_high_resistance',
    'ground_short_voltage',
    'signal_short_sensor_ground',
  ],
  'shared-reference': [
    'no_fault_now',
    'throttle_sensor_loading_reference',
    'manifold_sensor_loading_reference',
    'tank_sensor_loading_reference',
    'reference_short_ground',
    'module_regulator',
  ],
};

const KEY_ON_PLUGGED: MeasurementRequest = { quantity: 'scan_value', at: 'signal', location: 'sensor_connector', connector: 'plugged', key: 'on', engine: 'off', jumpers: [], pid: 'signal_volts' };
const REFERENCE_AT_SENSOR: MeasurementRequest = { quantity: 'dc_volts', at: 'reference', against: 'battery_negative', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', jumpers: [] };

const u = (random: Random, lo: number, hi: number) => lo + (hi - lo) * random();
const logU = (random: Random, lo: number, hi: number) => Math.exp(u(random, Math.log(lo), Math.log(hi)));
const pick = <T>(random: Random, items: readonly T[]): T => items[Math.floor(random() * items.length)]!;

/** The single circuit of a case (throws on a shared-reference case). */
export function singleCircuit(c: OomCase): CircuitCase {
  if (!('kind' in c.circuit)) throw new Error('a shared-reference case has no single circuit');
  return c.circuit;
}

function healthyCircuit(tree: OomTreeId, random: Random): CircuitCase {
  const three = tree === 'three-wire-5v';
  const keyOff = u(random, 12.2, 12.8);
  const wire = () => ({ ohms: u(random, 0.02, 0.4), faultAt: u(random, 0.1, 0.9) });
  const sensor: Sensor = !three
    ? { kind: 'ntc', curve: pick(random, NTC_CURVES), celsius: u(random, -30, 120) }
    : random() < 0.5
      ? { kind: 'potentiometer', ohms: u(random, 2_000, 10_000), position: u(random, 0.08, 0.92), wiperOhms: u(random, 50, 1_000) }
      : { kind: 'active', supplyOhms: u(random, 500, 1_000), ratio: u(random, 0.08, 0.92), outOhms: u(random, 20, 500) };
  return {
    kind: three ? 'three_wire_5v' : 'two_wire_thermistor',
    supply: { volts: u(random, 4.75, 5.1), outOhms: u(random, 0.05, 0.5), limitAmps: u(random, 0.06, 0.2) },
    railLoadOhms: u(random, 50, 500),
    railOffOhms: u(random, 2_000, 50_000),
    bias: three ? { direction: random() < 0.5 ? 'pull_up' : 'pull_down', ohms: logU(random, 47e3, 1e6) } : { direction: 'pull_up', ohms: u(random, 1_500, 10_000) },
    adcInputOhms: u(random, 5e6, 50e6),
    moduleGroundOhms: u(random, 0.005, 0.03),
    moduleAmps: u(random, 0.1, 0.8),
    battery: { keyOff, keyOn: keyOff - u(random, 0.1, 0.4), cranking: u(random, 9.6, 11), running: u(random, 13.6, 14.6), internalOhms: u(random, 0.005, 0.02) },
    strapOhms: u(random, 0.002, 0.02),
    wires: { reference: wire(), signal: wire(), ground: wire() },
    terminalOhms: u(random, 0.002, 0.02),
    feed: { batteryFed: random() < 0.5, feedOhms: u(random, 0.05, 0.5), loadOhms: u(random, 10, 200) },
    sensor,
    jumperOhms: u(random, 0.02, 0.1),
    faults: [],
  };
}

function instruments(random: Random): Instruments {
  return {
    meterInputOhms: (random() < 0.8 ? 10e6 : 11e6) * u(random, 0.99, 1.01),
    voltsGain: u(random, -0.004, 0.004),
    ohmsGain: u(random, -0.009, 0.009),
    leadOhms: u(random, 0.1, 0.3),
    adcBits: 10,
    adcFullScale: 5,
    scanNeedsEngineSpeed: random() < 0.2,
  };
}

const OPEN = (random: Random) => logU(random, 1e9, 1e11);
const HARD = (random: Random) => u(random, 0.05, 5);
const PARTIAL = (random: Random) => u(random, 200, 2_000);

type Draw = { faults: Fault[]; variant: string; supply?: Partial<CircuitCase['supply']>; adcStuck?: number };

/** The fault of a cause at a drawn severity (and, for a failed supply, the supply it leaves). */
function drawFault(cause: string, c: CircuitCase, random: Random): Draw {
  const hardOrPartial = (wire: Wire, to: 'chassis' | Wire): Draw => {
    const hard = random() < 0.6;
    const ohms = hard ? HARD(random) : PARTIAL(random);
    return { faults: [{ kind: 'shunt', wire, to, ohms }], variant: hard ? 'hard short' : `partial ${Math.round(ohms)} Ω` };
  };
  const three = c.kind === 'three_wire_5v';
  switch (cause) {
    case 'no_fault_now':
      return { faults: [], variant: 'healthy' };
    case 'reference_open': {
      if (random() < 0.65) return { faults: [{ kind: 'series', wire: 'reference', ohms: OPEN(random) }], variant: 'open' };
      // From 3 kΩ: below that it is the reference's high-resistance cause, drawn on its own.
      const ohms = logU(random, 3_000, 200_000);
      return { faults: [{ kind: 'series', wire: 'reference', ohms }], variant: `high resistance ${Math.round(ohms)} Ω` };
    }
    case 'reference_short_ground': {
      const hard = random() < 0.7;
      const ohms = hard ? HARD(random) : u(random, 5, 30);
      return { faults: [{ kind: 'shunt', wire: 'reference', to: 'chassis', ohms }], variant: hard ? 'hard short' : `partial ${ohms.toFixed(0)} Ω` };
    }
    case 'reference_short_voltage':
      return { faults: [{ kind: 'shunt', wire: 'reference', to: 'feed', ohms: HARD(random) }], variant: c.feed.batteryFed ? 'battery-fed circuit' : 'ignition-fed circuit' };
    case 'signal_open': {
      if (!three || random() < 0.65) return { faults: [{ kind: 'series', wire: 'signal', ohms: OPEN(random) }], variant: 'open' };
      const ohms = logU(random, 0.5 * c.bias.ohms, 5 * c.bias.ohms);
      return { faults: [{ kind: 'series', wire: 'signal', ohms }], variant: `high resistance ${Math.round(ohms / 1000)} kΩ` };
    }
    case 'signal_short_ground':
      return hardOrPartial('signal', 'chassis');
    case 'signal_short_voltage':
      return { faults: [{ kind: 'shunt', wire: 'signal', to: 'feed', ohms: HARD(random) }], variant: c.feed.batteryFed ? 'battery-fed circuit' : 'ignition-fed circuit' };
    case 'signal_short_reference':
      return hardOrPartial('signal', 'reference');
    case 'ground_open':
      return { faults: [{ kind: 'series', wire: 'ground', ohms: OPEN(random) }], variant: 'open' };
    case 'ground_high_resistance': {
      const ohms = logU(random, 200, 5_000);
      return { faults: [{ kind: 'series', wire: 'ground', ohms }], variant: `${Math.round(ohms)} Ω` };
    }
    case 'sensor_internal': {
      if (!three && random() < 0.5) return { faults: [{ kind: 'sensor', variant: 'ntc_open', ohms: OPEN(random) }], variant: 'thermistor open' };
      if (!three) {
        // Reads in range but wrong, warm by 12–30 °C (common practice, no source): only the cold-soak comparison shows it.
        const celsius = u(random, 12, 30);
        return { faults: [{ kind: 'sensor', variant: 'ntc_skewed', celsius }], variant: `thermistor skewed +${Math.round(celsius)} °C` };
      }
      const variants = c.sensor.kind === 'potentiometer'
        ? (['element_open', 'wiper_open', 'output_to_reference', 'output_to_ground', 'output_stuck'] as const)
        : (['output_dead', 'output_high', 'wiper_open', 'output_to_ground', 'output_stuck'] as const);
      const variant = pick(random, variants);
      const ohms = variant === 'wiper_open' || variant === 'element_open' ? OPEN(random) : u(random, 1, 50);
      return { faults: [{ kind: 'sensor', variant, ohms }], variant: `${c.sensor.kind} ${variant.replaceAll('_', ' ')}` };
    }
    case 'sensor_internal_shorted':
      return { faults: [{ kind: 'sensor', variant: 'ntc_shorted', ohms: u(random, 0.5, 20) }], variant: 'thermistor shorted' };
    case 'module_internal': {
      const form = pick(random, ['reads 0', 'reads full scale', 'reads a fixed value'] as const);
      const adcStuck = form === 'reads 0' ? 0 : form === 'reads full scale' ? 5 : u(random, 0.3, 4.7);
      return { faults: [], variant: `input ${form}`, adcStuck };
    }
    // Resistance a wire picks up short of an open (strands broken, a corroded splice): enough to matter, not a break.
    case 'reference_high_resistance': {
      const ohms = logU(random, 100, 3_000);
      return { faults: [{ kind: 'series', wire: 'reference', ohms }], variant: `${Math.round(ohms)} Ω` };
    }
    case 'signal_high_resistance': {
      const ohms = three ? logU(random, 3_000, Math.max(6_000, 0.2 * c.bias.ohms)) : logU(random, 1_000, 20_000);
      return { faults: [{ kind: 'series', wire: 'signal', ohms }], variant: `${(ohms / 1000).toFixed(1)} kΩ` };
    }
    case 'ground_short_voltage':
      return { faults: [{ kind: 'shunt', wire: 'ground', to: 'feed', ohms: HARD(random) }], variant: c.feed.batteryFed ? 'battery-fed circuit' : 'ignition-fed circuit' };
    case 'signal_short_sensor_ground':
      return hardOrPartial('signal', 'ground');
    case 'reference_supply_failed': {
      const form = pick(random, ['dead', 'low set point', 'sags under load'] as const);
      if (form === 'dead') return { faults: [], variant: 'dead', supply: { volts: u(random, 0, 0.3) } };
      if (form === 'low set point') return { faults: [], variant: 'low set point', supply: { volts: u(random, 3.5, 4.5) } };
      return { faults: [], variant: 'sags under load', supply: { outOhms: u(random, 15, 60) } };
    }
    default:
      throw new Error(`no out-of-model fault for cause "${cause}"`);
  }
}

/** One case of a cause; `index` and `seed` fix it completely. */
export function drawOomCase(tree: OomTreeId, cause: string, index: number, seed: number): OomCase {
  const random = splitmix32(seed ^ hashString(`${tree}/${cause}/${index}`));
  if (tree === 'shared-reference') return drawSharedCase(cause, random);
  for (let attempt = 0; ; attempt++) {
    const circuit = healthyCircuit(tree, random);
    const inst = instruments(random);
    const drawn = drawFault(cause, circuit, random);
    circuit.faults = drawn.faults;
    circuit.supply = { ...circuit.supply, ...drawn.supply };
    const c: OomCase = { tree, cause, variant: drawn.variant, circuit, instruments: inst, noiseSeed: Math.floor(random() * 2 ** 31), adcStuck: drawn.adcStuck };
    if (attempt < 20 && !showsItself(c)) continue;
    return c;
  }
}

/**
 * Redraws faults that leave no trace a tree test could see: a "weak" supply must sag below 4.6 V where the
 * sensor takes its supply, a module input that misreads must misread by more than 0.5 V, a three-wire sensor
 * faulty inside must put its signal outside its working range (a wrong value inside the range looks like another
 * position), and one stuck where it rests must read at least 0.5 V away from a sound sensor with the throttle
 * pressed fully, key on engine off (the one tree test that moves the input).
 */
function showsItself(c: OomCase): boolean {
  if (!('kind' in c.circuit)) return sharedTrueValue(c.circuit, c.instruments, { ...REFERENCE_AT_SENSOR, sensor: 'throttle' }) < 4.5;
  if (c.cause === 'reference_supply_failed' && c.circuit.supply.volts > 1) {
    const probe = c.circuit.kind === 'three_wire_5v' ? REFERENCE_AT_SENSOR : { ...REFERENCE_AT_SENSOR, at: 'signal' as const, connector: 'unplugged' as const };
    return trueValue(c.circuit, c.instruments, probe) < 4.6;
  }
  if (c.cause === 'sensor_internal' && c.circuit.kind === 'three_wire_5v' && c.variant.endsWith('output stuck')) {
    const pressed = { ...REFERENCE_AT_SENSOR, at: 'signal' as const, sensorInput: 'moved' as const };
    return Math.abs(trueValue(c.circuit, c.instruments, pressed) - trueValue({ ...c.circuit, faults: [] }, c.instruments, pressed)) > 0.5;
  }
  if (c.cause === 'sensor_internal' && c.circuit.kind === 'three_wire_5v') {
    const signal = trueValue(c.circuit, c.instruments, { ...REFERENCE_AT_SENSOR, at: 'signal' });
    return signal < 0.3 || signal > 4.7;
  }
  if (c.adcStuck !== undefined) return Math.abs(Math.min(5, trueValue(c.circuit, c.instruments, KEY_ON_PLUGGED)) - c.adcStuck) > 0.5;
  return true;
}

/**
 * Whether a case's wiring fault shows on any of `requests` at all: some reading's true value differs from the same
 * circuit's without the fault by more than the instrument's stated accuracy on both (a scan value: two converter
 * steps). A fault that shows on none (a resistance too small for the current through it) cannot be told from a
 * healthy circuit by these tests. Cases whose fault is not in the wiring (a failed supply, a misreading module
 * input) were drawn to show themselves and count as showing.
 */
export function faultShows(c: OomCase, requests: readonly MeasurementRequest[]): boolean {
  if (!('kind' in c.circuit) || c.circuit.faults.length === 0 || c.adcStuck !== undefined) return true;
  const faulted = c.circuit;
  const healthy: CircuitCase = { ...faulted, faults: [] };
  return requests.some((request) => {
    const { sensor: _sensor, ...r } = request;
    const a = trueValue(faulted, c.instruments, r as MeasurementRequest);
    const b = trueValue(healthy, c.instruments, r as MeasurementRequest);
    if (request.quantity === 'scan_value') return Math.abs(clampScan(a, c.instruments) - clampScan(b, c.instruments)) > (2 * c.instruments.adcFullScale) / (2 ** c.instruments.adcBits - 1);
    const over = (v: number) => !Number.isFinite(v) || (request.quantity === 'ohms' && v >= METER.maxOhms);
    if (over(a) || over(b)) return over(a) !== over(b);
    const spec = request.quantity === 'ohms' ? METER.ohms : METER.volts;
    return Math.abs(a - b) > statedError(a, spec) + statedError(b, spec);
  });
}

const clampScan = (v: number, inst: Instruments) => Math.min(inst.adcFullScale, Math.max(0, v));

/** A stratified set: `perCause` cases of every cause of the tree. */
export function oomCases(tree: OomTreeId, perCause: number, seed: number): OomCase[] {
  return OOM_CAUSES[tree].flatMap((cause) => Array.from({ length: perCause }, (_, i) => drawOomCase(tree, cause, i, seed)));
}

/** What the technician reads for a request. */
export function answerOomRequest(c: OomCase, request: MeasurementRequest, attempt: number): number | 'overload' {
  const { sensor: _sensor, ...plain } = request;
  if (!('kind' in c.circuit)) return sharedReading(c.circuit, c.instruments, request, c.noiseSeed, attempt);
  return instrumentReading(c.circuit, c.instruments, plain as MeasurementRequest, c.noiseSeed, attempt, c.adcStuck);
}

/**
 * A shared-reference case. Sensors draw 5–10 mA (500–1000 Ω) or are potentiometers of 2–10 kΩ; a sensor shorted
 * inside, or the harness shorted to ground, at 0.05–40 Ω; the supply failed as in the single circuits. Faults that
 * would leave the reference above 4.5 V with everything plugged are drawn again (nothing would show them).
 */
function drawSharedCase(cause: string, random: Random): OomCase {
  for (let attempt = 0; ; attempt++) {
    const single = healthyCircuit('three-wire-5v', random);
    const branch = () => ({ ohms: u(random, 0.05, 0.5), faultAt: u(random, 0.1, 0.9), groundOhms: u(random, 0.02, 0.4), sensorOhms: random() < 0.5 ? u(random, 500, 1_000) : u(random, 2_000, 10_000) });
    const circuit: SharedCase = {
      supply: single.supply,
      railLoadOhms: single.railLoadOhms,
      railOffOhms: single.railOffOhms,
      moduleGroundOhms: single.moduleGroundOhms,
      moduleAmps: single.moduleAmps,
      battery: single.battery,
      strapOhms: single.strapOhms,
      terminalOhms: single.terminalOhms,
      trunk: { ohms: u(random, 0.02, 0.3), faultAt: u(random, 0.1, 0.9) },
      branches: { throttle: branch(), manifold: branch(), tank: branch() },
      faults: [],
    };
    let variant = 'healthy';
    const sensor = SHARED_SENSORS.find((s) => cause === `${s}_sensor_loading_reference`);
    if (sensor) {
      const ohms = logU(random, 0.5, 40);
      circuit.faults = [{ kind: 'sensor_short', sensor, ohms }];
      variant = `shorted inside, ${ohms.toFixed(1)} Ω`;
    } else if (cause === 'reference_short_ground') {
      const where = pick(random, ['trunk', ...SHARED_SENSORS] as const) as 'trunk' | SharedSensor;
      const ohms = logU(random, 0.05, 40);
      circuit.faults = [{ kind: 'harness_short', where, ohms }];
      variant = `${where === 'trunk' ? 'trunk' : `${where} branch`}, ${ohms.toFixed(1)} Ω`;
    } else if (cause === 'module_regulator') {
      const form = pick(random, ['dead', 'low set point', 'sags under load'] as const);
      circuit.supply = form === 'dead' ? { ...circuit.supply, volts: u(random, 0, 0.3) } : form === 'low set point' ? { ...circuit.supply, volts: u(random, 3.5, 4.4) } : { ...circuit.supply, outOhms: u(random, 15, 60) };
      variant = form;
    } else if (cause !== 'no_fault_now') throw new Error(`no out-of-model fault for cause "${cause}"`);
    const c: OomCase = { tree: 'shared-reference', cause, variant, circuit, instruments: instruments(random), noiseSeed: Math.floor(random() * 2 ** 31) };
    if (cause === 'no_fault_now' || attempt >= 20 || showsItself(c)) return c;
  }
}
