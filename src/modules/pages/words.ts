/** The shared measurement vocabulary in plain words for the bay screens, and reading values formatted for people. */
import { unitsFor } from '../../engine/units';
import type { MeasurementRequest, Point, Quantity } from '../../engine/vocabulary';

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
  exhausted: 'No test left to decide',
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
  const where = LOCATION_WORDS[request.location];
  if (request.quantity === 'scan_value') {
    return { red: `Scan tool: read ${(request.pid ?? 'the parameter').replace(/_/g, ' ')} (the ${POINT_WORDS[request.at]})`, black: null, where };
  }
  const far = request.againstLocation && request.againstLocation !== request.location ? request.againstLocation : null;
  if (far && request.against)
    // A lead at each end of the harness: name both ends (the cavity map is the sensor connector's).
    return {
      red: `${request.location === 'sensor_connector' ? pointWords(request.at, cavities) : POINT_WORDS[request.at]} ${where}`,
      black: `${far === 'sensor_connector' ? pointWords(request.against, cavities) : POINT_WORDS[request.against]} ${LOCATION_WORDS[far]}`,
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
    { label: 'Meter', value: QUANTITY_WORDS[request.quantity] },
    { label: 'Key', value: request.key === 'on' ? 'ON' : 'OFF' },
    { label: 'Engine', value: ENGINE_WORDS[request.engine] },
    { label: 'Connector', value: CONNECTOR_WORDS[request.connector] },
  ];
  if (request.otherConnector) {
    const other = request.location === 'sensor_connector' ? 'Module connector' : 'Sensor connector';
    out[3] = { label: request.location === 'sensor_connector' ? 'Sensor connector' : 'Module connector', value: CONNECTOR_WORDS[request.connector] };
    out.push({ label: other, value: CONNECTOR_WORDS[request.otherConnector] });
  }
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
  return `${QUANTITY_WORDS[request.quantity]}: ${how}, ${l.where}, key ${request.key}, engine ${ENGINE_WORDS[request.engine]}, ${CONNECTOR_WORDS[request.connector]}`;
}

/** Units the number pad offers for a quantity (scan values: the common ones first). */
export function padUnits(quantity: Quantity): string[] {
  if (quantity === 'scan_value') return ['V', '%', 'kPa', '°C', '°F', 'rpm'];
  return [...unitsFor(quantity)];
}

function trim(n: number, digits: number): string {
  return Number(n.toPrecision(digits)).toString();
}

/** A stored (SI) value in a readable prefix: 11010 Ω → "11.0 kΩ", 0.0021 V → "2.1 mV". */
export function formatSi(value: number | 'overload' | null | undefined, siUnit: string, digits = 3): string {
  if (value === 'overload' || value === null || value === undefined || !Number.isFinite(value)) return 'OL';
  const a = Math.abs(value);
  if (siUnit === 'Ω') {
    if (a >= 1e6) return `${trim(value / 1e6, digits)} MΩ`;
    if (a >= 1e3) return `${trim(value / 1e3, digits)} kΩ`;
    return `${trim(value, digits)} Ω`;
  }
  if (siUnit === 'V' && a > 0 && a < 0.1) return `${trim(value * 1000, digits)} mV`;
  if (siUnit === 'A' && a > 0 && a < 0.1) return `${trim(value * 1000, digits)} mA`;
  if (siUnit === 'Pa') return `${trim(value / 1000, digits)} kPa`;
  return `${trim(value, digits)} ${siUnit}`;
}

/** A predicted reading as a meter would show it: volts to 0.01 V (no "−0.00"), ohms with a prefix. */
export function formatReading(value: number | 'overload', siUnit: string): string {
  if (value !== 'overload' && siUnit === 'V') {
    const text = value.toFixed(2);
    return `${text === '-0.00' ? '0.00' : text} V`;
  }
  return formatSi(value, siUnit);
}

/** The SI unit of a quantity's readings (scan values are shown in volts by the built-in trees). */
export function siUnitOf(quantity: Quantity): string {
  return quantity === 'ohms' ? 'Ω' : quantity === 'amps' ? 'A' : 'V';
}

export function percent(p: number): string {
  if (p >= 0.995) return '>99 %';
  if (p > 0 && p < 0.01) return '<1 %';
  return `${Math.round(p * 100)} %`;
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
