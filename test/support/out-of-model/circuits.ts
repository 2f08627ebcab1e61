/**
 * The out-of-model circuits as netlists for our own nodal solver: a module (5 V supply with output resistance and
 * current limit, internal rail load, bias resistor, ADC input, ground return), three (or two) harness wires with
 * a fault location along each, connector terminals, the sensor, a battery-voltage circuit a short can touch,
 * jumpers and the meter. Part values come from the case; none from src/engine/circuit.
 */
import type { Jumper, MeasurementRequest, Point } from '../../../src/engine/vocabulary';
import { GROUND, Net, type Solution } from './nodal';
import { ntcOhms, type SteinhartHart } from './ntc';

export type Wire = 'reference' | 'signal' | 'ground';

export type Sensor =
  | { kind: 'potentiometer'; ohms: number; position: number; wiperOhms: number }
  /** A powered sensor: draws supply current, drives a ratiometric output through an output resistance. */
  | { kind: 'active'; supplyOhms: number; ratio: number; outOhms: number }
  | { kind: 'ntc'; curve: SteinhartHart; celsius: number };

export type Fault =
  /** In series with a wire at its fault point: an open (≥ 1 GΩ) or a high resistance. */
  | { kind: 'series'; wire: Wire; ohms: number }
  /** From a wire's fault point to chassis ground, to the battery-voltage circuit, or to another wire. */
  | { kind: 'shunt'; wire: Wire; to: 'chassis' | 'feed' | Wire; ohms: number }
  /** `output_stuck`: the output stays where the input rests, whatever the pedal or the manifold does. */
  | { kind: 'sensor'; variant: 'element_open' | 'wiper_open' | 'output_to_reference' | 'output_to_ground' | 'output_dead' | 'output_high' | 'output_stuck' | 'ntc_open' | 'ntc_shorted'; ohms: number }
  /** A thermistor that has drifted: it has the resistance of its own curve `celsius` warmer than it is. */
  | { kind: 'sensor'; variant: 'ntc_skewed'; celsius: number };

export interface CircuitCase {
  kind: 'three_wire_5v' | 'two_wire_thermistor';
  supply: { volts: number; outOhms: number; limitAmps: number };
  /** Module 5 V rail: its own load key on, its bleed to module ground key off. */
  railLoadOhms: number;
  railOffOhms: number;
  bias: { direction: 'pull_up' | 'pull_down'; ohms: number };
  adcInputOhms: number;
  moduleGroundOhms: number;
  moduleAmps: number;
  battery: { keyOff: number; keyOn: number; cranking: number; running: number; internalOhms: number };
  strapOhms: number;
  /** Harness wire resistance (both terminals included) and where along it (0 module … 1 sensor) a fault sits. */
  wires: Record<Wire, { ohms: number; faultAt: number }>;
  terminalOhms: number;
  /** The battery-voltage circuit a shorted wire would touch: fed from the battery always, or only key on. */
  feed: { batteryFed: boolean; feedOhms: number; loadOhms: number };
  sensor: Sensor;
  jumperOhms: number;
  faults: Fault[];
}

export interface Probe {
  request: MeasurementRequest;
  /** Meter input resistance on DC volts, or undefined for no meter (scan values, ohms). */
  meterOhms?: number;
}

const OPEN = 1e10;

function batteryVolts(c: Pick<CircuitCase, 'battery'>, r: MeasurementRequest): number {
  if (r.key === 'off') return c.battery.keyOff;
  return r.engine === 'running' ? c.battery.running : r.engine === 'cranking' ? c.battery.cranking : c.battery.keyOn;
}

/** Node prefix of each location: harness side at the module (m) or sensor (s), or the sensor's own pins (p). */
const LOCATION_PREFIX: Record<MeasurementRequest['location'], string> = { module_connector: 'm', sensor_connector: 's', sensor_pins: 'p' };

/** Node of a probe point for a request's location. */
export function pointNode(point: Point, location: MeasurementRequest['location']): string {
  if (point === 'battery_negative') return GROUND;
  if (point === 'battery_positive') return 'bp';
  if (point === 'chassis_ground') return 'ch';
  return `${LOCATION_PREFIX[location]}_${point.slice(0, 3)}`;
}

/** Whether a connector is unplugged for a request: the first lead's connector, or the other one (`otherConnector`). */
export function unplugged(r: MeasurementRequest, connector: 'sensor_connector' | 'module_connector'): boolean {
  // Leads on the sensor's own pins sit behind the sensor connector: its state is `connector`.
  const first = r.location === 'sensor_pins' ? 'sensor_connector' : r.location;
  return (first === connector ? r.connector : r.otherConnector) === 'unplugged';
}

/** The nodes of the two leads: the second on `againstLocation` when the leads sit at the two ends of the harness. */
export function leadNodes(r: MeasurementRequest): [string, string] {
  return [pointNode(r.at, r.location), pointNode(r.against!, r.againstLocation ?? r.location)];
}

/**
 * Builds the netlist for one request. `supplyMode` lets the caller re-solve with the regulator replaced by its
 * current limit or removed (it only sources current): see `solveCase`.
 */
export function buildNet(c: CircuitCase, r: MeasurementRequest, supplyMode: SupplyMode = 'source', meterOhms?: number, blown: ReadonlySet<number> = new Set()): Net {
  const n = new Net();
  const powered = r.key === 'on';
  const wires: Wire[] = c.kind === 'three_wire_5v' ? ['reference', 'signal', 'ground'] : ['signal', 'ground'];
  stampBattery(n, c, r);
  // The battery-voltage circuit a short can touch, loaded to chassis so it never floats.
  if (c.feed.batteryFed || powered) n.r('feed', 'bp', 'fd', c.feed.feedOhms);
  n.r('feedload', 'fd', 'ch', c.feed.loadOhms);
  stampModule(n, c, powered, supplyMode);
  // Module input: bias, ADC input resistance.
  n.r('bias', 'msi', c.bias.direction === 'pull_up' ? 'rl' : 'mg', c.bias.ohms).r('adc', 'msi', 'mg', c.adcInputOhms);
  const moduleOff = unplugged(r, 'module_connector');
  const inside: Record<Wire, string> = { reference: 'rl', signal: 'msi', ground: 'mg' };
  for (const w of wires) {
    const tag = w.slice(0, 3);
    if (!moduleOff) n.r(`tm${tag}`, inside[w], `m_${tag}`, c.terminalOhms);
    const { ohms, faultAt } = c.wires[w];
    const series = c.faults.find((f): f is Extract<Fault, { kind: 'series' }> => f.kind === 'series' && f.wire === w);
    n.r(`w1${tag}`, `m_${tag}`, `x_${tag}`, Math.max(1e-4, ohms * faultAt));
    const far = series ? `y_${tag}` : `x_${tag}`;
    if (series) n.r(`open${tag}`, `x_${tag}`, far, series.ohms);
    n.r(`w2${tag}`, far, `s_${tag}`, Math.max(1e-4, ohms * (1 - faultAt)));
  }
  c.faults.forEach((f, k) => {
    if (f.kind !== 'shunt') return;
    const to = f.to === 'chassis' ? 'ch' : f.to === 'feed' ? 'fd' : `x_${f.to.slice(0, 3)}`;
    n.r(`short${k}`, `x_${f.wire.slice(0, 3)}`, to, f.ohms);
  });
  const sensorOff = unplugged(r, 'sensor_connector');
  stampSensor(n, c, wires, !sensorOff, r);
  if (moduleOff && sensorOff) leakIsolatedWires(n, wires);
  if (sensorOff) leakUnpluggedSensor(n, wires);
  for (const [k, j] of r.jumpers.entries()) if (!blown.has(k)) stampJumper(n, c, j, k, r.location);
  if (meterOhms !== undefined && r.against) n.r('meter', ...leadNodes(r), meterOhms);
  return n;
}

type ModuleParts = Pick<CircuitCase, 'supply' | 'railLoadOhms' | 'railOffOhms' | 'moduleGroundOhms' | 'moduleAmps' | 'battery' | 'strapOhms'>;

/** Battery (with internal resistance) and the chassis strap to battery negative. */
export function stampBattery(n: Net, c: ModuleParts, r: MeasurementRequest): void {
  n.v('batt', 'bi', GROUND, batteryVolts(c, r)).r('batt', 'bi', 'bp', c.battery.internalOhms);
  n.r('strap', 'ch', GROUND, c.strapOhms);
}

/** Module ground return with the module's own current (key on), and the 5 V rail `rl`: regulator or bleed. */
export function stampModule(n: Net, c: ModuleParts, powered: boolean, supplyMode: SupplyMode): void {
  n.r('mgnd', 'mg', 'ch', c.moduleGroundOhms);
  if (powered) n.i('mload', 'bp', 'mg', c.moduleAmps);
  if (powered && supplyMode === 'source') n.v('reg', 'rs', 'mg', c.supply.volts).r('rout', 'rs', 'rl', c.supply.outOhms);
  if (powered && supplyMode === 'limit') n.i('reg', 'mg', 'rl', c.supply.limitAmps);
  n.r('rail', 'rl', 'mg', powered ? c.railLoadOhms : c.railOffOhms);
}

/**
 * The sensor's input as the request has it. Pressed fully, a pedal or throttle track runs to the end stop away from
 * where it rests (within 5 % of it); an active pressure sensor sees manifold vacuum only with the engine running, a
 * third of the barometric pressure or so at idle (common practice, no source). A stuck output stays where it rests.
 */
function asRead(s: Sensor, r: MeasurementRequest, stuck: boolean): Sensor {
  if (r.sensorInput !== 'moved' || stuck) return s;
  if (s.kind === 'potentiometer') return { ...s, position: s.position < 0.5 ? 0.95 : 0.05 };
  if (s.kind === 'active' && r.engine === 'running') return { ...s, ratio: s.ratio / 3 };
  return s;
}

/** The sensor between its pins `p_*`; mated to the harness `s_*` through its terminals when plugged in. */
function stampSensor(n: Net, c: CircuitCase, wires: Wire[], plugged: boolean, r: MeasurementRequest): void {
  if (plugged) for (const w of wires) n.r(`ts${w.slice(0, 3)}`, `s_${w.slice(0, 3)}`, `p_${w.slice(0, 3)}`, c.terminalOhms);
  const fault = c.faults.find((f): f is Extract<Fault, { kind: 'sensor' }> => f.kind === 'sensor');
  const s = asRead(c.sensor, r, fault?.variant === 'output_stuck');
  if (s.kind === 'ntc') {
    const ohms =
      fault?.variant === 'ntc_skewed' ? ntcOhms(s.curve, s.celsius + fault.celsius) : fault?.variant === 'ntc_open' || fault?.variant === 'ntc_shorted' ? fault.ohms : ntcOhms(s.curve, s.celsius);
    n.r('ntc', 'p_sig', 'p_gro', ohms);
    return;
  }
  if (s.kind === 'potentiometer') {
    const top = fault?.variant === 'element_open' ? OPEN : s.ohms * (1 - s.position);
    n.r('pottop', 'p_ref', 'p_w', top).r('potbot', 'p_w', 'p_gro', s.ohms * s.position);
    n.r('wiper', 'p_w', 'p_sig', fault?.variant === 'wiper_open' ? OPEN : s.wiperOhms);
  } else {
    const ratio = fault?.variant === 'output_dead' ? 0 : fault?.variant === 'output_high' ? 0.99 : s.ratio;
    n.r('sup', 'p_ref', 'p_gro', s.supplyOhms).e('out', 'p_o', 'p_gro', 'p_ref', 'p_gro', ratio);
    n.r('outr', 'p_o', 'p_w', s.outOhms).r('wiper', 'p_w', 'p_sig', 1);
  }
  if (fault?.variant === 'output_to_reference') n.r('ishort', 'p_w', 'p_ref', fault.ohms);
  if (fault?.variant === 'output_to_ground') n.r('ishort', 'p_w', 'p_gro', fault.ohms);
}

/** An unplugged sensor touches nothing: a leak from each pin to battery negative keeps it solvable. */
function leakUnpluggedSensor(n: Net, wires: Wire[]): void {
  for (const w of wires) n.r(`pleak${w.slice(0, 3)}`, `p_${w.slice(0, 3)}`, GROUND, 1e12);
}

/** With both connectors unplugged a wire touches nothing: a leak to battery negative keeps it solvable (reads overload). */
function leakIsolatedWires(n: Net, wires: Wire[]): void {
  for (const w of wires) n.r(`leak${w.slice(0, 3)}`, `m_${w.slice(0, 3)}`, GROUND, 1e12);
}

function stampJumper(n: Net, c: CircuitCase, j: Jumper, k: number, location: MeasurementRequest['location']): void {
  const a = pointNode(j.from, location);
  const b = pointNode(j.to, location);
  if (j.via.kind === 'fused_jumper') n.r(`jump${k}`, a, b, c.jumperOhms);
  else if (j.via.kind === 'resistor') n.r(`jump${k}`, a, b, j.via.ohms);
  else n.v(`jump${k}`, `jv${k}`, b, j.via.volts).r(`jump${k}`, a, `jv${k}`, c.jumperOhms);
}

/** A fused jumper's fuse, A (common practice, no source: a 3 A fuse in a test jumper on 5 V sensor circuits). */
export const JUMPER_FUSE_AMPS = 3;

export type SupplyMode = 'source' | 'limit' | 'off';

/**
 * Solves a request's circuit. The regulator only sources current, up to its limit: if the solved output current is
 * negative (something holds the rail above its set point) it is switched off; if above its limit it becomes the
 * limit current. A fused jumper carrying more than its fuse opens. Re-solved until consistent.
 */
export function solveCase(c: CircuitCase, r: MeasurementRequest, meterOhms?: number): Solution {
  return settleSupply(c.supply, r.key === 'on', (mode, blown) => buildNet(c, r, mode, meterOhms, blown), (solution, blown) =>
    r.jumpers.findIndex((j, k) => {
      const drop = solution.volts.get(pointNode(j.from, r.location))! - solution.volts.get(pointNode(j.to, r.location))!;
      return !blown.has(k) && j.via.kind === 'fused_jumper' && Math.abs(drop) / c.jumperOhms > JUMPER_FUSE_AMPS;
    }),
  );
}

/** The regulator and fuse iteration of `solveCase`, for any netlist whose rail is node `rl` over module ground `mg`. */
export function settleSupply(
  supply: CircuitCase['supply'],
  keyOn: boolean,
  build: (mode: SupplyMode, blown: ReadonlySet<number>) => Net,
  overFuse: (solution: Solution, blown: ReadonlySet<number>) => number = () => -1,
): Solution {
  let mode: SupplyMode = 'source';
  const blown = new Set<number>();
  for (let pass = 0; pass < 8; pass++) {
    const solution = build(mode, blown).solve();
    const over = overFuse(solution, blown);
    if (over >= 0) {
      blown.add(over);
      continue;
    }
    if (!keyOn || mode === 'off') return solution;
    if (mode === 'source') {
      const out = -(solution.sourceAmps.get('reg') ?? 0);
      if (out < 0) mode = 'off';
      else if (out > supply.limitAmps) mode = 'limit';
      else return solution;
    } else if (solution.volts.get('rl')! - solution.volts.get('mg')! > supply.volts) mode = 'off';
    else return solution;
  }
  throw new Error('out-of-model circuit did not settle');
}
