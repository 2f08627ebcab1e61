/**
 * The measurement vocabulary shared by every part of Tracebay: what a technician measured, where, and under
 * which conditions. The HTTP layer, the circuit model and the fault trees all speak it, so a test's `request`
 * can be posted back as a measurement unchanged.
 */

export const QUANTITIES = ['dc_volts', 'ohms', 'amps', 'scan_value'] as const;
export type Quantity = (typeof QUANTITIES)[number];

/** Probe points: the three sensor-circuit wires and the vehicle's fixed references. */
export const POINTS = ['reference', 'signal', 'ground', 'battery_negative', 'battery_positive', 'chassis_ground'] as const;
export type Point = (typeof POINTS)[number];

/**
 * Where the first lead goes: the harness side of the sensor or module connector, or `sensor_pins`, the sensor's own
 * terminals with the sensor unplugged (the component alone: no harness, no module).
 */
export const LOCATIONS = ['sensor_connector', 'module_connector', 'sensor_pins'] as const;
export type Location = (typeof LOCATIONS)[number];
/** The harness connectors a second lead can reach at the far end of a wire. */
export type HarnessLocation = Exclude<Location, 'sensor_pins'>;
/** The physical connector each location's `connector` state describes (the sensor's pins are behind the sensor connector). */
export const CONNECTOR_OF: Record<Location, HarnessLocation> = {
  sensor_connector: 'sensor_connector',
  module_connector: 'module_connector',
  sensor_pins: 'sensor_connector',
};
/** The connector that is not the one at `location` (its state is `otherConnector`). */
export const OTHER_CONNECTOR: Record<Location, HarnessLocation> = {
  sensor_connector: 'module_connector',
  module_connector: 'sensor_connector',
  sensor_pins: 'module_connector',
};

export const CONNECTOR_STATES = ['plugged', 'unplugged', 'backprobed'] as const;
export type ConnectorState = (typeof CONNECTOR_STATES)[number];

export const KEY_STATES = ['off', 'on'] as const;
export type KeyState = (typeof KEY_STATES)[number];

export const ENGINE_STATES = ['off', 'cranking', 'running'] as const;
export type EngineState = (typeof ENGINE_STATES)[number];

/**
 * What the sensor senses while the reading is taken: left at rest (throttle closed, pedal released, engine stopped),
 * or moved to the other end of its range and held there (throttle or pedal pressed fully, key on engine off; for a
 * manifold pressure sensor, the engine running at idle gives manifold vacuum). Absent: at rest.
 */
export const SENSOR_INPUTS = ['at_rest', 'moved'] as const;
export type SensorInput = (typeof SENSOR_INPUTS)[number];

/** What to do with the sensor's input, in plain words for the bay and the proof (nothing when it stays at rest). */
export function sensorInputWords(request: Pick<MeasurementRequest, 'sensorInput' | 'engine'>): string | undefined {
  if (request.sensorInput !== 'moved') return undefined;
  return request.engine === 'running' ? 'engine running at idle (manifold vacuum)' : 'press the throttle fully and hold';
}

/** What a jumper carries: a fused wire, a resistor of given ohms, or a variable voltage source of given volts. */
export type JumperVia =
  | { kind: 'fused_jumper' }
  | { kind: 'resistor'; ohms: number }
  | { kind: 'voltage_source'; volts: number };
export const JUMPER_VIA_KINDS = ['fused_jumper', 'resistor', 'voltage_source'] as const;

export interface Jumper {
  from: Point;
  to: Point;
  via: JumperVia;
}

/** Where the leads go and in which state the vehicle is: everything but the value. */
export interface MeasurementRequest {
  quantity: Quantity;
  at: Point;
  /** Second lead; absent for `scan_value` (read from the scan tool). */
  against?: Point;
  /** Where the first lead, and any jumper, go; `connector` is that connector's state. */
  location: Location;
  connector: ConnectorState;
  /**
   * A lead at each end: the connector the second lead is on when it is not `location` (a wire lead only), e.g. end-to-end
   * continuity or the voltage drop along a wire. Absent: the same connector as the first lead.
   */
  againstLocation?: Location;
  /** State of the other connector (the one that is not `location`); absent: plugged. */
  otherConnector?: ConnectorState;
  key: KeyState;
  engine: EngineState;
  /** The sensor's input while reading (see SENSOR_INPUTS); absent: at rest. */
  sensorInput?: SensorInput;
  jumpers: Jumper[];
  /** For `scan_value`: the parameter read, e.g. an SAE J1979 PID such as "11" or a free name. */
  pid?: string;
  /** On a shared 5 V reference: which sensor's connector the reading concerns, or "all". */
  sensor?: string;
}

export const PHASES = ['diagnosis', 'verification'] as const;
export type Phase = (typeof PHASES)[number];

/** Default input resistance of a digital meter on DC volts (the usual 10 MΩ). */
export const DEFAULT_METER_OHMS = 10_000_000;

/** Circuits the circuit model solves: one sensor, its wires and its module input. */
export const CIRCUIT_KINDS = ['three_wire_5v', 'two_wire_thermistor'] as const;
export type CircuitKind = (typeof CIRCUIT_KINDS)[number];

/** What a technician can put under test: a single sensor circuit, or one 5 V reference shared by several sensors. */
export const CIRCUIT_UNDER_TEST_KINDS = [...CIRCUIT_KINDS, 'shared_5v_reference'] as const;
export type CircuitUnderTestKind = (typeof CIRCUIT_UNDER_TEST_KINDS)[number];

export const CAVITY_ROLES = ['reference', 'signal', 'ground', 'unknown'] as const;
export type CavityRole = (typeof CAVITY_ROLES)[number];
