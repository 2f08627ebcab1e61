/**
 * One diagnosis across a repair order whose circuits share a 5 V reference: which readings of the member circuits
 * answer the shared-reference tree's tests, when the circuits together point at their common reference, and the
 * order-wide ranking and next test. Pure: circuits, readings and per-circuit diagnoses in, the order view out.
 */
import type { MeasurementRequest } from '../vocabulary';
import { loadingCause, sharedReferenceTreeFor } from './shared-reference-tree';
import type { Tree } from './tree-model';

/** Causes of a single three-wire circuit that mean its 5 V reference is pulled down or missing. */
export const REFERENCE_CAUSES = ['reference_open', 'reference_short_ground', 'reference_supply_failed'] as const;
/** A circuit points at its reference when these causes together hold at least this much (common practice, no source). */
export const POINTS_AT_REFERENCE = 0.5;

interface Ranked {
  id: string;
  label: string;
  part: string;
  probability: number;
}

/** What the order view needs of a per-circuit (or per-group) diagnosis. */
export interface DiagnosisSummary {
  status: 'testing' | 'concluded' | 'recheck' | 'crank_and_reread' | 'exhausted';
  ranked: Ranked[];
  nextTest: { id: string; label: string; request: MeasurementRequest } | null;
}

export interface OrderCircuit {
  id: string;
  label: string;
  sensor: string;
  kind: string;
}

/** The tree's sensor id of the k-th circuit of a group (`c1`, `c2`, …): ids of our own, stable for the group. */
export const groupSensorId = (k: number) => `c${k + 1}`;

/** The generated tree of a group of circuits, in the group's order. */
export function groupTree(circuits: OrderCircuit[]): Tree {
  return sharedReferenceTreeFor(
    circuits.map((c, k) => ({ id: groupSensorId(k), label: `${c.label} sensor`.replace(/ sensor sensor$/i, ' sensor') })),
    { id: 'order-shared-reference', title: `Shared 5 V reference of ${circuits.map((c) => c.label).join(', ')}` },
  );
}

/** Below this the reference reads pulled down (the shared-reference tree's "low" outcome; common practice, no source). */
export const REFERENCE_LOW_VOLTS = 4.5;

/**
 * A circuit points at its reference when its own diagnosis puts most weight on reference causes, or its latest
 * reading of the reference, key on and plugged, is pulled down (a single-circuit tree has no cause for a rail
 * another sensor drags down, so it may call that reading "not modelled").
 */
export function pointsAtReference(d: DiagnosisSummary, referenceVolts?: number): boolean {
  const mass = d.ranked.filter((h) => (REFERENCE_CAUSES as readonly string[]).includes(h.id)).reduce((a, h) => a + h.probability, 0);
  return mass >= POINTS_AT_REFERENCE || (referenceVolts !== undefined && referenceVolts < REFERENCE_LOW_VOLTS);
}

/** A key-on reading of the reference at the sensor with everything plugged (what says the rail is pulled down). */
export function isPluggedReferenceReading(r: MeasurementRequest): boolean {
  return (
    r.quantity === 'dc_volts' && r.at === 'reference' && (r.against === 'battery_negative' || r.against === 'ground' || r.against === 'chassis_ground') &&
    r.location === 'sensor_connector' && r.connector !== 'unplugged' && (r.otherConnector ?? 'plugged') !== 'unplugged' && r.key === 'on' && r.engine === 'off' && r.jumpers.length === 0
  );
}

/**
 * The test of a group tree a member circuit's reading answers, or undefined: the reference against battery negative
 * at that circuit's sensor connector, no jumpers, the module connector plugged; key on, engine off for volts
 * (plugged, at the group's first circuit; unplugged: only this sensor, or `sensor: "all"`), key off with
 * `sensor: "all"` for ohms.
 */
export function groupTestOf(tree: Tree, memberIndex: number, r: MeasurementRequest): string | undefined {
  if (r.at !== 'reference' || r.against !== 'battery_negative' || r.location !== 'sensor_connector' || r.jumpers.length > 0) return undefined;
  if (r.againstLocation && r.againstLocation !== r.location) return undefined;
  if (r.otherConnector && r.otherConnector !== 'plugged' && r.otherConnector !== 'backprobed') return undefined;
  const all = r.sensor === 'all';
  let id: string | undefined;
  if (r.quantity === 'ohms' && r.key === 'off' && r.connector === 'unplugged' && all) id = 'reference_ohms_all_unplugged';
  else if (r.quantity === 'dc_volts' && r.key === 'on' && r.engine === 'off') {
    // The tree reads the plugged rail at its first sensor; the same reading elsewhere differs by the branch drops.
    if (r.connector !== 'unplugged') id = memberIndex === 0 ? 'reference_plugged' : undefined;
    else id = all ? 'reference_all_unplugged' : `reference_${groupSensorId(memberIndex)}_unplugged`;
  }
  return id && tree.tests.some((t) => t.id === id) ? id : undefined;
}

/** The circuit a group test is taken at, and the `sensor` a reading of it is posted with. */
export function whereGroupTestIsTaken(circuits: OrderCircuit[], request: MeasurementRequest): { circuit: OrderCircuit; sensor: string } {
  const k = circuits.findIndex((_, i) => groupSensorId(i) === request.sensor);
  const circuit = circuits[Math.max(0, k)]!;
  return { circuit, sensor: request.sensor === 'all' ? 'all' : circuit.sensor };
}

export interface GroupView {
  id: string;
  circuitIds: string[];
  active: boolean;
  why: string[];
}

/**
 * Whether the order view moves to a group's shared reference by itself: two or more of its circuits point at their
 * reference; or one does and the order holds a sensor reference-voltage code; or a shared-reference test was taken.
 */
export function groupActivation(memberDiagnoses: Array<{ circuit: OrderCircuit; diagnosis: DiagnosisSummary; referenceVolts?: number }>, referenceCodes: string[], groupReadings: number): { active: boolean; why: string[] } {
  const pointing = memberDiagnoses.filter((m) => pointsAtReference(m.diagnosis, m.referenceVolts));
  const why: string[] = [];
  if (pointing.length >= 2) why.push(`${pointing.length} circuits on this reference point at it: ${pointing.map((m) => m.circuit.label).join(', ')}`);
  else if (pointing.length === 1 && referenceCodes.length) why.push(`${pointing[0]!.circuit.label} points at its reference and the order holds ${referenceCodes.join(', ')} (a sensor reference-voltage code)`);
  if (groupReadings > 0) why.push(`${groupReadings} shared-reference reading${groupReadings === 1 ? '' : 's'} taken`);
  return { active: why.length > 0, why };
}

/** The group's causes with the circuit a sensor cause names (a sensor dragging the reference is that circuit's sensor). */
export function groupCauseCircuit(circuits: OrderCircuit[], causeId: string): string | null {
  const k = circuits.findIndex((_, i) => loadingCause(groupSensorId(i)) === causeId);
  return k >= 0 ? circuits[k]!.id : null;
}
