/**
 * Fault behaviours keyed by fault kind: each validates itself against the circuit and applies itself to the
 * netlist. Wire faults attach at the middle of the wire; an open removes the module-side half, so a short injected
 * with it sits on the sensor side of the break.
 */
import { checkFinite, checkResistance, describe, finding, joinPath, type Finding } from '../calc/findings';
import { BATTERY_POSITIVE_NODE, CHASSIS_NODE, ADC_NODE, MODULE_GROUND_NODE, contactId, wireHalfId, wireNode } from './build';
import { Netlist } from './netlist';
import { sensorBehaviour } from './sensors';
import {
  MODULE_INTERNAL_VARIANTS,
  SENSOR_INTERNAL_VARIANTS,
  WIRE_ROLES,
  type CircuitSpec,
  type FaultKind,
  type FaultSpec,
  type ModuleInternalVariant,
  type WireRole,
} from './types';

/** Default resistances of the fault paths, Ω. */
export const FAULT_DEFAULT_OHMS = { short_to_ground: 0.01, short_to_voltage: 0.05, short_between: 0.01, weak_regulator: 500 } as const;

interface FaultBehaviour<F extends FaultSpec> {
  validate(fault: F, circuit: CircuitSpec, path: string): Finding[];
  apply(netlist: Netlist, fault: F, circuit: CircuitSpec, path: string): Finding[];
}

function checkWire(wire: unknown, circuit: CircuitSpec, path: string): Finding[] {
  if (!WIRE_ROLES.includes(wire as WireRole)) {
    return [finding('fault.unknown_wire', path, `Expected one of ${WIRE_ROLES.join(', ')}, got ${describe(wire)}.`)];
  }
  if (!circuit.wires.some((w) => w.role === wire)) {
    return [finding('fault.wire_not_in_circuit', path, `A ${circuit.kind} circuit has no ${String(wire)} wire.`)];
  }
  return [];
}

function checkOptionalOhms(ohms: unknown, path: string): Finding[] {
  return ohms === undefined ? [] : checkResistance(ohms, path, 'Fault resistance', true);
}

/** Puts a resistor from the middle of `wire` to `node`. */
function shortFrom(netlist: Netlist, wire: WireRole, node: string, ohms: number, stem: string): void {
  netlist.add({ id: netlist.uniqueId(`${stem}_${wire}`), kind: 'resistor', nodes: [wireNode.middle(wire), node], value: ohms, param: { key: `fault.${stem}.${wire}.ohms`, scale: 1 } });
}

const wireShort = (target: string, stem: 'short_to_ground' | 'short_to_voltage'): FaultBehaviour<Extract<FaultSpec, { kind: typeof stem }>> => ({
  validate: (f, c, path) => [...checkWire(f.wire, c, joinPath(path, 'wire')), ...checkOptionalOhms(f.ohms, joinPath(path, 'ohms'))],
  apply: (netlist, f) => (shortFrom(netlist, f.wire, target, f.ohms ?? FAULT_DEFAULT_OHMS[stem], stem), []),
});

const MODULE_VARIANTS: Record<ModuleInternalVariant, (netlist: Netlist, ohms: number | undefined, volts: number | undefined) => void> = {
  // 0 V unless a spread draws the few hundred millivolts a dead output may still leak.
  dead_regulator: (netlist) => {
    const reg = netlist.get('regulator');
    if (reg) {
      reg.value = 0;
      reg.param = { key: 'regulator.dead.volts', scale: 1 };
    }
  },
  weak_regulator: (netlist, ohms) => {
    const r = netlist.get('regulator_r');
    if (r) r.value = ohms ?? FAULT_DEFAULT_OHMS.weak_regulator;
  },
  // The converter loses the pin and reads module ground; the pin keeps its bias, so the wiring tests look good.
  dead_input: (netlist) => {
    netlist.remove('input_filter_r');
    netlist.add({ id: netlist.uniqueId('adc_dead_r'), kind: 'resistor', nodes: [ADC_NODE, MODULE_GROUND_NODE], value: 1000 });
  },
  // The converter holds one value (a failed multiplexer or reference inside the module); the pin keeps its bias.
  fixed_input: (netlist, _ohms, volts) => {
    netlist.remove('input_filter_r');
    netlist.add({ id: netlist.uniqueId('adc_fixed'), kind: 'vsource', nodes: [ADC_NODE, MODULE_GROUND_NODE], value: volts ?? 2.5, param: { key: 'module.input.volts', scale: 1 } });
  },
};

const FAULT_BEHAVIOURS: { [K in FaultKind]: FaultBehaviour<Extract<FaultSpec, { kind: K }>> } = {
  open: {
    validate: (f, c, path) => checkWire(f.wire, c, joinPath(path, 'wire')),
    apply: (netlist, f) => (netlist.remove(wireHalfId(f.wire, 'a')), []),
  },
  short_to_ground: wireShort(CHASSIS_NODE, 'short_to_ground'),
  short_to_voltage: wireShort(BATTERY_POSITIVE_NODE, 'short_to_voltage'),
  short_between: {
    validate(f, c, path) {
      if (!Array.isArray(f.wires) || f.wires.length !== 2) {
        return [finding('fault.two_wires_needed', joinPath(path, 'wires'), 'A short between wires names exactly two wires.')];
      }
      const found = [...f.wires.flatMap((w, i) => checkWire(w, c, joinPath(path, 'wires', i))), ...checkOptionalOhms(f.ohms, joinPath(path, 'ohms'))];
      if (!found.length && f.wires[0] === f.wires[1]) found.push(finding('fault.same_wire_twice', joinPath(path, 'wires', 1), 'A short between wires needs two different wires.'));
      return found;
    },
    apply: (netlist, f) => (shortFrom(netlist, f.wires[0], wireNode.middle(f.wires[1]), f.ohms ?? FAULT_DEFAULT_OHMS.short_between, `short_${f.wires[1]}`), []),
  },
  high_resistance: {
    validate: (f, c, path) => [...checkWire(f.wire, c, joinPath(path, 'wire')), ...checkResistance(f.ohms, joinPath(path, 'ohms'), 'Added resistance', true)],
    apply(netlist, f) {
      // In series at the middle of the wire: mid_w —R— (new node) —second half— sh_w.
      const half = netlist.get(wireHalfId(f.wire, 'b'))!;
      const node = netlist.uniqueId(`hr_${f.wire}`);
      const from = half.nodes[0]!;
      half.nodes = [node, half.nodes[1]!];
      netlist.add({ id: node, kind: 'resistor', nodes: [from, node], value: f.ohms, param: { key: `fault.series.${f.wire}.ohms`, scale: 1 } });
      return [];
    },
  },
  sensor_internal: {
    validate(f, _c, path) {
      if (!SENSOR_INTERNAL_VARIANTS.includes(f.variant)) {
        return [finding('fault.unknown_variant', joinPath(path, 'variant'), `Expected one of ${SENSOR_INTERNAL_VARIANTS.join(', ')}, got ${describe(f.variant)}.`)];
      }
      return f.value === undefined ? [] : checkFinite(f.value, joinPath(path, 'value'), 'Fault value');
    },
    apply: (netlist, f, c, path) => sensorBehaviour(c.sensor)!.applyInternal(netlist, c.sensor, f, path),
  },
  module_ground_resistance: {
    validate: (f, _c, path) => checkResistance(f.ohms, joinPath(path, 'ohms'), 'Module ground resistance', true),
    apply(netlist, f) {
      const r = netlist.get('module_ground_r');
      if (r) r.value = f.ohms;
      return [];
    },
  },
  poor_terminal: {
    validate(f, c, path) {
      const where = ['sensor_connector', 'module_connector'].includes(f.connector)
        ? []
        : [finding('fault.unknown_connector', joinPath(path, 'connector'), `Expected sensor_connector or module_connector, got ${describe(f.connector)}.`)];
      return [...where, ...checkWire(f.wire, c, joinPath(path, 'wire')), ...checkResistance(f.ohms, joinPath(path, 'ohms'), 'Terminal resistance', true)];
    },
    // Applied before the connector state: an unplugged connector removes the terminal pair with its fault.
    apply(netlist, f) {
      const pair = netlist.get(contactId[f.connector](f.wire));
      if (pair) pair.value = f.ohms;
      return [];
    },
  },
  module_internal: {
    validate(f, _c, path) {
      if (!MODULE_INTERNAL_VARIANTS.includes(f.variant)) {
        return [finding('fault.unknown_variant', joinPath(path, 'variant'), `Expected one of ${MODULE_INTERNAL_VARIANTS.join(', ')}, got ${describe(f.variant)}.`)];
      }
      return [...checkOptionalOhms(f.ohms, joinPath(path, 'ohms')), ...(f.volts === undefined ? [] : checkFinite(f.volts, joinPath(path, 'volts'), 'Fixed input volts'))];
    },
    apply: (netlist, f) => (MODULE_VARIANTS[f.variant](netlist, f.ohms, f.volts), []),
  },
};

function behaviourOf(fault: FaultSpec): FaultBehaviour<FaultSpec> | undefined {
  return (FAULT_BEHAVIOURS as Record<string, FaultBehaviour<FaultSpec> | undefined>)[fault?.kind];
}

/** Validates a fault list against a circuit. */
export function validateFaults(faults: unknown, circuit: CircuitSpec, path = 'faults'): Finding[] {
  if (!Array.isArray(faults)) return [finding('fault.not_a_list', path, 'Faults must be a list (empty for a healthy circuit).')];
  return faults.flatMap((fault: FaultSpec, i) => {
    const behaviour = behaviourOf(fault);
    const at = joinPath(path, i);
    if (!behaviour) {
      return [finding('fault.unknown_kind', joinPath(at, 'kind'), `Expected one of ${Object.keys(FAULT_BEHAVIOURS).join(', ')}, got ${describe(fault?.kind)}.`)];
    }
    return behaviour.validate(fault, circuit, at);
  });
}

/** Applies validated faults in order; returns findings for faults that mean nothing on this circuit. */
export function applyFaults(netlist: Netlist, faults: FaultSpec[], circuit: CircuitSpec, path = 'faults'): Finding[] {
  return faults.flatMap((fault, i) => behaviourOf(fault)!.apply(netlist, fault, circuit, joinPath(path, i)));
}
