/**
 * One module 5 V supply feeding several three-wire sensors: supply (set point, output resistance, optional current
 * limit) → module pin → trunk wire → splice → one branch per sensor to its connector; each sensor has its own
 * signal wire (to a biased module input) and ground wire (to the module's sensor ground). Faults: the reference
 * shorted to ground on the trunk or at any branch, one sensor dragging the reference down inside (a low resistance
 * from its reference pin to its ground pin), the supply dead, weak (high output resistance) or set low.
 *
 * Node names: the module side as in build.ts (`reg`, `m_reference`, `mg`, `ch`, `bp`), the trunk `mh_trunk`,
 * `mid_trunk`, `splice`; sensor i's nodes carry the prefix `n<i>_` (`n0_sh_ref` is the harness side of sensor 0's
 * reference terminal, where the meter's red lead goes). Fault severities may be ranges, drawn log-uniformly per
 * Monte Carlo sample (a fault's form is a spread like any part's).
 */
import { finding, type Finding, type Result } from '../calc/findings';
import { BATTERY_POSITIVE_NODE, CHASSIS_NODE, MODULE_GROUND_NODE } from './build';
import { DEFAULT_METER } from './defaults';
import { GROUND_NODE, Netlist, type CompiledNetlist } from './netlist';
import { mulberry32, uniform, type Random } from './prng';
import { sensorBehaviour, SENSOR_PIN } from './sensors';
import type { BatterySpec, BiasSpec, MeterSpec, PotentiometerSpec, PressureSpec, RegulatorSpec } from './types';

/** A severity: a fixed value, or a range drawn log-uniformly per sample. */
export type Severity = number | [number, number];

export interface SharedSensorSpec {
  id: string;
  sensor: PotentiometerSpec | PressureSpec;
  /** End-to-end resistance of the sensor's own reference branch, signal and ground wires, Ω. */
  wires: { reference: number; signal: number; ground: number };
  bias: BiasSpec;
}

export interface SharedReferenceSpec {
  battery: BatterySpec;
  regulator: RegulatorSpec;
  module: { groundOhms: number; sensorGroundOhms: number; inputFilterOhms: number };
  /** Module pin to the splice, Ω. */
  trunkOhms: number;
  contactOhms: number;
  chassisGroundOhms: number;
  sensors: SharedSensorSpec[];
}

export type SharedFault =
  | { kind: 'reference_short_ground'; at: 'trunk' | string; ohms: Severity }
  | { kind: 'sensor_loading'; sensor: string; ohms: Severity }
  | { kind: 'supply_dead' }
  | { kind: 'supply_weak'; ohms: Severity }
  | { kind: 'supply_low'; volts: Severity };

/** The reference at one sensor's connector (harness side) against battery negative, or ohms to it key off. */
export interface SharedRequest {
  quantity: 'dc_volts' | 'ohms';
  at: string;
  /** Sensors whose connector is unplugged. */
  unplugged: string[];
  key: 'on' | 'off';
}

const p = (i: number, name: string) => `n${i}_${name}`;
export const sharedNode = { reference: (i: number) => p(i, 'sh_ref'), sensorPin: (i: number) => p(i, SENSOR_PIN.reference) };

const FAULT_OHMS = 'fault.ohms';
const FAULT_VOLTS = 'fault.volts';

/** Sensor i's own part of the netlist: its three wires, terminals, module input and the sensor itself. */
function buildSensor(netlist: Netlist, s: SharedSensorSpec, i: number, contactOhms: number, inputFilterOhms: number, sensorGroundOhms: number): void {
  const wire = (role: 'ref' | 'signal' | 'ground', from: string, to: string, ohms: number) => {
    netlist.add({ id: p(i, `${role}_a`), kind: 'resistor', nodes: [from, p(i, `mid_${role}`)], value: ohms / 2, param: { key: p(i, `wire.${role}`), scale: 0.5 } });
    netlist.add({ id: p(i, `${role}_b`), kind: 'resistor', nodes: [p(i, `mid_${role}`), to], value: ohms / 2, param: { key: p(i, `wire.${role}`), scale: 0.5 } });
  };
  wire('ref', 'splice', p(i, 'sh_ref'), s.wires.reference);
  netlist.add({ id: p(i, 'sc_ref'), kind: 'resistor', nodes: [p(i, 'sh_ref'), p(i, SENSOR_PIN.reference)], value: contactOhms });
  for (const role of ['signal', 'ground'] as const) {
    netlist.add({ id: p(i, `mc_${role}`), kind: 'resistor', nodes: [p(i, `m_${role}`), p(i, `mh_${role}`)], value: contactOhms });
    wire(role, p(i, `mh_${role}`), p(i, `sh_${role}`), s.wires[role]);
    netlist.add({ id: p(i, `sc_${role}`), kind: 'resistor', nodes: [p(i, `sh_${role}`), p(i, SENSOR_PIN[role])], value: contactOhms });
  }
  if (s.bias.kind === 'pull_up') netlist.add({ id: p(i, 'bias_r'), kind: 'resistor', nodes: ['m_reference', p(i, 'm_signal')], value: s.bias.ohms, param: { key: p(i, 'bias.ohms'), scale: 1 } });
  if (s.bias.kind === 'pull_down') netlist.add({ id: p(i, 'bias_r'), kind: 'resistor', nodes: [p(i, 'm_signal'), MODULE_GROUND_NODE], value: s.bias.ohms, param: { key: p(i, 'bias.ohms'), scale: 1 } });
  netlist.add({ id: p(i, 'input_filter_r'), kind: 'resistor', nodes: [p(i, 'm_signal'), p(i, 'adc')], value: inputFilterOhms });
  netlist.add({ id: p(i, 'sensor_ground_r'), kind: 'resistor', nodes: [p(i, 'm_ground'), MODULE_GROUND_NODE], value: sensorGroundOhms });
  // The single-circuit sensor, its nodes and parameters renamed into sensor i's namespace.
  const own = new Netlist();
  sensorBehaviour(s.sensor)!.build(own, s.sensor);
  for (const e of own.elements()) {
    netlist.add({ ...e, id: p(i, e.id), nodes: e.nodes.map((n) => (n === GROUND_NODE ? n : p(i, n))), ...(e.param ? { param: { key: p(i, e.param.key), scale: e.param.scale } } : {}) });
  }
}

function indexOf(spec: SharedReferenceSpec, id: string): number {
  return spec.sensors.findIndex((s) => s.id === id);
}

/** Checks the names a fault list and a request use against the circuit. */
export function validateShared(spec: SharedReferenceSpec, faults: SharedFault[], request: SharedRequest): Finding[] {
  const found: Finding[] = [];
  if (spec.sensors.length < 1) found.push(finding('shared.no_sensors', 'circuit.sensors', 'A shared reference needs at least one sensor.'));
  if (new Set(spec.sensors.map((s) => s.id)).size !== spec.sensors.length) found.push(finding('shared.duplicate_sensor', 'circuit.sensors', 'Sensor ids must differ.'));
  const known = (id: string, path: string) => (indexOf(spec, id) < 0 ? [finding('shared.unknown_sensor', path, `No sensor "${id}" on this reference.`)] : []);
  faults.forEach((f, k) => {
    if (f.kind === 'sensor_loading') found.push(...known(f.sensor, `faults[${k}].sensor`));
    if (f.kind === 'reference_short_ground' && f.at !== 'trunk') found.push(...known(f.at, `faults[${k}].at`));
  });
  found.push(...known(request.at, 'request.at'), ...request.unplugged.flatMap((id, k) => known(id, `request.unplugged[${k}]`)));
  if (request.quantity === 'ohms' && request.key === 'on') found.push(finding('measurement.ohms_on_powered_circuit', 'request.key', 'An ohms reading is taken with the key off.'));
  return found;
}

const fixedOf = (s: Severity) => (Array.isArray(s) ? Math.sqrt(s[0] * s[1]) : s);

/** The netlist of one reading; `limited` puts the supply in its current limit (a current source of the limit). */
export function sharedNetlist(spec: SharedReferenceSpec, faults: SharedFault[], request: SharedRequest, meter: MeterSpec = DEFAULT_METER, limited = false): Netlist {
  const netlist = new Netlist();
  const key = request.key;
  const battery = key === 'off' ? spec.battery.keyOffVolts : spec.battery.volts.off;
  netlist.add({ id: 'battery', kind: 'vsource', nodes: ['bp_i', GROUND_NODE], value: battery, param: { key: 'battery.volts', scale: 1 } });
  netlist.add({ id: 'battery_r', kind: 'resistor', nodes: ['bp_i', BATTERY_POSITIVE_NODE], value: spec.battery.internalOhms });
  netlist.add({ id: 'chassis_r', kind: 'resistor', nodes: [CHASSIS_NODE, GROUND_NODE], value: spec.chassisGroundOhms });
  netlist.add({ id: 'module_ground_r', kind: 'resistor', nodes: [MODULE_GROUND_NODE, GROUND_NODE], value: spec.module.groundOhms });
  const reg = spec.regulator;
  if (key === 'on') {
    const regulating = battery >= reg.minInputVolts;
    const dead = faults.some((f) => f.kind === 'supply_dead');
    const low = faults.find((f) => f.kind === 'supply_low');
    const weak = faults.find((f) => f.kind === 'supply_weak');
    if (limited && !dead) {
      netlist.add({ id: 'regulator_limited', kind: 'isource', nodes: [MODULE_GROUND_NODE, 'm_reference'], value: reg.currentLimitAmps ?? 0 });
    } else {
      const volts = dead ? 0 : low ? fixedOf(low.volts) : regulating ? reg.volts : Math.max(0, Math.min(reg.volts, battery - 1));
      const param = dead || !regulating ? {} : { param: { key: low ? FAULT_VOLTS : 'regulator.volts', scale: 1 } };
      netlist.add({ id: 'regulator', kind: 'vsource', nodes: ['reg', MODULE_GROUND_NODE], value: volts, ...param });
      netlist.add({ id: 'regulator_r', kind: 'resistor', nodes: ['reg', 'm_reference'], value: weak ? fixedOf(weak.ohms) : reg.outputOhms, ...(weak ? { param: { key: FAULT_OHMS, scale: 1 } } : {}) });
    }
  } else {
    netlist.add({ id: 'regulator_off_r', kind: 'resistor', nodes: ['m_reference', MODULE_GROUND_NODE], value: reg.offOhms, param: { key: 'regulator.off_ohms', scale: 1 } });
  }
  netlist.add({ id: 'mc_trunk', kind: 'resistor', nodes: ['m_reference', 'mh_trunk'], value: spec.contactOhms });
  netlist.add({ id: 'trunk_a', kind: 'resistor', nodes: ['mh_trunk', 'mid_trunk'], value: spec.trunkOhms / 2, param: { key: 'wire.trunk', scale: 0.5 } });
  netlist.add({ id: 'trunk_b', kind: 'resistor', nodes: ['mid_trunk', 'splice'], value: spec.trunkOhms / 2, param: { key: 'wire.trunk', scale: 0.5 } });
  spec.sensors.forEach((s, i) => buildSensor(netlist, s, i, spec.contactOhms, spec.module.inputFilterOhms, spec.module.sensorGroundOhms));
  for (const f of faults) {
    if (f.kind === 'reference_short_ground') {
      const at = f.at === 'trunk' ? 'mid_trunk' : p(indexOf(spec, f.at), 'mid_ref');
      netlist.add({ id: netlist.uniqueId('short_ground'), kind: 'resistor', nodes: [at, CHASSIS_NODE], value: fixedOf(f.ohms), param: { key: FAULT_OHMS, scale: 1 } });
    }
    if (f.kind === 'sensor_loading') {
      const i = indexOf(spec, f.sensor);
      netlist.add({ id: netlist.uniqueId(p(i, 'loading')), kind: 'resistor', nodes: [p(i, SENSOR_PIN.reference), p(i, SENSOR_PIN.ground)], value: fixedOf(f.ohms), param: { key: FAULT_OHMS, scale: 1 } });
    }
  }
  for (const id of request.unplugged) {
    const i = indexOf(spec, id);
    for (const c of ['sc_ref', 'sc_signal', 'sc_ground']) netlist.remove(p(i, c));
  }
  const at = sharedNode.reference(indexOf(spec, request.at));
  if (request.quantity === 'dc_volts') netlist.add({ id: 'meter', kind: 'resistor', nodes: [at, GROUND_NODE], value: meter.inputOhms });
  netlist.addLeaks([at]);
  return netlist;
}

/**
 * Part spreads of a shared reference (common practice, no source): the single circuit's, but a set point from
 * 4.75 to 5.15 V (a 5 V reference a little low is still a working one); the trunk like any wire; the unpowered
 * output's resistance to ground from 200 Ω to 100 kΩ (modules differ widely).
 */
export interface SharedSpreads {
  wireOhms: [number, number];
  regulatorVolts: [number, number];
  batteryVolts: number;
  biasSpread: number;
  sensorTolerance: number;
  /** The supply's current limit, drawn per sample when the circuit has one, A. */
  currentLimitAmps?: [number, number];
  /** The unpowered 5 V output's resistance to module ground (drawn log-uniformly), Ω. */
  offOhms: [number, number];
}

export function defaultSharedSpreads(spec: SharedReferenceSpec): SharedSpreads {
  const reg = spec.regulator.volts;
  return { wireOhms: [0.05, 0.3], regulatorVolts: [reg - 0.25, reg + 0.15], batteryVolts: 0.2, biasSpread: 0.2, sensorTolerance: 0.02, offOhms: [200, 100_000] };
}

const logUniform = (random: Random, [lo, hi]: [number, number]) => Math.exp(uniform(random, Math.log(lo), Math.log(hi)));

interface Compiled {
  compiled: CompiledNetlist;
  x: Float64Array;
  params: Float64Array;
}

function compile(netlist: Netlist): Compiled {
  const compiled = netlist.compile();
  return { compiled, x: new Float64Array(compiled.size), params: new Float64Array(compiled.paramKeys.length) };
}

/** Solves a compiled netlist with the drawn parameters; returns the solution vector or undefined if singular. */
function solveWith(c: Compiled, draws: Map<string, number> | undefined): Float64Array | undefined {
  c.compiled.paramKeys.forEach((k, j) => (c.params[j] = draws?.get(k) ?? Number.NaN));
  if (!c.compiled.factor(draws ? c.params : undefined)) return undefined;
  c.compiled.solveSources(c.x);
  return c.x;
}

/**
 * A reading evaluator: parameters drawn (or nominal) in, reading out. The supply's current limit is decided per
 * evaluation: solved as a source behind its output resistance, and again as a current source of the limit when
 * that would draw more.
 */
export function sharedEvaluator(spec: SharedReferenceSpec, faults: SharedFault[], request: SharedRequest, meter: MeterSpec = DEFAULT_METER): Result<(draws?: Map<string, number>) => number> {
  const found = validateShared(spec, faults, request);
  if (found.length) return { ok: false, findings: found };
  const main = compile(sharedNetlist(spec, faults, request, meter));
  const at = main.compiled.index(sharedNode.reference(indexOf(spec, request.at)))!;
  const v = (x: Float64Array, node: number | undefined) => (node === undefined || node < 0 ? 0 : x[node]!);
  if (request.quantity === 'ohms') {
    if (!main.compiled.factor()) return { ok: false, findings: [finding('circuit.unsolvable', 'faults', 'No unique solution.')] };
    main.compiled.solveSources(main.x);
    if (Math.abs(v(main.x, at)) > 1e-3) return { ok: false, findings: [finding('measurement.ohms_on_powered_circuit', 'request.at', 'The circuit is powered there.')] };
    return {
      ok: true,
      value: (draws) => {
        solveWith(main, draws);
        main.compiled.solveInjection(at, -1, meter.ohmsTestAmps, main.x);
        const ohms = v(main.x, at) / meter.ohmsTestAmps;
        return ohms > meter.maxOhms ? Number.POSITIVE_INFINITY : ohms;
      },
    };
  }
  const canLimit = request.key === 'on' && spec.regulator.currentLimitAmps !== undefined && !faults.some((f) => f.kind === 'supply_dead');
  const limited = canLimit ? compile(sharedNetlist(spec, faults, request, meter, true)) : undefined;
  const reg = main.compiled.index('reg');
  const rail = main.compiled.index('m_reference');
  const outKey = faults.some((f) => f.kind === 'supply_weak') ? FAULT_OHMS : undefined;
  const weak = faults.find((f) => f.kind === 'supply_weak');
  const outNominal = weak ? fixedOf(weak.ohms) : spec.regulator.outputOhms;
  return {
    ok: true,
    value: (draws) => {
      const x = solveWith(main, draws);
      if (!x) return Number.NaN;
      if (limited) {
        const limit = draws?.get('supply.limit_amps') ?? spec.regulator.currentLimitAmps!;
        const amps = (v(x, reg) - v(x, rail)) / ((outKey && draws?.get(outKey)) || outNominal);
        if (amps > limit) {
          const limits = new Map(draws ?? []).set('supply.limit_amps', limit);
          const y = solveWith(limited, limits);
          if (!y) return Number.NaN;
          return v(y, limited.compiled.index(sharedNode.reference(indexOf(spec, request.at)))!);
        }
      }
      return v(x, at);
    },
  };
}

/** The reading at nominal part values (fault ranges at their geometric middle), no meter error. */
export function predictSharedReading(spec: SharedReferenceSpec, faults: SharedFault[], request: SharedRequest, meter: MeterSpec = DEFAULT_METER): Result<number> {
  const evaluator = sharedEvaluator(spec, faults, request, meter);
  return evaluator.ok ? { ok: true, value: evaluator.value() } : evaluator;
}

/** Draws one sample's parameters: part spreads, and the severity of each ranged fault. */
function drawParams(spec: SharedReferenceSpec, faults: SharedFault[], spreads: SharedSpreads, random: Random, out: Map<string, number>): void {
  const u = () => 2 * random() - 1;
  out.clear();
  out.set('battery.volts', spec.battery.volts.off + spreads.batteryVolts * u());
  out.set('regulator.volts', uniform(random, ...spreads.regulatorVolts));
  out.set('wire.trunk', uniform(random, ...spreads.wireOhms));
  if (spreads.currentLimitAmps) out.set('supply.limit_amps', uniform(random, ...spreads.currentLimitAmps));
  out.set('regulator.off_ohms', logUniform(random, spreads.offOhms));
  const own = new Map<string, number>();
  spec.sensors.forEach((s, i) => {
    for (const role of ['ref', 'signal', 'ground']) out.set(p(i, `wire.${role}`), uniform(random, ...spreads.wireOhms));
    if (s.bias.kind !== 'none') out.set(p(i, 'bias.ohms'), s.bias.ohms * (1 + spreads.biasSpread * u()));
    own.clear();
    sensorBehaviour(s.sensor)!.sample(s.sensor, spreads.sensorTolerance, u, own);
    for (const [k, value] of own) out.set(p(i, k), value);
  });
  for (const f of faults) {
    const severity = f.kind === 'supply_low' ? f.volts : f.kind === 'supply_dead' ? undefined : f.ohms;
    if (severity === undefined) continue;
    const value = Array.isArray(severity) ? (f.kind === 'supply_low' ? uniform(random, ...severity) : logUniform(random, severity)) : severity;
    out.set(f.kind === 'supply_low' ? FAULT_VOLTS : FAULT_OHMS, value);
  }
}

export interface SharedSampleInput {
  circuit: SharedReferenceSpec;
  faults: SharedFault[];
  request: SharedRequest;
  samples: number;
  seed: number;
  spreads?: Partial<SharedSpreads>;
  meter?: MeterSpec;
}

/** Sorted readings over the part spreads (no meter error: the engine adds it when it weighs a reading). */
export function sampleSharedReadings(input: SharedSampleInput): Result<Float64Array> {
  const evaluator = sharedEvaluator(input.circuit, input.faults, input.request, input.meter);
  if (!evaluator.ok) return evaluator;
  const spreads = { ...defaultSharedSpreads(input.circuit), ...input.spreads };
  const random = mulberry32(input.seed);
  const draws = new Map<string, number>();
  const values = new Float64Array(input.samples);
  for (let s = 0; s < input.samples; s++) {
    drawParams(input.circuit, input.faults, spreads, random, draws);
    const value = evaluator.value(draws);
    if (Number.isNaN(value)) return { ok: false, findings: [finding('circuit.unsolvable', 'faults', 'A sampled circuit had no unique solution.')] };
    values[s] = value;
  }
  return { ok: true, value: values.sort() };
}

/**
 * A typical shared reference (common practice, no source): the single circuit's module (5.0 V, 1 Ω output), a
 * 0.1 Ω trunk, each sensor on 0.1 Ω wires with its input pulled up through 250 kΩ; sensors alternate between a
 * 5 kΩ potentiometer and a pressure sensor drawing about 8 mA (625 Ω) unless given.
 */
export function defaultSharedReference(ids: readonly string[], options: { kinds?: Array<'potentiometer' | 'pressure'>; currentLimitAmps?: number } = {}): SharedReferenceSpec {
  return {
    battery: { keyOffVolts: 12.6, volts: { off: 12.4, cranking: 10.0, running: 14.2 }, internalOhms: 0.01 },
    regulator: { volts: 5.0, outputOhms: 1, offOhms: 1000, minInputVolts: 6, ...(options.currentLimitAmps ? { currentLimitAmps: options.currentLimitAmps } : {}) },
    module: { groundOhms: 0.01, sensorGroundOhms: 0.05, inputFilterOhms: 10_000 },
    trunkOhms: 0.1,
    contactOhms: 0.005,
    chassisGroundOhms: 0.005,
    sensors: ids.map((id, i) => {
      const kind = options.kinds?.[i] ?? (i % 2 === 0 ? 'potentiometer' : 'pressure');
      const sensor: PotentiometerSpec | PressureSpec =
        kind === 'potentiometer'
          ? { kind: 'potentiometer', trackOhms: 5000, position: 0.15, wiperOhms: 50 }
          : { kind: 'pressure', pressureKpa: 101.325, calibration: { lowKpa: 20, lowFraction: 0.1, highKpa: 105, highFraction: 0.9 }, supplyOhms: 625, outputOhms: 100 };
      return { id, sensor, wires: { reference: 0.1, signal: 0.1, ground: 0.1 }, bias: { kind: 'pull_up', ohms: 250_000 } };
    }),
  };
}
