/**
 * Builds the netlist of a healthy circuit under given key/engine conditions.
 *
 * Node names (battery negative `bn` is the reference node):
 *   bp_i/bp battery (internal/terminal) · ch chassis · mg module ground · reg regulator source · m_reference the
 *   module's 5 V rail and reference pin · m_signal signal pin · adc the node the module reads · m_ground sensor-ground
 *   pin. Per wire w: mh_w harness side of the module connector, mid_w middle of the wire (where faults attach),
 *   sh_w harness side of the sensor connector, s_w sensor pin.
 */
import type { EngineState, KeyState } from '../vocabulary';
import { GROUND_NODE, Netlist } from './netlist';
import { sensorBehaviour } from './sensors';
import type { BiasSpec, CircuitSpec, WireRole } from './types';

export interface Conditions {
  key: KeyState;
  engine: EngineState;
}

export const MODULE_PIN: Record<WireRole, string> = { reference: 'm_reference', signal: 'm_signal', ground: 'm_ground' };
export const wireNode = {
  moduleHarness: (w: WireRole) => `mh_${w}`,
  middle: (w: WireRole) => `mid_${w}`,
  sensorHarness: (w: WireRole) => `sh_${w}`,
  sensorPin: (w: WireRole) => `s_${w}`,
};
/** Element ids of the mated terminal pairs of each connector. */
export const contactId = {
  module_connector: (w: WireRole) => `mc_${w}`,
  sensor_connector: (w: WireRole) => `sc_${w}`,
};
/** The module-side half of a wire (the half an open removes). */
export const wireHalfId = (w: WireRole, half: 'a' | 'b') => `wire_${w}_${half}`;

export const ADC_NODE = 'adc';
export const MODULE_GROUND_NODE = 'mg';
export const BATTERY_POSITIVE_NODE = 'bp';
export const CHASSIS_NODE = 'ch';

/** Battery terminal voltage for the conditions. */
export function batteryVolts(circuit: CircuitSpec, conditions: Conditions): number {
  return conditions.key === 'off' ? circuit.battery.keyOffVolts : circuit.battery.volts[conditions.engine];
}

/** The 5 V output of a regulator that has dropped out: the battery less its headroom, never above its set point. */
export function droppedOutVolts(reg: Pick<CircuitSpec['module']['regulator'], 'volts' | 'minInputVolts'>, battery: number): number {
  return Math.max(0, Math.min(reg.volts, battery - Math.max(0, reg.minInputVolts - reg.volts)));
}

const BIAS_BUILDERS: { [K in BiasSpec['kind']]: (netlist: Netlist, bias: Extract<BiasSpec, { kind: K }>) => void } = {
  pull_up: (netlist, bias) =>
    netlist.add({ id: 'bias_r', kind: 'resistor', nodes: [MODULE_PIN.reference, MODULE_PIN.signal], value: bias.ohms, param: { key: 'bias.ohms', scale: 1 } }),
  pull_down: (netlist, bias) =>
    netlist.add({ id: 'bias_r', kind: 'resistor', nodes: [MODULE_PIN.signal, MODULE_GROUND_NODE], value: bias.ohms, param: { key: 'bias.ohms', scale: 1 } }),
  none: () => undefined,
};

function buildModule(netlist: Netlist, circuit: CircuitSpec, conditions: Conditions): void {
  const { module } = circuit;
  const reg = module.regulator;
  const battery = batteryVolts(circuit, conditions);
  netlist.add({ id: 'module_ground_r', kind: 'resistor', nodes: [MODULE_GROUND_NODE, GROUND_NODE], value: module.groundOhms, param: { key: 'module.ground.ohms', scale: 1 } });
  if (conditions.key === 'on' && module.supplyAmps) {
    // The module's own draw from battery positive back through its ground strap.
    netlist.add({ id: 'module_supply_r', kind: 'resistor', nodes: [BATTERY_POSITIVE_NODE, MODULE_GROUND_NODE], value: battery / module.supplyAmps, param: { key: 'module.supply.ohms', scale: 1 } });
  }
  if (conditions.key === 'on') {
    // Regulates while the battery stays above its drop-out; cranking at ~10 V still gives 5 V. Below it the output
    // follows the battery less the headroom the regulator needs.
    const regulating = battery >= reg.minInputVolts;
    netlist.add({
      id: 'regulator',
      kind: 'vsource',
      nodes: ['reg', MODULE_GROUND_NODE],
      value: regulating ? reg.volts : droppedOutVolts(reg, battery),
      ...(regulating ? { param: { key: 'regulator.volts', scale: 1 } } : {}),
    });
    netlist.add({ id: 'regulator_r', kind: 'resistor', nodes: ['reg', MODULE_PIN.reference], value: reg.outputOhms });
  } else {
    netlist.add({ id: 'regulator_off_r', kind: 'resistor', nodes: [MODULE_PIN.reference, MODULE_GROUND_NODE], value: reg.offOhms, param: { key: 'regulator.off.ohms', scale: 1 } });
  }
  const bias = module.bias;
  (BIAS_BUILDERS[bias.kind] as (n: Netlist, b: BiasSpec) => void)(netlist, bias);
  netlist.add({ id: 'input_filter_r', kind: 'resistor', nodes: [MODULE_PIN.signal, ADC_NODE], value: module.inputFilterOhms });
  netlist.add({ id: 'sensor_ground_r', kind: 'resistor', nodes: [MODULE_PIN.ground, MODULE_GROUND_NODE], value: module.sensorGroundOhms });
}

function buildHarness(netlist: Netlist, circuit: CircuitSpec): void {
  for (const { role: w, ohms } of circuit.wires) {
    const wireParam = (half: number) => ({ key: `wire.${w}.ohms`, scale: half });
    netlist.add({ id: contactId.module_connector(w), kind: 'resistor', nodes: [MODULE_PIN[w], wireNode.moduleHarness(w)], value: circuit.contactOhms });
    netlist.add({ id: wireHalfId(w, 'a'), kind: 'resistor', nodes: [wireNode.moduleHarness(w), wireNode.middle(w)], value: ohms / 2, param: wireParam(0.5) });
    netlist.add({ id: wireHalfId(w, 'b'), kind: 'resistor', nodes: [wireNode.middle(w), wireNode.sensorHarness(w)], value: ohms / 2, param: wireParam(0.5) });
    netlist.add({ id: contactId.sensor_connector(w), kind: 'resistor', nodes: [wireNode.sensorHarness(w), wireNode.sensorPin(w)], value: circuit.contactOhms });
  }
}

/** The healthy circuit's netlist (no faults, connectors mated, no meter, no leaks yet). */
export function buildNetlist(circuit: CircuitSpec, conditions: Conditions): Netlist {
  const netlist = new Netlist();
  netlist.add({ id: 'battery', kind: 'vsource', nodes: ['bp_i', GROUND_NODE], value: batteryVolts(circuit, conditions), param: { key: 'battery.volts', scale: 1 } });
  netlist.add({ id: 'battery_r', kind: 'resistor', nodes: ['bp_i', BATTERY_POSITIVE_NODE], value: circuit.battery.internalOhms });
  netlist.add({ id: 'chassis_r', kind: 'resistor', nodes: [CHASSIS_NODE, GROUND_NODE], value: circuit.chassisGroundOhms, param: { key: 'chassis.ohms', scale: 1 } });
  buildModule(netlist, circuit, conditions);
  buildHarness(netlist, circuit);
  sensorBehaviour(circuit.sensor)!.build(netlist, circuit.sensor);
  return netlist;
}
