/**
 * The shared 5 V reference of the out-of-model cases: one module supply feeding a trunk wire to a splice, a branch
 * to each sensor (the three-sensor cases: throttle position, manifold pressure, fuel-tank pressure; the N-sensor
 * cases: any list of sensors), each drawing its supply current to its own ground wire. Faults: a sensor shorted inside from its reference to its ground, the harness
 * shorted to ground on the trunk or a branch, the module's supply dead or weak. Readings: the reference at a
 * sensor's connector with everything plugged, that sensor unplugged or all three unplugged, and ohms to ground.
 */
import type { MeasurementRequest } from '../../../src/engine/vocabulary';
import { settleSupply, stampBattery, stampModule, type CircuitCase, type SupplyMode } from './circuits';
import { display, METER, readingRandom, type Instruments } from './instruments';
import { GROUND, Net, type Solution } from './nodal';
import { hashString, splitmix32, type Random } from './random';

export const SHARED_SENSORS = ['throttle', 'manifold', 'tank'] as const;
export type SharedSensor = (typeof SHARED_SENSORS)[number];

export type SharedFault =
  | { kind: 'sensor_short'; sensor: string; ohms: number }
  | { kind: 'harness_short'; where: 'trunk' | string; ohms: number };

export interface SharedBranch {
  ohms: number;
  faultAt: number;
  groundOhms: number;
  sensorOhms: number;
}

export interface SharedCase extends Pick<CircuitCase, 'supply' | 'railLoadOhms' | 'railOffOhms' | 'moduleGroundOhms' | 'moduleAmps' | 'battery' | 'strapOhms' | 'terminalOhms'> {
  trunk: { ohms: number; faultAt: number };
  /** One branch per sensor, in the order the sensors are named (the first is where "all" readings are taken). */
  branches: Record<string, SharedBranch>;
  faults: SharedFault[];
}

/** Which sensors a request leaves unplugged, and at which connector the red lead goes. */
function setUp(c: SharedCase, r: MeasurementRequest): { unplugged: Set<string>; at: string } {
  const sensors = Object.keys(c.branches);
  const named = sensors.find((s) => s === r.sensor);
  const at = named ?? sensors[0]!;
  if (r.connector !== 'unplugged') return { unplugged: new Set(), at };
  return { unplugged: new Set(named ? [named] : sensors), at };
}

export function buildSharedNet(c: SharedCase, r: MeasurementRequest, mode: SupplyMode = 'source', meterOhms?: number): Net {
  const n = new Net();
  const powered = r.key === 'on';
  stampBattery(n, c, r);
  stampModule(n, c, powered, mode);
  const { unplugged, at } = setUp(c, r);
  n.r('tmref', 'rl', 'm_ref', c.terminalOhms);
  n.r('trunk1', 'm_ref', 'x_trunk', c.trunk.ohms * c.trunk.faultAt).r('trunk2', 'x_trunk', 'splice', c.trunk.ohms * (1 - c.trunk.faultAt));
  for (const s of Object.keys(c.branches)) {
    const b = c.branches[s];
    n.r(`br1${s}`, 'splice', `x_${s}`, b.ohms * b.faultAt).r(`br2${s}`, `x_${s}`, `s_ref_${s}`, b.ohms * (1 - b.faultAt));
    if (unplugged.has(s)) continue;
    n.r(`ts${s}`, `s_ref_${s}`, `p_ref_${s}`, c.terminalOhms).r(`sup${s}`, `p_ref_${s}`, `p_gnd_${s}`, b.sensorOhms);
    n.r(`gnd${s}`, `p_gnd_${s}`, 'mg', b.groundOhms);
    const inside = c.faults.find((f) => f.kind === 'sensor_short' && f.sensor === s);
    if (inside) n.r(`short${s}`, `p_ref_${s}`, `p_gnd_${s}`, inside.ohms);
  }
  c.faults.forEach((f, k) => f.kind === 'harness_short' && n.r(`hshort${k}`, `x_${f.where}`, 'ch', f.ohms));
  if (meterOhms !== undefined) n.r('meter', `s_ref_${at}`, GROUND, meterOhms);
  return n;
}

export function solveShared(c: SharedCase, r: MeasurementRequest, meterOhms?: number): Solution {
  return settleSupply(c.supply, r.key === 'on', (mode) => buildSharedNet(c, r, mode, meterOhms));
}

function checkRequest(r: MeasurementRequest): void {
  if (r.at !== 'reference' || r.against !== 'battery_negative' || r.location !== 'sensor_connector' || r.jumpers.length > 0)
    throw new Error(`the shared-reference cases answer the reference against battery negative at a sensor connector, not ${JSON.stringify(r)}`);
}

/** The true value: reference volts at the sensor's connector (meter loaded), or ohms to battery negative. */
export function sharedTrueValue(c: SharedCase, inst: Instruments, r: MeasurementRequest): number {
  checkRequest(r);
  const node = `s_ref_${setUp(c, r).at}`;
  if (r.quantity === 'dc_volts') return solveShared(c, r, inst.meterInputOhms).volts.get(node)!;
  if (r.quantity !== 'ohms') throw new Error(`the shared-reference cases do not answer ${r.quantity}`);
  if (Math.abs(solveShared(c, r).volts.get(node)!) > METER.liveVolts) return Infinity;
  const dead = { ...c, battery: { keyOff: 0, keyOn: 0, cranking: 0, running: 0, internalOhms: c.battery.internalOhms } };
  const net = buildSharedNet(dead, { ...r, key: 'off', engine: 'off' });
  net.i('ohmmeter', GROUND, node, 1);
  return net.solve().volts.get(node)! + inst.leadOhms;
}

export function sharedReading(c: SharedCase, inst: Instruments, r: MeasurementRequest, noiseSeed: number, attempt: number): number | 'overload' {
  const random = readingRandom(noiseSeed, r, attempt);
  const v = sharedTrueValue(c, inst, r);
  if (r.quantity === 'ohms') return !Number.isFinite(v) || v * (1 + inst.ohmsGain) >= METER.maxOhms ? 'overload' : display(v, inst.ohmsGain, METER.ohms, random);
  return display(v, inst.voltsGain, METER.volts, random);
}

/** Sensors the N-sensor cases name, in order (SAE J1930 terms, lower-case as tree ids). */
export const SHARED_SENSOR_POOL = ['tp', 'map', 'ftp', 'app', 'baro', 'egr', 'frp', 'tps2'] as const;

/** The causes of an N-sensor shared reference, as its generated tree names them. */
export function sharedCauses(sensors: readonly string[]): string[] {
  return ['no_fault_now', ...sensors.map((s) => `${s}_sensor_loading_reference`), 'reference_short_ground', 'module_regulator'];
}

export interface SharedNCase {
  cause: string;
  variant: string;
  circuit: SharedCase;
  instruments: Instruments;
  noiseSeed: number;
}

const uN = (random: Random, lo: number, hi: number) => lo + (hi - lo) * random();
const logN = (random: Random, lo: number, hi: number) => Math.exp(uN(random, Math.log(lo), Math.log(hi)));

/**
 * A reference shared by `sensors`, with part values of its own (common practice, no source): supply 4.8–5.1 V
 * behind 0.05–0.6 Ω with an 80–300 mA limit and an 80–800 Ω rail load of the module's own; trunk 0.02–0.5 Ω,
 * branches 0.03–0.8 Ω; each sensor draws 4–12 mA (400–1250 Ω) or is a 1–20 kΩ potentiometer. Faults: a sensor
 * shorted inside at 0.3–30 Ω, the trunk or a branch shorted to ground at 0.05–30 Ω, the supply dead, set low
 * (3.2–4.4 V) or sagging (20–100 Ω out). A fault that leaves the reference above 4.5 V with all plugged is drawn
 * again: no reading would show it.
 */
export function drawSharedCaseN(sensors: readonly string[], cause: string, index: number, seed: number): SharedNCase {
  const random = splitmix32(seed ^ hashString(`shared-${sensors.length}/${cause}/${index}`));
  for (let attempt = 0; ; attempt++) {
    const keyOff = uN(random, 12.2, 12.8);
    const circuit: SharedCase = {
      supply: { volts: uN(random, 4.8, 5.1), outOhms: uN(random, 0.05, 0.6), limitAmps: uN(random, 0.08, 0.3) },
      railLoadOhms: uN(random, 80, 800),
      railOffOhms: uN(random, 2_000, 50_000),
      moduleGroundOhms: uN(random, 0.005, 0.03),
      moduleAmps: uN(random, 0.1, 0.8),
      battery: { keyOff, keyOn: keyOff - uN(random, 0.1, 0.4), cranking: uN(random, 9.6, 11), running: uN(random, 13.6, 14.6), internalOhms: uN(random, 0.005, 0.02) },
      strapOhms: uN(random, 0.002, 0.02),
      terminalOhms: uN(random, 0.002, 0.02),
      trunk: { ohms: uN(random, 0.02, 0.5), faultAt: uN(random, 0.1, 0.9) },
      branches: Object.fromEntries(
        sensors.map((s) => [s, { ohms: uN(random, 0.03, 0.8), faultAt: uN(random, 0.1, 0.9), groundOhms: uN(random, 0.02, 0.5), sensorOhms: random() < 0.5 ? uN(random, 400, 1_250) : uN(random, 1_000, 20_000) }]),
      ),
      faults: [],
    };
    let variant = 'healthy';
    const sensor = sensors.find((s) => cause === `${s}_sensor_loading_reference`);
    if (sensor) {
      const ohms = logN(random, 0.3, 30);
      circuit.faults = [{ kind: 'sensor_short', sensor, ohms }];
      variant = `shorted inside, ${ohms.toFixed(1)} Ω`;
    } else if (cause === 'reference_short_ground') {
      const where = random() < 0.35 ? 'trunk' : sensors[Math.floor(random() * sensors.length)]!;
      const ohms = logN(random, 0.05, 30);
      circuit.faults = [{ kind: 'harness_short', where, ohms }];
      variant = `${where === 'trunk' ? 'trunk' : `${where} branch`}, ${ohms.toFixed(1)} Ω`;
    } else if (cause === 'module_regulator') {
      const form = (['dead', 'low set point', 'sags under load'] as const)[Math.floor(random() * 3)]!;
      if (form === 'dead') circuit.supply.volts = uN(random, 0, 0.3);
      else if (form === 'low set point') circuit.supply.volts = uN(random, 3.2, 4.4);
      else circuit.supply.outOhms = uN(random, 20, 100);
      variant = form;
    } else if (cause !== 'no_fault_now') throw new Error(`no shared-reference fault for cause "${cause}"`);
    const instruments: Instruments = {
      meterInputOhms: 10e6 * uN(random, 0.98, 1.02),
      voltsGain: uN(random, -0.005, 0.005),
      ohmsGain: uN(random, -0.01, 0.01),
      leadOhms: uN(random, 0.1, 0.4),
      adcBits: 10,
      adcFullScale: 5,
      scanNeedsEngineSpeed: false,
    };
    const c: SharedNCase = { cause, variant, circuit, instruments, noiseSeed: Math.floor(random() * 2 ** 31) };
    const plugged: MeasurementRequest = { quantity: 'dc_volts', at: 'reference', against: 'battery_negative', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', jumpers: [], sensor: sensors[0] };
    if (cause === 'no_fault_now' || attempt >= 20 || sharedTrueValue(circuit, instruments, plugged) < 4.5) return c;
  }
}
