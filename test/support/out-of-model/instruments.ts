/**
 * What the technician's instruments show for one request on an out-of-model case.
 *
 * Meter: a 6000-count auto-ranging handheld DMM (common practice, no source), DC volts accurate to
 * ±(0.5 % + 2 counts), ohms to ±(1 % + 2 counts) (common practice, no source). Each case's meter has its own gain
 * error (fixed for the visit) and each reading its own count error, both inside the stated accuracy; the ohms
 * reading includes the test leads (0.1–0.3 Ω, common practice, no source); above the top range it shows
 * overload, and on a wire that carries voltage with the key off it shows overload too (its test voltage is
 * overridden).
 *
 * Scan tool: the module's ADC, not a meter: 10 bits over 0–5 V full scale (clamped: an input pulled to battery
 * voltage reads 5.00), referenced to the module's own ground. A module that refreshes the value only with engine
 * speed shows, key on and engine stopped, the value it last sampled with the engine running (±1 count).
 */
import { hashString, splitmix32 } from './random';
import type { MeasurementRequest } from '../../../src/engine/vocabulary';
import { buildNet, leadNodes, solveCase, type CircuitCase } from './circuits';
import { ntcCelsius } from './ntc';

export interface Instruments {
  meterInputOhms: number;
  /** Relative gain error of this meter on volts and on ohms, inside its accuracy. */
  voltsGain: number;
  ohmsGain: number;
  leadOhms: number;
  adcBits: number;
  adcFullScale: number;
  /** The module refreshes this scan value only with engine speed. */
  scanNeedsEngineSpeed: boolean;
}

export const METER = {
  counts: 6000,
  volts: { percent: 0.5, counts: 2 },
  ohms: { percent: 1, counts: 2 },
  /** Top of the highest ohms range (60 MΩ on a 6000-count meter). */
  maxOhms: 60e6,
  /** Above this open-circuit voltage between the leads the ohms function cannot measure. */
  liveVolts: 0.05,
} as const;

/** Display resolution of the auto-ranged reading (ranges 0.6, 6, 60, 600 … of the unit). */
function resolution(value: number): number {
  let range = 0.6;
  while (Math.abs(value) >= range * 0.999) range *= 10;
  return range / METER.counts;
}

/** The stated accuracy band of a reading of `value`: ±(percent + counts). */
export function statedError(value: number, spec: { percent: number; counts: number }): number {
  return (spec.percent / 100) * Math.abs(value) + spec.counts * resolution(value);
}

/** The noise source of one attempt of one request: the same (case, request, attempt) always reads the same. */
export function readingRandom(noiseSeed: number, r: MeasurementRequest, attempt: number): () => number {
  return splitmix32(noiseSeed ^ hashString(`${JSON.stringify(r)}#${attempt}`));
}

export function display(value: number, gain: number, spec: { percent: number; counts: number }, random: () => number): number {
  const res = resolution(value);
  // The count error takes what the gain error leaves of the spec, so the total stays inside ±(percent + counts).
  const countsLeft = spec.counts - 0.5;
  const shown = value * (1 + gain) + countsLeft * res * (2 * random() - 1);
  return Number((Math.round(shown / res) * res).toPrecision(6));
}

/** The true (noise-free) value the request measures: volts, ohms (Infinity for open/overload) or ADC input volts. */
export function trueValue(c: CircuitCase, inst: Instruments, r: MeasurementRequest): number {
  if (r.quantity === 'scan_value') {
    const s = solveCase(c, r);
    return s.volts.get('msi')! - s.volts.get('mg')!;
  }
  if (r.quantity === 'dc_volts') {
    const s = solveCase(c, r, inst.meterInputOhms);
    const [a, b] = leadNodes(r);
    return s.volts.get(a)! - s.volts.get(b)!;
  }
  if (r.quantity === 'ohms') {
    const [a, b] = leadNodes(r);
    const live = solveCase(c, r);
    if (Math.abs(live.volts.get(a)! - live.volts.get(b)!) > METER.liveVolts) return Infinity;
    // Thevenin resistance: every source zeroed, 1 A injected between the leads.
    const dead: CircuitCase = { ...c, battery: { keyOff: 0, keyOn: 0, cranking: 0, running: 0, internalOhms: c.battery.internalOhms } };
    const net = buildNet(dead, { ...r, key: 'off', engine: 'off' });
    net.i('ohmmeter', b, a, 1);
    const v = net.solve().volts;
    return v.get(a)! - v.get(b)! + inst.leadOhms;
  }
  throw new Error(`out-of-model cases do not answer ${r.quantity}`);
}

/**
 * Temperature PIDs (SAE J1979 PID 05 coolant, 0F intake air: one byte, A − 40 °C, whole degrees). The coolant value is
 * the module's own: the thermistor's resistance from its converter volts, its pull-up and its own 5 V rail as it
 * stands (the converter is ratiometric, so a sagging rail cancels), through the sensor's curve (the module is made
 * for its sensor). The intake-air sensor is not in the circuit: after a cold
 * soak it reads the air the engine sits in, the case's temperature, within ±2 °C (common practice, no source), an
 * offset fixed for the case.
 */
const TEMPERATURE_PIDS = new Set(['05', '0F']);
const pidCelsius = (celsius: number) => Math.min(215, Math.max(-40, Math.round(Number.isNaN(celsius) ? -40 : celsius)));

function temperaturePid(c: CircuitCase, pid: string, adcVolts: number, railVolts: number, noiseSeed: number): number {
  if (c.sensor.kind !== 'ntc') throw new Error(`out-of-model cases answer PID ${pid} on thermistor circuits only`);
  if (pid === '0F') return pidCelsius(c.sensor.celsius + 2 * (2 * splitmix32(noiseSeed ^ hashString('intake-air'))() - 1));
  if (adcVolts >= railVolts) return -40;
  if (adcVolts <= 0) return 215;
  return pidCelsius(ntcCelsius(c.sensor.curve, (c.bias.ohms * adcVolts) / (railVolts - adcVolts)));
}

/** The module's 5 V rail against its ground for a request's set-up (what a ratiometric converter references). */
function railVolts(c: CircuitCase, r: MeasurementRequest): number {
  const s = solveCase(c, r);
  return s.volts.get('rl')! - s.volts.get('mg')!;
}

/** What the instrument shows for attempt `attempt` of a request (a repeat reads with fresh count noise). */
export function instrumentReading(c: CircuitCase, inst: Instruments, r: MeasurementRequest, noiseSeed: number, attempt: number, adcOverride?: number): number | 'overload' {
  const random = readingRandom(noiseSeed, r, attempt);
  if (r.quantity === 'scan_value') {
    const frozen = inst.scanNeedsEngineSpeed && r.engine === 'off';
    const sampled = adcOverride ?? trueValue(c, inst, frozen ? { ...r, connector: 'plugged', location: 'sensor_connector', jumpers: [], engine: 'running', sensorInput: undefined } : r);
    const lsb = inst.adcFullScale / (2 ** inst.adcBits - 1);
    const clamped = Math.min(inst.adcFullScale, Math.max(0, sampled));
    const jitter = frozen ? Math.round(2 * random() - 1) : 0;
    const code = Math.min(2 ** inst.adcBits - 1, Math.max(0, Math.round(clamped / lsb) + jitter));
    if (r.pid && TEMPERATURE_PIDS.has(r.pid)) return temperaturePid(c, r.pid, code * lsb, railVolts(c, frozen ? { ...r, connector: 'plugged', location: 'sensor_connector', jumpers: [], engine: 'running' } : r), noiseSeed);
    return Number((code * lsb).toFixed(3));
  }
  const v = trueValue(c, inst, r);
  if (r.quantity === 'ohms') {
    if (!Number.isFinite(v) || v * (1 + inst.ohmsGain) >= METER.maxOhms) return 'overload';
    return display(v, inst.ohmsGain, METER.ohms, random);
  }
  return display(v, inst.voltsGain, METER.volts, random);
}
