/**
 * Input validation into coded, path-addressed findings: circuit specs, meters and measurement requests.
 */
import {
  CIRCUIT_KINDS,
  CONNECTOR_STATES,
  ENGINE_STATES,
  JUMPER_VIA_KINDS,
  KEY_STATES,
  LOCATIONS,
  POINTS,
  QUANTITIES,
  SENSOR_INPUTS,
  type CircuitKind,
  type MeasurementRequest,
  type Point,
} from '../vocabulary';
import { checkFinite, checkRange, checkResistance, describe, finding, joinPath, type Finding } from '../calc/findings';
import { sensorPinsProblems } from '../sensor-pins';
import { validateJumperVia } from './jumpers';
import { sensorBehaviour } from './sensors';
import { WIRE_ROLES, type CircuitSpec, type MeterSpec, type SensorKind, type WireRole } from './types';

/** What each circuit kind needs: its wires (each exactly once) and the sensors it may carry. */
export const CIRCUIT_LAYOUTS: Record<CircuitKind, { wires: readonly WireRole[]; sensors: readonly SensorKind[] }> = {
  three_wire_5v: { wires: ['reference', 'signal', 'ground'], sensors: ['potentiometer', 'pressure'] },
  two_wire_thermistor: { wires: ['signal', 'ground'], sensors: ['thermistor'] },
};

function oneOf<T extends string>(value: unknown, allowed: readonly T[], path: string, code: string): Finding[] {
  return allowed.includes(value as T) ? [] : [finding(code, path, `Expected one of ${allowed.join(', ')}, got ${describe(value)}.`)];
}

function validateWires(circuit: CircuitSpec): Finding[] {
  if (!Array.isArray(circuit.wires)) return [finding('circuit.wires_not_a_list', 'circuit.wires', 'Wires must be a list.')];
  const layout = CIRCUIT_LAYOUTS[circuit.kind];
  const found: Finding[] = [];
  const seen = new Set<string>();
  circuit.wires.forEach((wire, i) => {
    const path = joinPath('circuit.wires', i);
    found.push(...oneOf(wire?.role, WIRE_ROLES, joinPath(path, 'role'), 'circuit.unknown_wire_role'));
    if (WIRE_ROLES.includes(wire?.role) && !layout.wires.includes(wire.role)) {
      found.push(finding('circuit.wire_not_in_kind', joinPath(path, 'role'), `A ${circuit.kind} circuit has no ${wire.role} wire.`));
    }
    if (seen.has(wire?.role)) found.push(finding('circuit.duplicate_wire', joinPath(path, 'role'), `The ${wire.role} wire is listed twice.`));
    seen.add(wire?.role);
    found.push(...checkResistance(wire?.ohms, joinPath(path, 'ohms'), 'Wire resistance', true));
  });
  for (const role of layout.wires) {
    if (!seen.has(role)) found.push(finding('circuit.missing_wire', 'circuit.wires', `A ${circuit.kind} circuit needs a ${role} wire.`));
  }
  return found;
}

/** Validates a circuit spec; the paths start at `circuit`. */
export function validateCircuit(circuit: CircuitSpec): Finding[] {
  if (!circuit || typeof circuit !== 'object') return [finding('circuit.missing', 'circuit', 'A circuit spec is required.')];
  const kind = oneOf(circuit.kind, CIRCUIT_KINDS, 'circuit.kind', 'circuit.unknown_kind');
  if (kind.length) return kind;
  const m = circuit.module;
  const reg = m?.regulator;
  const b = circuit.battery;
  const found: Finding[] = [
    ...validateWires(circuit),
    ...checkFinite(b?.keyOffVolts, 'circuit.battery.keyOffVolts', 'Battery voltage (key off)'),
    ...ENGINE_STATES.flatMap((e) => checkFinite(b?.volts?.[e], `circuit.battery.volts.${e}`, `Battery voltage (engine ${e})`)),
    ...checkResistance(b?.internalOhms, 'circuit.battery.internalOhms', 'Battery internal resistance', true),
    ...checkFinite(reg?.volts, 'circuit.module.regulator.volts', 'Regulator voltage'),
    ...checkResistance(reg?.outputOhms, 'circuit.module.regulator.outputOhms', 'Regulator output resistance', true),
    ...checkResistance(reg?.offOhms, 'circuit.module.regulator.offOhms', 'Regulator off-state resistance', true),
    ...checkFinite(reg?.minInputVolts, 'circuit.module.regulator.minInputVolts', 'Regulator drop-out voltage'),
    ...checkResistance(m?.inputFilterOhms, 'circuit.module.inputFilterOhms', 'Input filter resistance', true),
    ...checkResistance(m?.groundOhms, 'circuit.module.groundOhms', 'Module ground resistance', true),
    ...checkResistance(m?.sensorGroundOhms, 'circuit.module.sensorGroundOhms', 'Sensor-ground resistance', true),
    ...(m?.supplyAmps === undefined ? [] : checkRange(m.supplyAmps, 'circuit.module.supplyAmps', 'Module supply current', 0, 20)),
    ...(reg?.currentLimitAmps === undefined ? [] : checkRange(reg.currentLimitAmps, 'circuit.module.regulator.currentLimitAmps', 'Regulator current limit', 1e-3, 5)),
    ...checkResistance(circuit.contactOhms, 'circuit.contactOhms', 'Contact resistance', true),
    ...checkResistance(circuit.chassisGroundOhms, 'circuit.chassisGroundOhms', 'Chassis ground resistance', true),
  ];
  const bias = m?.bias;
  found.push(...oneOf(bias?.kind, ['pull_up', 'pull_down', 'none'] as const, 'circuit.module.bias.kind', 'circuit.unknown_bias'));
  if (bias && bias.kind !== 'none' && (bias.kind === 'pull_up' || bias.kind === 'pull_down')) {
    found.push(...checkResistance(bias.ohms, 'circuit.module.bias.ohms', 'Bias resistance', true));
  }
  const behaviour = sensorBehaviour(circuit.sensor);
  if (!behaviour) {
    found.push(finding('circuit.unknown_sensor', 'circuit.sensor.kind', `Expected one of potentiometer, pressure, thermistor, got ${describe(circuit.sensor?.kind)}.`));
  } else if (!CIRCUIT_LAYOUTS[circuit.kind].sensors.includes(circuit.sensor.kind)) {
    found.push(finding('circuit.sensor_not_in_kind', 'circuit.sensor.kind', `A ${circuit.kind} circuit cannot carry a ${circuit.sensor.kind} sensor.`));
  } else {
    found.push(...behaviour.validate(circuit.sensor, 'circuit.sensor'));
  }
  return found;
}

/** Validates a meter spec; the paths start at `meter`. A 0 Ω meter input is refused. */
export function validateMeter(meter: MeterSpec): Finding[] {
  if (!meter || typeof meter !== 'object') return [finding('meter.missing', 'meter', 'A meter spec is required.')];
  const found = [
    ...checkResistance(meter.inputOhms, 'meter.inputOhms', 'Meter input resistance', true),
    ...checkResistance(meter.shuntOhms, 'meter.shuntOhms', 'Meter shunt resistance', true),
    ...checkResistance(meter.maxOhms, 'meter.maxOhms', 'Meter ohms range', true),
    ...checkFinite(meter.ohmsTestAmps, 'meter.ohmsTestAmps', 'Ohms test current'),
    ...checkFinite(meter.counts, 'meter.counts', 'Display counts'),
  ];
  if (!found.length && meter.ohmsTestAmps <= 0) found.push(finding('meter.test_current_not_positive', 'meter.ohmsTestAmps', 'The ohms test current must be positive.'));
  if (!found.length && meter.counts < 1) found.push(finding('meter.counts_too_low', 'meter.counts', 'Display counts must be at least 1.'));
  for (const q of ['dc_volts', 'ohms', 'amps'] as const) {
    const a = meter.accuracy?.[q];
    found.push(...checkFinite(a?.percent, `meter.accuracy.${q}.percent`, 'Accuracy percent'));
    found.push(...checkFinite(a?.digits, `meter.accuracy.${q}.digits`, 'Accuracy digits'));
  }
  return found;
}

function validatePoint(point: unknown, circuit: CircuitSpec, path: string): Finding[] {
  const known = oneOf(point, POINTS, path, 'request.unknown_point');
  if (known.length) return known;
  const p = point as Point;
  if (WIRE_ROLES.includes(p as WireRole) && !CIRCUIT_LAYOUTS[circuit.kind].wires.includes(p as WireRole)) {
    return [finding('request.point_not_in_circuit', path, `A ${circuit.kind} circuit has no ${p} wire.`)];
  }
  return [];
}

/** Validates a measurement request against a circuit; paths start at `request`. */
export function validateRequest(request: MeasurementRequest, circuit: CircuitSpec, path = 'request'): Finding[] {
  if (!request || typeof request !== 'object') return [finding('request.missing', path, 'A measurement request is required.')];
  const found = [
    ...oneOf(request.quantity, QUANTITIES, joinPath(path, 'quantity'), 'request.unknown_quantity'),
    ...oneOf(request.location, LOCATIONS, joinPath(path, 'location'), 'request.unknown_location'),
    ...oneOf(request.connector, CONNECTOR_STATES, joinPath(path, 'connector'), 'request.unknown_connector_state'),
    ...(request.againstLocation === undefined ? [] : oneOf(request.againstLocation, LOCATIONS, joinPath(path, 'againstLocation'), 'request.unknown_location')),
    ...(request.otherConnector === undefined ? [] : oneOf(request.otherConnector, CONNECTOR_STATES, joinPath(path, 'otherConnector'), 'request.unknown_connector_state')),
    ...oneOf(request.key, KEY_STATES, joinPath(path, 'key'), 'request.unknown_key_state'),
    ...oneOf(request.engine, ENGINE_STATES, joinPath(path, 'engine'), 'request.unknown_engine_state'),
    ...sensorPinsProblems(request).map((p) => finding(p.code, joinPath(path, p.field), `${p.message.replace(/^./, (c) => c.toUpperCase())}.`)),
    ...(request.sensorInput === undefined ? [] : oneOf(request.sensorInput, SENSOR_INPUTS, joinPath(path, 'sensorInput'), 'request.unknown_sensor_input')),
  ];
  if (request.key === 'off' && request.engine !== 'off' && ENGINE_STATES.includes(request.engine)) {
    found.push(finding('request.engine_without_key', joinPath(path, 'engine'), `The engine cannot be ${request.engine} with the key off.`));
  }
  if (request.quantity !== 'scan_value' && QUANTITIES.includes(request.quantity)) {
    found.push(...validatePoint(request.at, circuit, joinPath(path, 'at')));
    found.push(...validatePoint(request.against, circuit, joinPath(path, 'against')));
    if (request.at !== undefined && request.at === request.against && (request.againstLocation ?? request.location) === request.location) {
      found.push(finding('request.same_point_twice', joinPath(path, 'against'), 'The two leads must be on different points.'));
    }
  }
  if (!Array.isArray(request.jumpers)) {
    found.push(finding('request.jumpers_not_a_list', joinPath(path, 'jumpers'), 'Jumpers must be a list (empty when none).'));
    return found;
  }
  request.jumpers.forEach((j, i) => {
    const jp = joinPath(path, 'jumpers', i);
    found.push(...validatePoint(j?.from, circuit, joinPath(jp, 'from')), ...validatePoint(j?.to, circuit, joinPath(jp, 'to')));
    if (j?.from !== undefined && j.from === j.to) found.push(finding('request.jumper_to_itself', joinPath(jp, 'to'), 'A jumper must join two different points.'));
    const via = j?.via;
    const kind = oneOf(via?.kind, JUMPER_VIA_KINDS, joinPath(jp, 'via', 'kind'), 'request.unknown_jumper_kind');
    found.push(...(kind.length ? kind : validateJumperVia(via, joinPath(jp, 'via'))));
  });
  return found;
}
