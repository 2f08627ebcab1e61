/**
 * Safety cautions as tagged data: each entry says in plain words what to watch for and decides itself whether a
 * measurement request needs it, on its own or on the vehicle and sensor at hand (the work context). Tree loading
 * adds any caution a test's request needs but the tree forgot; the test screen and the proof add the ones the
 * work context calls for. Wording is our own; always defer to the manufacturer's service information.
 */
import { sensorTerm } from '../sensors';
import { OTHER_CONNECTOR, type MeasurementRequest, type Point } from '../vocabulary';

/** What the bay knows about the work beyond the request: the sensor under test and the vehicle. */
export interface WorkContext {
  /** The circuit's sensor name (an SAE J1930 term first, e.g. "FTP"). */
  sensor?: string;
  /** The vehicle has a high-voltage system (hybrid or electric). */
  highVoltageSystem?: boolean;
}

export interface CautionKind {
  id: string;
  text: string;
  /** True when a test with this request, in this work context, must show the caution. */
  appliesTo(request: MeasurementRequest, context: WorkContext): boolean;
}

const touchesReference = (request: MeasurementRequest) =>
  request.jumpers.some((j) => j.from === 'reference' || j.to === 'reference');
const GROUND_POINTS: readonly Point[] = ['ground', 'battery_negative', 'chassis_ground'];
const BATTERY_POSTS: readonly Point[] = ['battery_positive', 'battery_negative'];
const leadsOf = (r: MeasurementRequest): Point[] => [r.at, ...(r.against ? [r.against] : [])];
/** A lead on the module connector, or the module connector unplugged. */
const touchesModuleConnector = (r: MeasurementRequest) =>
  r.location === 'module_connector' || r.againstLocation === 'module_connector' || (OTHER_CONNECTOR[r.location] === 'module_connector' && r.otherConnector === 'unplugged');

export const CAUTION_KINDS: readonly CautionKind[] = [
  {
    id: 'engine_turning',
    text:
      'The engine will crank or run: work where the exhaust is ventilated or extracted, set the parking brake with the ' +
      'transmission in park or neutral, and keep hands, leads and clothing clear of belts and fans.',
    appliesTo: (r) => r.engine === 'cranking' || r.engine === 'running',
  },
  {
    id: 'fused_jumper_only',
    text: 'Use a fused jumper lead (or the resistor the test names) only; never bridge with bare wire.',
    appliesTo: (r) => r.jumpers.length > 0,
  },
  {
    id: 'signal_cavity_only',
    text:
      'Clip the jumper to the signal cavity only, checked against the wiring diagram: never join the 5 V reference to ' +
      'ground, it shorts the module\'s supply. Use a fused jumper or a resistor of 1 kΩ or more.',
    appliesTo: (r) => r.jumpers.some((j) => (j.from === 'signal' && GROUND_POINTS.includes(j.to)) || (j.to === 'signal' && GROUND_POINTS.includes(j.from))),
  },
  {
    id: 'no_sparks_at_battery',
    text:
      'A battery can give off explosive hydrogen: make and break clips at the battery posts with everything switched ' +
      'off, never bridge the posts, and keep sparks and flames away from the battery.',
    appliesTo: (r) =>
      leadsOf(r).includes('battery_positive') ||
      r.jumpers.some((j) => BATTERY_POSTS.includes(j.from) || BATTERY_POSTS.includes(j.to)) ||
      (r.quantity === 'amps' && leadsOf(r).some((p) => BATTERY_POSTS.includes(p))),
  },
  {
    id: 'fuel_vapour',
    text:
      'Fuel vapour at the tank: work with the engine off, away from sparks and flames, with the area ventilated and ' +
      'the filler cap on; unplug and plug the sensor without arcing and wipe up any spilled fuel.',
    appliesTo: (r, c) => r.sensor === 'tank' || (c.sensor !== undefined && (sensorTerm(c.sensor)?.term === 'FTP' || /fuel[\s_-]*tank/i.test(c.sensor))),
  },
  {
    id: 'high_voltage_system',
    text:
      'This vehicle has a high-voltage system (hybrid or electric): only people qualified for it may work on it. Follow ' +
      "the service information's procedure to disable the high-voltage system before any test, and never touch the " +
      'orange high-voltage cables or their connectors.',
    appliesTo: (_r, c) => c.highVoltageSystem === true,
  },
  {
    id: 'no_battery_on_reference',
    text: 'Never put battery voltage on the 5 V reference or on the signal wire: it can destroy the module.',
    appliesTo: (r) => touchesReference(r) || r.jumpers.some((j) => j.from === 'battery_positive' || j.to === 'battery_positive'),
  },
  {
    id: 'backprobe_gently',
    text: 'Back-probe along the wire at the rear of the connector without spreading, bending or forcing the terminals.',
    appliesTo: (r) => r.connector === 'backprobed' || (r.againstLocation !== undefined && r.otherConnector === 'backprobed'),
  },
  {
    id: 'sensor_pins',
    text:
      "On the sensor's own pins: hold the leads on the pin tips (or use adapters that fit them) without bending the " +
      'pins, and hold the sensor by its body, not its tip: the warmth of a hand moves a thermistor\'s resistance.',
    appliesTo: (r) => r.location === 'sensor_pins' || r.againstLocation === 'sensor_pins',
  },
  {
    id: 'module_connector',
    text:
      'At the module connector: key off, and wait as long as the service information asks before unplugging it (some ' +
      'modules stay awake after key off); probe its terminals only with test leads or adapters that fit them, never ' +
      'a probe forced into a cavity.',
    appliesTo: (r) => touchesModuleConnector(r),
  },
  {
    id: 'ohms_unpowered',
    text:
      'Ohms checks only with the key off and the circuit unpowered; never use an ohmmeter on airbag (supplemental ' +
      'restraint) circuits.',
    appliesTo: (r) => r.quantity === 'ohms',
  },
  {
    id: 'unplug_key_off',
    text: 'Turn the key off before unplugging or plugging a connector; check the terminals for corrosion or spread pins.',
    appliesTo: (r) => r.connector === 'unplugged' || r.otherConnector === 'unplugged',
  },
  {
    id: 'service_information',
    text: "Follow the manufacturer's service information for this vehicle where it differs from these steps.",
    appliesTo: () => true,
  },
];

const BY_ID = new Map(CAUTION_KINDS.map((c) => [c.id, c]));

export function cautionKind(id: string): CautionKind | undefined {
  return BY_ID.get(id);
}

/** Ids of the catalogue cautions a request needs (in this work context), in catalogue order. */
export function requiredCautions(request: MeasurementRequest, context: WorkContext = {}): string[] {
  return CAUTION_KINDS.filter((c) => c.appliesTo(request, context)).map((c) => c.id);
}

/** A test's cautions plus those the work context adds (the high-voltage caution first: it comes before any test). */
export function cautionsInContext<C extends { id: string; text: string }>(cautions: readonly C[], request: MeasurementRequest, context: WorkContext): Array<C | { id: string; text: string }> {
  const have = new Set(cautions.map((c) => c.id));
  const added = requiredCautions(request, context)
    .filter((id) => !have.has(id))
    .map((id) => ({ id, text: BY_ID.get(id)!.text }));
  const hv = added.filter((c) => c.id === 'high_voltage_system');
  return [...hv, ...cautions, ...added.filter((c) => c.id !== 'high_voltage_system')];
}
