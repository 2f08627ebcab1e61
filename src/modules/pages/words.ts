/** The shared measurement vocabulary in plain words for the bay screens, and reading values formatted for people. */
import { formatValue, UNITS, unitsFor, type Unit } from '../../engine/units';
import { CONNECTOR_OF, OTHER_CONNECTOR, sensorInputWords, type MeasurementRequest, type Point, type Quantity } from '../../engine/vocabulary';

const POINT_WORDS: Record<Point, string> = {
  reference: '5 V reference wire',
  signal: 'signal wire',
  ground: 'sensor ground wire',
  battery_negative: 'battery negative post',
  battery_positive: 'battery positive post',
  chassis_ground: 'clean bare-metal chassis ground',
};

const QUANTITY_WORDS: Record<Quantity, string> = {
  dc_volts: 'DC volts',
  ohms: 'ohms',
  amps: 'amps',
  scan_value: 'scan-tool value',
};

const LOCATION_WORDS = { sensor_connector: 'at the sensor connector', module_connector: 'at the module connector' } as const;
/** The sensor's own pins: the leads go on the component, not on the harness. */
const PIN_WORDS: Partial<Record<Point, string>> = {
  reference: '5 V reference pin on the sensor itself',
  signal: 'signal pin on the sensor itself',
  ground: 'sensor ground pin on the sensor itself',
};
const SENSOR_PINS_WHERE = "Leads on the sensor's own pins, sensor unplugged: on the component itself, not the harness connector";
const CONNECTOR_NAMES = { sensor_connector: 'Sensor connector', module_connector: 'Module connector' } as const;
/** A scan-tool test reads what the module sees; the "location" is where the circuit is left (plugged in) for it. */
const SCAN_WHERE = 'Scan-tool test: no meter leads; read the value from the module through the diagnostic connector';
const CONNECTOR_WORDS = { plugged: 'plugged in', unplugged: 'unplugged', backprobed: 'plugged in, back-probed' } as const;
const ENGINE_WORDS = { off: 'stopped', cranking: 'cranking', running: 'running' } as const;

export const STATUS_WORDS: Record<string, string> = {
  open: 'Open',
  diagnosing: 'Diagnosing',
  repaired: 'Repaired, to verify',
  verified: 'Verified',
  closed: 'Closed',
};

export const DIAGNOSIS_STATUS_WORDS: Record<string, string> = {
  testing: 'Testing',
  concluded: 'Cause found',
  recheck: 'Measure again',
  crank_and_reread: 'Crank and read again',
  exhausted: 'Not proven',
};

export const VERDICT_WORDS: Record<string, string> = {
  counted: 'counted',
  indeterminate: 'between outcomes: measure again',
  not_in_tree: 'kept, not used by the diagnosis',
  superseded: 'corrected',
  verification: 'after the repair',
  before_repair: 'before the repair of this part',
  frozen_scan: 'scan value did not refresh: crank and read again',
  invalid: 'not readable by the diagnosis',
  paired: 'paired in a comparison: counted once, with the other reading',
  unpaired: 'half of a comparison: waiting for the other reading',
};

export const PART_WORDS: Record<string, string> = {
  reference: '5 V reference wire',
  signal: 'signal wire',
  ground: 'sensor ground wire',
  sensor: 'sensor',
  module: 'module',
  connector: 'connector',
  other: 'other',
  unknown: 'not modelled',
};

export function pointWords(point: Point, cavities: Record<string, string> = {}): string {
  const cavity = Object.entries(cavities).find(([, role]) => role === point)?.[0];
  return cavity ? `${POINT_WORDS[point]} (cavity ${cavity})` : POINT_WORDS[point];
}

export interface LeadWords {
  red: string;
  black: string | null;
  where: string;
}

/** Where the leads go, in words, naming the cavity when the circuit's cavity map says which it is. */
export function leads(request: MeasurementRequest, cavities: Record<string, string> = {}): LeadWords {
  if (request.location === 'sensor_pins' && request.quantity !== 'scan_value')
    return { red: PIN_WORDS[request.at] ?? POINT_WORDS[request.at], black: request.against ? (PIN_WORDS[request.against] ?? POINT_WORDS[request.against]) : null, where: SENSOR_PINS_WHERE };
  const where = LOCATION_WORDS[CONNECTOR_OF[request.location]];
  if (request.quantity === 'scan_value') {
    return { red: `Scan tool: read ${(request.pid ?? 'the parameter').replace(/_/g, ' ')} (the ${POINT_WORDS[request.at]})`, black: null, where: SCAN_WHERE };
  }
  const far = request.againstLocation && request.againstLocation !== request.location ? CONNECTOR_OF[request.againstLocation] : null;
  if (far && request.against)
    // A lead at each end of the harness: name both ends (the cavity map is the sensor connector's).
    return {
      red: `${request.location === 'sensor_connector' ? pointWords(request.at, cavities) : `${POINT_WORDS[request.at]}, its pin`} ${where}`,
      black: `${far === 'sensor_connector' ? pointWords(request.against, cavities) : `${POINT_WORDS[request.against]}, its pin`} ${LOCATION_WORDS[far]}`,
      where: 'A lead at each end of the harness: use a long test lead.',
    };
  return { red: pointWords(request.at, cavities), black: request.against ? pointWords(request.against, cavities) : null, where };
}

export interface ConditionWords {
  label: string;
  value: string;
}

export function conditions(request: MeasurementRequest): ConditionWords[] {
  const out: ConditionWords[] = [
    request.quantity === 'scan_value' ? { label: 'Tool', value: 'scan tool' } : { label: 'Meter', value: QUANTITY_WORDS[request.quantity] },
    { label: 'Key', value: request.key === 'on' ? 'ON' : 'OFF' },
    { label: 'Engine', value: ENGINE_WORDS[request.engine] },
    { label: 'Connector', value: CONNECTOR_WORDS[request.connector] },
  ];
  if (request.location === 'sensor_pins') out[3] = { label: 'Sensor', value: `${CONNECTOR_WORDS[request.connector]}, leads on its own pins` };
  if (request.otherConnector) {
    if (request.location !== 'sensor_pins') out[3] = { label: CONNECTOR_NAMES[CONNECTOR_OF[request.location]], value: CONNECTOR_WORDS[request.connector] };
    out.push({ label: CONNECTOR_NAMES[OTHER_CONNECTOR[request.location]], value: CONNECTOR_WORDS[request.otherConnector] });
  }
  const input = sensorInputWords(request);
  if (input) out.push({ label: 'Input', value: input });
  for (const j of request.jumpers) {
    const via = j.via.kind === 'fused_jumper' ? 'fused jumper' : j.via.kind === 'resistor' ? `${formatSi(j.via.ohms, 'Ω')} resistor` : `${j.via.volts} V source`;
    out.push({ label: 'Jumper', value: `${POINT_WORDS[j.from]} to ${POINT_WORDS[j.to]} with a ${via}` });
  }
  return out;
}

/** A one-line description of a reading's request, for lists. */
export function requestLine(request: MeasurementRequest, cavities: Record<string, string> = {}): string {
  const l = leads(request, cavities);
  const how = l.black ? `${l.red} to ${l.black}` : l.red;
  const bothEnds = request.againstLocation !== undefined && request.againstLocation !== request.location;
  const where = request.quantity === 'scan_value' ? 'scan-tool test' : bothEnds ? 'a lead at each end of the harness' : l.where;
  const first = request.location === 'sensor_pins' ? 'sensor' : CONNECTOR_NAMES[CONNECTOR_OF[request.location]].toLowerCase();
  const states = request.otherConnector
    ? `${first} ${CONNECTOR_WORDS[request.connector]}, ${CONNECTOR_NAMES[OTHER_CONNECTOR[request.location]].toLowerCase()} ${CONNECTOR_WORDS[request.otherConnector]}`
    : CONNECTOR_WORDS[request.connector];
  const input = sensorInputWords(request);
  return `${QUANTITY_WORDS[request.quantity]}: ${how}, ${where}, key ${request.key}, engine ${ENGINE_WORDS[request.engine]}, ${states}${input ? `, ${input}` : ''}`;
}

/** Units the number pad offers for a quantity (scan values: the common ones first). */
export function padUnits(quantity: Quantity): string[] {
  if (quantity === 'scan_value') return ['V', '%', 'kPa', '°C', '°F', 'rpm'];
  return [...unitsFor(quantity)];
}

/**
 * The one formatter of values for people: significant figures kept ("5.00 V", not "5 V") and the SI prefix that
 * reads best (11010 Ω → "11.0 kΩ", 0.0021 V → "2.10 mV"), through the engine's `formatValue` (NIST SP 811 spacing).
 */
export function formatSi(value: number | 'overload' | null | undefined, siUnit: string, digits = 3): string {
  if (value === 'overload' || value === null || value === undefined || !Number.isFinite(value)) return 'OL';
  if (siUnit === 'Pa') return formatValue(value / 1000, 'kPa', { significant: digits });
  return formatValue(value, siUnit as Unit, { significant: digits, autoPrefix: true });
}

/** Significant digits of a stored number as written in shortest form: 12.34 → 4, 5 → 1, 0.075 → 2. */
function digitsOf(value: number): number {
  const text = Math.abs(value).toExponential().split('e')[0]!.replace('.', '');
  return Math.max(1, text.length);
}

/**
 * A reading as entered, for people: at least 3 significant figures ("5.00 V", not "5 V"), never fewer than the
 * technician typed (12.34 V stays 12.34 V), in the unit entered; "OL" for over-range.
 */
export function formatEntered(value: number | null, unit: string, overload = false): string {
  if (overload || value === null) return `OL (${unit})`;
  if (!(UNITS as readonly string[]).includes(unit)) return `${value} ${unit}`;
  return formatValue(value, unit as Unit, { significant: Math.max(3, digitsOf(value)) });
}

/** A predicted reading as a meter would show it: volts to 0.01 V (no "−0.00"), ohms with a prefix. */
export function formatReading(value: number | 'overload', siUnit: string): string {
  if (value !== 'overload' && siUnit === 'V') {
    const text = value.toFixed(2);
    return `${text === '-0.00' ? '0.00' : text} V`;
  }
  return formatSi(value, siUnit);
}

type BandValue = number | 'overload';

/**
 * What a cause would make the meter show, read at a glance: one value when the spread rounds to it, else "from … to
 * …", clamped to what the instrument can display (no negative ohms; a scan value of a 0–5 V sensor is never below 0).
 */
export function predictedRange(band: { p5: BandValue; p95: BandValue } | null, quantity: Quantity): string | null {
  if (!band) return null;
  const unit = siUnitOf(quantity);
  const floor = quantity === 'ohms' || quantity === 'scan_value' ? 0 : -Infinity;
  const clamp = (v: BandValue): BandValue => (v === 'overload' ? v : Math.max(floor, v));
  const lo = formatReading(clamp(band.p5), unit);
  const hi = formatReading(clamp(band.p95), unit);
  if (lo === hi) return lo === 'OL' ? 'OL (over-range)' : lo;
  return hi === 'OL' ? `${lo} or more, up to OL` : `${lo} to ${hi}`;
}

/** The SI unit of a quantity's readings (scan values are shown in volts by the built-in trees). */
export function siUnitOf(quantity: Quantity): string {
  return quantity === 'ohms' ? 'Ω' : quantity === 'amps' ? 'A' : 'V';
}

/**
 * A probability in whole percent, never rounded up: 0.948 shows "94 %", so a cause short of the 95 % needed to
 * conclude never looks as if it had reached it. Above 99 % it is ">99 %", below 1 % "<1 %".
 */
export function percent(p: number): string {
  if (p > 0.99) return '>99 %';
  if (p > 0 && p < 0.01) return '<1 %';
  // The small allowance keeps 0.29 (28.999… in binary) at 29 %.
  return `${Math.floor(p * 100 + 1e-9)} %`;
}

/** "3 h ago", "2 days ago" — coarse on purpose: the board is read at a glance. */
export function ago(iso: string | Date, now = Date.now()): string {
  const ms = now - new Date(iso).getTime();
  const min = Math.round(ms / 60_000);
  if (min < 1) return 'just now';
  if (min < 60) return `${min} min ago`;
  const h = Math.round(min / 60);
  if (h < 48) return `${h} h ago`;
  return `${Math.round(h / 24)} days ago`;
}

export function when(iso: string | Date): string {
  const d = new Date(iso);
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())} ${pad(d.getHours())}:${pad(d.getMinutes())}`;
}
