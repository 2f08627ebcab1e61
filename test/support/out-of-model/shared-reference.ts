/**
 * The shared 5 V reference of the out-of-model cases: one module supply feeding a trunk wire to a splice, three
 * branches to a throttle position, a manifold pressure and a fuel-tank pressure sensor, each drawing its supply
 * current to its own ground wire. Faults: a sensor shorted inside from its reference to its ground, the harness
 * shorted to ground on the trunk or a branch, the module's supply dead or weak. Readings: the reference at a
 * sensor's connector with everything plugged, that sensor unplugged or all three unplugged, and ohms to ground.
 */
import type { MeasurementRequest } from '../../../src/engine/vocabulary';
import { settleSupply, stampBattery, stampModule, type CircuitCase, type SupplyMode } from './circuits';
import { display, METER, readingRandom, type Instruments } from './instruments';
import { GROUND, Net, type Solution } from './nodal';

export const SHARED_SENSORS = ['throttle', 'manifold', 'tank'] as const;
export type SharedSensor = (typeof SHARED_SENSORS)[number];

export type SharedFault =
  | { kind: 'sensor_short'; sensor: SharedSensor; ohms: number }
  | { kind: 'harness_short'; where: 'trunk' | SharedSensor; ohms: number };

export interface SharedCase extends Pick<CircuitCase, 'supply' | 'railLoadOhms' | 'railOffOhms' | 'moduleGroundOhms' | 'moduleAmps' | 'battery' | 'strapOhms' | 'terminalOhms'> {
  trunk: { ohms: number; faultAt: number };
  branches: Record<SharedSensor, { ohms: number; faultAt: number; groundOhms: number; sensorOhms: number }>;
  faults: SharedFault[];
}

/** Which sensors a request leaves unplugged, and at which connector the red lead goes. */
function setUp(r: MeasurementRequest): { unplugged: Set<SharedSensor>; at: SharedSensor } {
  const named = SHARED_SENSORS.find((s) => s === r.sensor);
  const at = named ?? 'throttle';
  if (r.connector !== 'unplugged') return { unplugged: new Set(), at };
  return { unplugged: new Set(named ? [named] : SHARED_SENSORS), at };
}

export function buildSharedNet(c: SharedCase, r: MeasurementRequest, mode: SupplyMode = 'source', meterOhms?: number): Net {
  const n = new Net();
  const powered = r.key === 'on';
  stampBattery(n, c, r);
  stampModule(n, c, powered, mode);
  const { unplugged, at } = setUp(r);
  n.r('tmref', 'rl', 'm_ref', c.terminalOhms);
  n.r('trunk1', 'm_ref', 'x_trunk', c.trunk.ohms * c.trunk.faultAt).r('trunk2', 'x_trunk', 'splice', c.trunk.ohms * (1 - c.trunk.faultAt));
  for (const s of SHARED_SENSORS) {
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
  const node = `s_ref_${setUp(r).at}`;
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
