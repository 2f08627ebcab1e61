/**
 * From circuit, faults and a measurement request to a predicted reading: validate, build the netlist, apply the
 * faults, set the connector at the probed location, clip on jumpers and meter, solve.
 */
import { CONNECTOR_OF, OTHER_CONNECTOR, type MeasurementRequest } from '../vocabulary';
import { finding, type Finding, type Result } from '../calc/findings';
import { buildNetlist, contactId, MODULE_GROUND_NODE, MODULE_PIN } from './build';
import { DEFAULT_METER } from './defaults';
import { applyFaults, validateFaults } from './faults';
import { attachJumpers } from './jumpers';
import { QUANTITY_BEHAVIOURS, pointNode, type Evaluator, type Leads } from './measure';
import { CompiledNetlist, Netlist, solveNodeVoltages } from './netlist';
import { sensorBehaviour } from './sensors';
import type { CircuitSpec, FaultSpec, MeterSpec, ReadingUnit } from './types';
import { validateCircuit, validateMeter, validateRequest } from './validate';

/** A netlist ready to solve for one reading, with what is needed to read the meter off it. */
export interface PreparedReading {
  /** The complete netlist (faults, connector state, jumpers, meter and leak resistors included). */
  netlist: Netlist;
  unit: ReadingUnit;
  leads?: Leads;
  meter: MeterSpec;
  request: MeasurementRequest;
  /** The circuit as read: its sensor's input moved when the request says so. */
  circuit: CircuitSpec;
}

/** The circuit with its sensor's input where the request puts it (moved, or at rest). */
export function circuitAsRead(circuit: CircuitSpec, request: MeasurementRequest): Result<CircuitSpec> {
  if (request.sensorInput !== 'moved') return { ok: true, value: circuit };
  const moved = sensorBehaviour(circuit.sensor)!.moved(circuit.sensor, request, 'request.sensorInput');
  return moved.ok ? { ok: true, value: { ...circuit, sensor: moved.value } } : moved;
}

/** Validates everything and builds the netlist for one reading. */
export function prepareReading(
  given: CircuitSpec,
  faults: FaultSpec[],
  request: MeasurementRequest,
  meter: MeterSpec = DEFAULT_METER,
): Result<PreparedReading> {
  const circuitFindings = validateCircuit(given);
  if (circuitFindings.length) return { ok: false, findings: circuitFindings };
  const found: Finding[] = [...validateMeter(meter), ...validateFaults(faults, given), ...validateRequest(request, given)];
  if (found.length) return { ok: false, findings: found };
  const quantity = QUANTITY_BEHAVIOURS[request.quantity];
  found.push(...quantity.check(request, 'request'));
  if (found.length) return { ok: false, findings: found };
  const asRead = circuitAsRead(given, request);
  if (!asRead.ok) return asRead;
  const circuit = asRead.value;

  const netlist = buildNetlist(circuit, request);
  found.push(...applyFaults(netlist, faults, circuit));
  if (found.length) return { ok: false, findings: found };
  const connectors = [[CONNECTOR_OF[request.location], request.connector], [OTHER_CONNECTOR[request.location], request.otherConnector]] as const;
  for (const [connector, state] of connectors) {
    if (state === 'unplugged') for (const wire of circuit.wires) netlist.remove(contactId[connector](wire.role));
  }
  attachJumpers(netlist, request.jumpers, request.location);
  const leads = quantity.needsLeads
    ? { at: pointNode(request.at, request.location), against: pointNode(request.against!, request.againstLocation ?? request.location) }
    : undefined;
  quantity.attach(netlist, leads, meter);
  netlist.addLeaks(leads ? [leads.at, leads.against] : []);
  limitRegulatorCurrent(netlist, circuit);
  return { ok: true, value: { netlist, unit: quantity.unit, leads, meter, request, circuit } };
}

/**
 * The 5 V output's current limit: solved once as a voltage source behind its output resistance; when that draws
 * more than the limit, the output becomes a current source of the limit (it sags until the load takes no more).
 * Decided at nominal values.
 */
function limitRegulatorCurrent(netlist: Netlist, circuit: CircuitSpec): void {
  const limit = circuit.module.regulator.currentLimitAmps;
  const source = netlist.get('regulator');
  const series = netlist.get('regulator_r');
  if (limit === undefined || !source || !series) return;
  const volts = solveNodeVoltages(netlist);
  if (!volts) return;
  const amps = (volts.get(series.nodes[0]!)! - volts.get(series.nodes[1]!)!) / series.value;
  if (amps <= limit) return;
  netlist.remove('regulator');
  netlist.remove('regulator_r');
  netlist.add({ id: 'regulator_limited', kind: 'isource', nodes: [MODULE_GROUND_NODE, MODULE_PIN.reference], value: limit });
}

/** The fast evaluator of a prepared reading on its compiled netlist, after the checks that need a solution. */
export function evaluatorFor(prepared: PreparedReading, compiled: CompiledNetlist = prepared.netlist.compile()): Result<Evaluator> {
  const quantity = QUANTITY_BEHAVIOURS[prepared.request.quantity];
  const solvedFindings = prepared.leads && quantity.checkSolved ? quantity.checkSolved(compiled, prepared.leads, 'request') : [];
  if (solvedFindings.length) return { ok: false, findings: solvedFindings };
  return { ok: true, value: quantity.evaluator(compiled, prepared.leads, prepared.meter) };
}

export type PredictedReading =
  | { ok: true; value: number; unit: ReadingUnit; overload?: boolean }
  | { ok: false; findings: Finding[] };

/**
 * The reading a meter (or the scan tool) would show, nominal values, no meter error. Ohms beyond the meter's range
 * come back as `value: Infinity, overload: true`.
 */
export function predictReading(
  circuit: CircuitSpec,
  faults: FaultSpec[],
  request: MeasurementRequest,
  meter: MeterSpec = DEFAULT_METER,
): PredictedReading {
  const prepared = prepareReading(circuit, faults, request, meter);
  if (!prepared.ok) return prepared;
  const evaluator = evaluatorFor(prepared.value);
  if (!evaluator.ok) return evaluator;
  const value = evaluator.value();
  if (Number.isNaN(value)) {
    return { ok: false, findings: [finding('circuit.unsolvable', 'faults', 'The circuit with these faults and jumpers has no unique solution (a loop of ideal sources).')] };
  }
  return Number.isFinite(value) ? { ok: true, value, unit: prepared.value.unit } : { ok: true, value, unit: prepared.value.unit, overload: true };
}

/** The complete netlist for one reading (what `predictReading` solves), e.g. for `toSpice`. */
export function circuitNetlist(circuit: CircuitSpec, faults: FaultSpec[], request: MeasurementRequest, meter?: MeterSpec): Result<Netlist> {
  const prepared = prepareReading(circuit, faults, request, meter);
  return prepared.ok ? { ok: true, value: prepared.value.netlist } : prepared;
}
