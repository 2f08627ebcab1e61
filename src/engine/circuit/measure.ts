/**
 * The meter as part of the circuit, one behaviour per quantity: volts puts its input resistance across the leads,
 * amps a shunt, ohms injects a test current into the unpowered circuit (R = V/I), and a scan value reads the
 * module's own converter node (clamped and quantised as its converter reads it). Leads and jumpers land on the harness side of the connector at `location`: with it
 * unplugged they touch only the harness (at `sensor_pins`, on the unplugged sensor's own pins: the sensor alone); `plugged` and `backprobed` are electrically the same (mated connector,
 * leads on the terminals). The other connector is always mated.
 */
import type { Location, MeasurementRequest, Point, Quantity } from '../vocabulary';
import { finding, joinPath, type Finding } from '../calc/findings';
import { adcReading } from './adc';
import { ADC_NODE, BATTERY_POSITIVE_NODE, CHASSIS_NODE, MODULE_GROUND_NODE, wireNode } from './build';
import { CompiledNetlist, GROUND_NODE, Netlist } from './netlist';
import type { MeterAccuracy, MeterSpec, ReadingUnit, WireRole } from './types';

/** Above this open-circuit voltage between the leads an ohms reading means nothing, V. */
export const OHMS_POWERED_LIMIT_VOLTS = 1e-3;
/** A fused jumper lead: fuse plus lead resistance, Ω. */
export const FUSED_JUMPER_OHMS = 0.05;
/** Internal resistance of a bench voltage source on a jumper, Ω. */
export const JUMPER_SOURCE_OHMS = 1;

export interface Leads {
  at: string;
  against: string;
}

/** One Monte Carlo-ready evaluation: params (aligned with the compiled netlist's keys) in, reading out. */
export type Evaluator = (params?: Float64Array) => number;

const FIXED_POINTS: Partial<Record<Point, string>> = {
  battery_negative: GROUND_NODE,
  battery_positive: BATTERY_POSITIVE_NODE,
  chassis_ground: CHASSIS_NODE,
};

/** Where a lead on a wire's point lands at each location: the harness side of a connector, or the sensor's own pin. */
const LOCATION_NODE: Record<Location, (wire: WireRole) => string> = {
  sensor_connector: wireNode.sensorHarness,
  module_connector: wireNode.moduleHarness,
  sensor_pins: wireNode.sensorPin,
};

/** Node a lead or jumper clip on `point` touches at `location`. */
export function pointNode(point: Point, location: Location): string {
  return FIXED_POINTS[point] ?? LOCATION_NODE[location](point as WireRole);
}

const v = (x: Float64Array, i: number) => (i < 0 ? 0 : x[i]!);

interface QuantityBehaviour {
  unit: ReadingUnit;
  /** Which meter accuracy applies (none for a scan value). */
  accuracy(meter: MeterSpec): MeterAccuracy | undefined;
  /** Smallest display step, in the reading's unit. */
  minResolution: number;
  needsLeads: boolean;
  check(request: MeasurementRequest, path: string): Finding[];
  attach(netlist: Netlist, leads: Leads | undefined, meter: MeterSpec): void;
  evaluator(compiled: CompiledNetlist, leads: Leads | undefined, meter: MeterSpec): Evaluator;
  /** Checks needing the nominal solution (ohms on a powered circuit). */
  checkSolved?(compiled: CompiledNetlist, leads: Leads, path: string): Finding[];
}

function indices(compiled: CompiledNetlist, leads: Leads): [number, number] {
  return [compiled.index(leads.at)!, compiled.index(leads.against)!];
}

function voltsAcross(compiled: CompiledNetlist, leads: Leads): Evaluator {
  const [a, b] = indices(compiled, leads);
  const x = new Float64Array(compiled.size);
  return (params) => {
    if (!compiled.factor(params)) return Number.NaN;
    compiled.solveSources(x);
    return v(x, a) - v(x, b);
  };
}

export const QUANTITY_BEHAVIOURS: Record<Quantity, QuantityBehaviour> = {
  dc_volts: {
    unit: 'V',
    accuracy: (m) => m.accuracy.dc_volts,
    minResolution: 1e-4,
    needsLeads: true,
    check: () => [],
    attach: (netlist, leads, meter) => netlist.add({ id: 'meter', kind: 'resistor', nodes: [leads!.at, leads!.against], value: meter.inputOhms }),
    evaluator: (compiled, leads) => voltsAcross(compiled, leads!),
  },
  amps: {
    unit: 'A',
    accuracy: (m) => m.accuracy.amps,
    minResolution: 1e-5,
    needsLeads: true,
    check: () => [],
    attach: (netlist, leads, meter) => netlist.add({ id: 'meter', kind: 'resistor', nodes: [leads!.at, leads!.against], value: meter.shuntOhms }),
    evaluator(compiled, leads, meter) {
      const volts = voltsAcross(compiled, leads!);
      return (params) => volts(params) / meter.shuntOhms;
    },
  },
  ohms: {
    unit: 'ohm',
    accuracy: (m) => m.accuracy.ohms,
    minResolution: 0.1,
    needsLeads: true,
    check: (request, path) =>
      request.key === 'on'
        ? [finding('measurement.ohms_on_powered_circuit', joinPath(path, 'key'), 'An ohms reading with the key on measures a powered circuit and means nothing; turn the key off.')]
        : [],
    attach: () => undefined,
    evaluator(compiled, leads, meter) {
      const [a, b] = indices(compiled, leads!);
      const x = new Float64Array(compiled.size);
      return (params) => {
        if (!compiled.factor(params)) return Number.NaN;
        compiled.solveInjection(a, b, meter.ohmsTestAmps, x);
        const ohms = (v(x, a) - v(x, b)) / meter.ohmsTestAmps;
        return ohms > meter.maxOhms ? Number.POSITIVE_INFINITY : ohms;
      };
    },
    checkSolved(compiled, leads, path) {
      const [a, b] = indices(compiled, leads);
      const x = new Float64Array(compiled.size);
      if (!compiled.factor()) return [];
      compiled.solveSources(x);
      const open = v(x, a) - v(x, b);
      if (Math.abs(open) <= OHMS_POWERED_LIMIT_VOLTS) return [];
      return [
        finding(
          'measurement.ohms_on_powered_circuit',
          joinPath(path, 'at'),
          `The leads see ${open.toFixed(3)} V with the meter off: the circuit is powered there, so an ohms reading means nothing.`,
        ),
      ];
    },
  },
  scan_value: {
    unit: 'V',
    accuracy: () => undefined,
    minResolution: 1e-3,
    needsLeads: false,
    check: (request, path) =>
      request.key === 'on' ? [] : [finding('measurement.scan_needs_key_on', joinPath(path, 'key'), 'The module reports scan values only with the key on.')],
    attach: () => undefined,
    evaluator(compiled) {
      const adc = compiled.index(ADC_NODE)!;
      const ground = compiled.index(MODULE_GROUND_NODE)!;
      const x = new Float64Array(compiled.size);
      return (params) => {
        if (!compiled.factor(params)) return Number.NaN;
        compiled.solveSources(x);
        return adcReading(v(x, adc) - v(x, ground));
      };
    },
  },
};

/** Display resolution of an auto-ranging meter with `counts` counts for a reading of `value`. */
export function resolutionFor(value: number, counts: number, minResolution: number): number {
  if (!Number.isFinite(value) || value === 0) return minResolution;
  return Math.max(minResolution, 10 ** Math.ceil(Math.log10(Math.abs(value) / counts)));
}
