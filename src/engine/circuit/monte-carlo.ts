/**
 * Tolerance bands by Monte Carlo: draw the part spreads, solve the reading, add the meter's error, and summarise the
 * distribution as percentiles and band probabilities. The netlist is built and compiled once per (circuit, faults,
 * request); each sample only restamps the parameter-bound element values and refactors a ~25×25 system.
 */
import type { CircuitKind, MeasurementRequest } from '../vocabulary';
import { checkFinite, checkResistance, finding, joinPath, type Finding } from '../calc/findings';
import { DEFAULT_METER } from './defaults';
import { QUANTITY_BEHAVIOURS, resolutionFor } from './measure';
import { evaluatorFor, prepareReading } from './predict';
import { mulberry32, uniform, type Random } from './prng';
import { sensorBehaviour } from './sensors';
import { scanReadout } from './scan-readout';
import { MODULE_GROUND_NODE, MODULE_PIN } from './build';
import type { CircuitSpec, FaultSpec, MeterSpec, ReadingUnit } from './types';

/** Part spreads, each drawn uniformly within its range. */
export interface Spreads {
  /** Each wire's end-to-end resistance, Ω. */
  wireOhms: [number, number];
  /** Module bias (or thermistor pull-up) resistance, Ω. */
  biasOhms: [number, number];
  regulatorVolts: [number, number];
  /** Battery voltage deviation from nominal, ± V. */
  batteryVolts: number;
  /** Sensor output tolerance: ± fraction of span (position, output fraction, thermistor resistance). */
  sensorTolerance: number;
  /** Add the meter's stated error ±(percent + digits), drawn uniformly. */
  meterError: boolean;
  /** The module's own draw key on, A (only where the circuit gives `module.supplyAmps`); unset = nominal. */
  moduleAmps?: [number, number];
  /** The module's ground strap and the chassis-to-battery strap, Ω; unset = nominal. */
  moduleGroundOhms?: [number, number];
  chassisGroundOhms?: [number, number];
  /** The 5 V output's resistance to module ground with the key off, Ω, drawn log-uniformly; unset = nominal. */
  regulatorOffOhms?: [number, number];
  /** What a dead 5 V output still shows, V (only with a `dead_regulator` fault; unset = 0 V). */
  deadRegulatorVolts?: [number, number];
  /** A short's resistance, Ω, drawn log-uniformly (every short of the sample; unset = the fault's own). */
  shortOhms?: [number, number];
  /** A high resistance's value in its wire, Ω, drawn log-uniformly (every one of the sample; unset = the fault's own). */
  seriesOhms?: [number, number];
  /** The value a converter that reads a fixed value holds, V (only with a `fixed_input` module fault). */
  moduleInputVolts?: [number, number];
}

/**
 * Spreads for a circuit (common practice, no source): wires 0.05–0.3 Ω, bias ±20 % of nominal (250 kΩ → 200–300 kΩ;
 * a thermistor pull-up, which differs between modules from about 2 kΩ to 18 kΩ, ±80 % of 10 kΩ), regulator
 * 4.9–5.1 V, battery ±0.2 V, sensor ±2 %, meter error on.
 */
const BIAS_SPREAD: Record<CircuitKind, number> = { three_wire_5v: 0.2, two_wire_thermistor: 0.8 };

export function defaultSpreads(circuit: CircuitSpec): Spreads {
  const bias = circuit.module.bias;
  const nominal = bias.kind === 'none' ? 0 : bias.ohms;
  const spread = BIAS_SPREAD[circuit.kind];
  const reg = circuit.module.regulator.volts;
  return {
    wireOhms: [0.05, 0.3],
    biasOhms: [nominal * (1 - spread), nominal * (1 + spread)],
    regulatorVolts: [reg - 0.1, reg + 0.1],
    batteryVolts: 0.2,
    sensorTolerance: 0.02,
    meterError: true,
  };
}

export interface Percentiles {
  p1: number;
  p5: number;
  p25: number;
  p50: number;
  p75: number;
  p95: number;
  p99: number;
}

export interface SampleInput {
  circuit: CircuitSpec;
  faults: FaultSpec[];
  request: MeasurementRequest;
  /** Number of samples (1…1 000 000). */
  samples: number;
  /** 32-bit integer seed: the same seed gives the same values. */
  seed: number;
  /** Overrides of the default spreads. */
  spreads?: Partial<Spreads>;
  meter?: MeterSpec;
}

export type SampleResult =
  | { ok: true; unit: ReadingUnit; values: Float64Array; percentiles: Percentiles }
  | { ok: false; findings: Finding[] };

function checkRangePair(pair: unknown, path: string, what: string, resistance: boolean): Finding[] {
  if (!Array.isArray(pair) || pair.length !== 2) return [finding('spreads.not_a_range', path, `${what} must be [min, max].`)];
  const check = resistance ? (x: unknown, p: string) => checkResistance(x, p, what) : (x: unknown, p: string) => checkFinite(x, p, what);
  const found = [...check(pair[0], joinPath(path, 0)), ...check(pair[1], joinPath(path, 1))];
  if (!found.length && pair[0] > pair[1]) found.push(finding('spreads.range_reversed', path, `${what}: min must not exceed max.`));
  return found;
}

function validateSampling(input: SampleInput, spreads: Spreads): Finding[] {
  const found: Finding[] = [];
  if (!Number.isInteger(input.samples) || input.samples < 1 || input.samples > 1_000_000) {
    found.push(finding('sampling.bad_sample_count', 'samples', 'Samples must be an integer from 1 to 1 000 000.'));
  }
  if (!Number.isInteger(input.seed)) found.push(finding('sampling.bad_seed', 'seed', 'The seed must be an integer.'));
  found.push(
    ...checkRangePair(spreads.wireOhms, 'spreads.wireOhms', 'Wire resistance spread', true),
    ...checkRangePair(spreads.biasOhms, 'spreads.biasOhms', 'Bias resistance spread', true),
    ...checkRangePair(spreads.regulatorVolts, 'spreads.regulatorVolts', 'Regulator voltage spread', false),
    ...checkFinite(spreads.batteryVolts, 'spreads.batteryVolts', 'Battery voltage spread'),
    ...checkFinite(spreads.sensorTolerance, 'spreads.sensorTolerance', 'Sensor tolerance'),
    ...(spreads.moduleAmps ? checkRangePair(spreads.moduleAmps, 'spreads.moduleAmps', 'Module supply current spread', true) : []),
    ...(spreads.moduleGroundOhms ? checkRangePair(spreads.moduleGroundOhms, 'spreads.moduleGroundOhms', 'Module ground resistance spread', true) : []),
    ...(spreads.chassisGroundOhms ? checkRangePair(spreads.chassisGroundOhms, 'spreads.chassisGroundOhms', 'Chassis ground resistance spread', true) : []),
    ...(spreads.regulatorOffOhms ? checkRangePair(spreads.regulatorOffOhms, 'spreads.regulatorOffOhms', 'Regulator off resistance spread', true) : []),
    ...(spreads.deadRegulatorVolts ? checkRangePair(spreads.deadRegulatorVolts, 'spreads.deadRegulatorVolts', 'Dead regulator volts spread', false) : []),
    ...(spreads.shortOhms ? checkRangePair(spreads.shortOhms, 'spreads.shortOhms', 'Short resistance spread', true) : []),
    ...(spreads.seriesOhms ? checkRangePair(spreads.seriesOhms, 'spreads.seriesOhms', 'High resistance spread', true) : []),
    ...(spreads.moduleInputVolts ? checkRangePair(spreads.moduleInputVolts, 'spreads.moduleInputVolts', 'Fixed input volts spread', false) : []),
  );
  if (!found.length && spreads.biasOhms[0] === 0 && input.circuit.module.bias.kind !== 'none') {
    found.push(finding('spreads.bias_zero', 'spreads.biasOhms.0', 'A bias resistance of 0 Ω would short the input.'));
  }
  return found;
}

/**
 * Draws the parameters of one sample into `out` (aligned with `keys`; NaN = keep nominal) and returns every draw by
 * name. `more` lists parameters of another netlist of the same circuit sampled alike (a comparison's second reading).
 */
function paramSampler(input: SampleInput, spreads: Spreads, keys: string[], nominal: Record<string, number>, random: Random, more: readonly string[] = []) {
  const u = () => 2 * random() - 1;
  const draws = new Map<string, number>();
  const sensor = sensorBehaviour(input.circuit.sensor)!;
  const shorts = [...new Set([...keys, ...more])].filter((key) => key.startsWith('fault.short_'));
  return (out: Float64Array): ReadonlyMap<string, number> => {
    draws.clear();
    for (const wire of input.circuit.wires) draws.set(`wire.${wire.role}.ohms`, uniform(random, ...spreads.wireOhms));
    draws.set('bias.ohms', uniform(random, ...spreads.biasOhms));
    draws.set('regulator.volts', uniform(random, ...spreads.regulatorVolts));
    draws.set('battery.volts', (nominal['battery.volts'] ?? 0) + spreads.batteryVolts * u());
    if (spreads.moduleAmps) draws.set('module.supply.ohms', draws.get('battery.volts')! / uniform(random, ...spreads.moduleAmps));
    if (spreads.moduleGroundOhms) draws.set('module.ground.ohms', uniform(random, ...spreads.moduleGroundOhms));
    if (spreads.chassisGroundOhms) draws.set('chassis.ohms', uniform(random, ...spreads.chassisGroundOhms));
    if (spreads.regulatorOffOhms) draws.set('regulator.off.ohms', Math.exp(uniform(random, Math.log(spreads.regulatorOffOhms[0]), Math.log(spreads.regulatorOffOhms[1]))));
    if (spreads.deadRegulatorVolts) draws.set('regulator.dead.volts', uniform(random, ...spreads.deadRegulatorVolts));
    if (spreads.moduleInputVolts) draws.set('module.input.volts', uniform(random, ...spreads.moduleInputVolts));
    if (spreads.shortOhms) {
      const ohms = Math.exp(uniform(random, Math.log(spreads.shortOhms[0]), Math.log(spreads.shortOhms[1])));
      for (const key of shorts) draws.set(key, ohms);
    }
    if (spreads.seriesOhms) {
      const ohms = Math.exp(uniform(random, Math.log(spreads.seriesOhms[0]), Math.log(spreads.seriesOhms[1])));
      for (const key of keys) if (key.startsWith('fault.series.')) draws.set(key, ohms);
    }
    sensor.sample(input.circuit.sensor, spreads.sensorTolerance, u, draws);
    for (let i = 0; i < keys.length; i++) out[i] = draws.get(keys[i]!) ?? Number.NaN;
    return draws;
  };
}

/** Percentile by linear interpolation between order statistics (sorted input). */
export function percentile(sorted: Float64Array, p: number): number {
  const pos = (sorted.length - 1) * p;
  const lo = Math.floor(pos);
  const hi = Math.ceil(pos);
  const frac = pos - lo;
  if (frac === 0 || !Number.isFinite(sorted[hi]!) || !Number.isFinite(sorted[lo]!)) return frac < 0.5 ? sorted[lo]! : sorted[hi]!;
  return sorted[lo]! + (sorted[hi]! - sorted[lo]!) * frac;
}

/**
 * Samples a reading `samples` times. Same inputs and seed → the same values. Ohms readings beyond the meter's range
 * are +Infinity (overload).
 */
export function sampleReadings(input: SampleInput): SampleResult {
  if (!input || typeof input !== 'object') return { ok: false, findings: [finding('sampling.missing', '', 'Sampling input is required.')] };
  const meter = input.meter ?? DEFAULT_METER;
  const prepared = prepareReading(input.circuit, input.faults, input.request, meter);
  if (!prepared.ok) return prepared;
  const spreads: Spreads = { ...defaultSpreads(input.circuit), ...input.spreads };
  const invalid = validateSampling(input, spreads);
  if (invalid.length) return { ok: false, findings: invalid };

  const compiled = prepared.value.netlist.compile();
  const evaluator = evaluatorFor(prepared.value, compiled);
  if (!evaluator.ok) return evaluator;
  const random = mulberry32(input.seed);
  const params = new Float64Array(compiled.paramKeys.length);
  const draw = paramSampler({ ...input, circuit: prepared.value.circuit }, spreads, compiled.paramKeys, prepared.value.netlist.params(), random);
  const quantity = QUANTITY_BEHAVIOURS[input.request.quantity];
  const accuracy = spreads.meterError ? quantity.accuracy(meter) : undefined;
  const values = new Float64Array(input.samples);
  for (let s = 0; s < input.samples; s++) {
    draw(params);
    let value = evaluator.value(params);
    if (accuracy && Number.isFinite(value)) {
      const band = (accuracy.percent / 100) * Math.abs(value) + accuracy.digits * resolutionFor(value, meter.counts, quantity.minResolution);
      value += band * (2 * random() - 1);
    }
    if (Number.isNaN(value)) {
      return { ok: false, findings: [finding('circuit.unsolvable', 'faults', 'A sampled circuit had no unique solution (a loop of ideal sources).')] };
    }
    values[s] = value;
  }
  values.sort();
  const q = (p: number) => percentile(values, p);
  return {
    ok: true,
    unit: prepared.value.unit,
    values,
    percentiles: { p1: q(0.01), p5: q(0.05), p25: q(0.25), p50: q(0.5), p75: q(0.75), p95: q(0.95), p99: q(0.99) },
  };
}

export interface DifferenceInput extends SampleInput {
  /** The reading subtracted from `request`'s, taken on the same sampled circuit. */
  compare: MeasurementRequest;
}

/** One half of a comparison: a reading of this circuit through its PID's readout, or another sensor's PID. */
function prepareHalf(input: SampleInput, request: MeasurementRequest, meter: MeterSpec) {
  const readout = request.quantity === 'scan_value' ? scanReadout(request.pid, input.circuit.kind) : undefined;
  if (request.quantity === 'scan_value' && !readout)
    return { ok: false as const, findings: [finding('sampling.pid_not_modelled', 'request.pid', `The circuit model cannot answer PID "${request.pid}" on a ${input.circuit.kind} circuit.`)] };
  if (readout && !readout.own) return { ok: true as const, keys: [] as string[], read: (_p: Float64Array, draws: ReadonlyMap<string, number>, u: () => number) => readout.value(Number.NaN, { circuit: input.circuit, draws, u }) };
  const prepared = prepareReading(input.circuit, input.faults, request, meter);
  if (!prepared.ok) return prepared;
  const compiled = prepared.value.netlist.compile();
  const evaluator = evaluatorFor(prepared.value, compiled);
  if (!evaluator.ok) return evaluator;
  const nominal = prepared.value.netlist.params();
  // A converter reading: the module's 5 V at the pull-up comes out of the same solve (a ratiometric readout uses it).
  const rail = compiled.index(MODULE_PIN.reference);
  const ground = compiled.index(MODULE_GROUND_NODE)!;
  const x = new Float64Array(compiled.size);
  const railVolts = () => (rail === undefined ? undefined : (compiled.solveSources(x), (rail < 0 ? 0 : x[rail]!) - (ground < 0 ? 0 : x[ground]!)));
  return {
    ok: true as const,
    keys: compiled.paramKeys,
    nominal,
    read: (params: Float64Array, draws: ReadonlyMap<string, number>, u: () => number) => {
      const volts = evaluator.value(params);
      return readout ? readout.value(volts, { circuit: input.circuit, draws, u, railVolts: railVolts() }) : volts;
    },
  };
}

/**
 * Samples the difference of two readings of one circuit (`request` − `compare`), both on the SAME sampled parts, so
 * what they share (supply, bias, sensor tolerance, temperature) cancels as it does on the vehicle. No meter error is
 * added (the diagnosis adds the instruments' error as a kernel). Sorted values, deterministic per seed.
 */
export function sampleDifferences(input: DifferenceInput): SampleResult {
  const meter = input.meter ?? DEFAULT_METER;
  const a = prepareHalf(input, input.request, meter);
  if (!a.ok) return a;
  const b = prepareHalf(input, input.compare, meter);
  if (!b.ok) return b;
  const spreads: Spreads = { ...defaultSpreads(input.circuit), ...input.spreads };
  const invalid = validateSampling(input, spreads);
  if (invalid.length) return { ok: false, findings: invalid };
  const random = mulberry32(input.seed);
  const u = () => 2 * random() - 1;
  const pa = new Float64Array(a.keys.length);
  const pb = new Float64Array(b.keys.length);
  const nominal = { ...('nominal' in b ? b.nominal : {}), ...('nominal' in a ? a.nominal : {}) };
  const draw = paramSampler(input, spreads, a.keys, nominal, random, b.keys);
  const values = new Float64Array(input.samples);
  for (let s = 0; s < input.samples; s++) {
    const draws = draw(pa);
    for (let i = 0; i < b.keys.length; i++) pb[i] = draws.get(b.keys[i]!) ?? Number.NaN;
    const value = a.read(pa, draws, u) - b.read(pb, draws, u);
    if (Number.isNaN(value)) return { ok: false, findings: [finding('circuit.unsolvable', 'faults', 'A sampled circuit gave no difference (no unique solution, or a value outside the sensor curve).')] };
    values[s] = value;
  }
  values.sort();
  const q = (p: number) => percentile(values, p);
  return { ok: true, unit: 'V', values, percentiles: { p1: q(0.01), p5: q(0.05), p25: q(0.25), p50: q(0.5), p75: q(0.75), p95: q(0.95), p99: q(0.99) } };
}
