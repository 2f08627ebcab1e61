/**
 * Wording of the proof: times, ranges, test conditions. Times print in the offset they carry (no server time zone,
 * no locale), so the same view always prints the same words.
 */
import { formatValue } from '../engine/units';
import { CONNECTOR_OF, OTHER_CONNECTOR, sensorInputWords, type HarnessLocation, type Jumper, type JumperVia, type MeasurementRequest, type Point } from '../engine/vocabulary';
import { canonicalJson } from './digest';
import { printBound } from './units';
import type { ExpectedRange, ProofView } from './view';

/** "2025-03-14 09:42 UTC" or "2025-03-14 09:42 (UTC+01:00)"; seconds are dropped. */
export function formatTime(iso: string): string {
  const m = /^(\d{4}-\d{2}-\d{2})T(\d{2}:\d{2})(?::\d{2}(?:\.\d+)?)?(Z|[+-]\d{2}:\d{2})$/.exec(iso);
  if (!m) return iso;
  const zone = m[3] === 'Z' || m[3] === '+00:00' ? 'UTC' : `UTC${m[3]!.replace('-', '\u2212')}`;
  return `${m[1]} ${m[2]} ${zone}`;
}

export function formatTimeOr(iso: string | null, missing: string): string {
  return iso === null ? missing : formatTime(iso);
}

/**
 * "0.40 – 4.60 V", "≤ 0.10 V", "≥ 1 MΩ": bounds as the caller gave them, except bounds in plain ohms, which take the
 * prefix a reading beside them would ("10.0 kΩ – 1.00 MΩ", not "10000 – 1000000 Ω").
 */
export function formatRange(e: ExpectedRange): string {
  if (e.unit === 'Ω' && Math.max(Math.abs(e.min ?? 0), Math.abs(e.max ?? 0)) >= 1000) {
    const ohms = (v: number) => formatValue(v, 'Ω', { significant: 3, autoPrefix: true }).replace(/^-/, '\u2212');
    if (e.min !== null && e.max !== null) return `${ohms(e.min)} – ${ohms(e.max)}`;
    return e.max !== null ? `≤ ${ohms(e.max)}` : `≥ ${ohms(e.min ?? 0)}`;
  }
  if (e.min !== null && e.max !== null) return `${printBound(e.min)} – ${printBound(e.max)} ${e.unit}`;
  if (e.max !== null) return `≤ ${printBound(e.max)} ${e.unit}`;
  return `≥ ${printBound(e.min ?? 0)} ${e.unit}`;
}

const POINT_WORDS: Record<Point, string> = {
  reference: '5 V reference',
  signal: 'signal',
  ground: 'sensor ground',
  battery_negative: 'battery negative',
  battery_positive: 'battery positive',
  chassis_ground: 'chassis ground',
};

/** How each jumper kind reads on paper (a table keyed by kind, not a switch). */
const VIA_WORDS: { [K in JumperVia['kind']]: (via: Extract<JumperVia, { kind: K }>) => string } = {
  fused_jumper: () => 'fused jumper',
  resistor: (via) => `${printBound(via.ohms)} Ω resistor`,
  voltage_source: (via) => `${printBound(via.volts)} V adjustable source`,
};

function viaWords(via: JumperVia): string {
  return (VIA_WORDS[via.kind] as (v: JumperVia) => string)(via);
}

function jumperWords(j: Jumper): string {
  return `${POINT_WORDS[j.from]} → ${POINT_WORDS[j.to]}, ${viaWords(j.via)}`;
}

const KEY_ENGINE: Record<string, string> = {
  'off/off': 'Key off',
  'on/off': 'Key on, engine off',
  'on/cranking': 'Key on, engine cranking',
  'on/running': 'Engine running',
  'off/cranking': 'Key off, engine cranking',
  'off/running': 'Key off, engine running',
};

const LOCATION_WORDS: Record<HarnessLocation, string> = {
  sensor_connector: 'sensor connector',
  module_connector: 'module connector',
};

const CONNECTOR_WORDS: Record<MeasurementRequest['connector'], (where: string) => string> = {
  plugged: (where) => `${where} plugged in`,
  unplugged: (where) => `${where} unplugged`,
  backprobed: (where) => `back-probed at the ${where}`,
};

const QUANTITY_WORDS: Record<MeasurementRequest['quantity'], string> = {
  dc_volts: 'Volts',
  ohms: 'Ohms',
  amps: 'Amps',
  scan_value: 'Scan tool',
};

/** The conditions of a test as short lines: vehicle state and connector, leads, jumpers. */
export function conditionLines(r: MeasurementRequest): string[] {
  const lines = [`${KEY_ENGINE[`${r.key}/${r.engine}`]}; ${CONNECTOR_WORDS[r.connector](LOCATION_WORDS[CONNECTOR_OF[r.location]])}`];
  if (r.quantity === 'scan_value') {
    lines.push(`Scan tool: parameter ${r.pid ?? '(unnamed)'}`);
  } else if (r.location === 'sensor_pins') {
    lines.push(`${QUANTITY_WORDS[r.quantity]}: leads on the sensor's own pins, sensor unplugged: red on its ${POINT_WORDS[r.at]} pin, black on its ${POINT_WORDS[r.against ?? r.at]} pin`);
  } else {
    const far = r.againstLocation && r.againstLocation !== r.location ? ` at the ${LOCATION_WORDS[CONNECTOR_OF[r.againstLocation]]}` : '';
    lines.push(`${QUANTITY_WORDS[r.quantity]}: red lead at ${POINT_WORDS[r.at]}${far ? ` at the ${LOCATION_WORDS[CONNECTOR_OF[r.location]]}` : ''}, black at ${POINT_WORDS[r.against ?? r.at]}${far}`);
  }
  if (r.otherConnector) lines.push(`${LOCATION_WORDS[OTHER_CONNECTOR[r.location]].replace(/^./, (c) => c.toUpperCase())}: ${r.otherConnector === 'backprobed' ? 'back-probed' : r.otherConnector === 'unplugged' ? 'unplugged' : 'plugged in'}`);
  const input = sensorInputWords(r);
  if (input) lines.push(`Input: ${input.replace(/^./, (c) => c.toUpperCase())}`);
  if (r.sensor) lines.push(`Sensor on the shared reference: ${r.sensor}`);
  for (const j of r.jumpers) lines.push(`Jumper: ${jumperWords(j)}`);
  return lines;
}

/** Whether two requests describe the same test conditions (key order does not matter). */
export function sameConditions(a: MeasurementRequest, b: MeasurementRequest): boolean {
  return canonicalJson(a) === canonicalJson(b);
}

export function formatProbability(p: number): string {
  return `${(p * 100).toFixed(1)} %`;
}

export function personLine(p: { name: string; id?: string }): string {
  return p.id ? `${p.name} (${p.id})` : p.name;
}

/** The latest time stamp in the view (keys `at` or ending in `At` holding a date; a request's `at` is a probe
 * point, not a time), for the document's fixed metadata dates. */
export function latestTime(view: ProofView): Date {
  let latest = Number.NEGATIVE_INFINITY;
  const walk = (node: unknown, key: string): void => {
    if (typeof node === 'string') {
      const t = key === 'at' || key.endsWith('At') ? Date.parse(node) : Number.NaN;
      if (Number.isFinite(t)) latest = Math.max(latest, t);
    } else if (Array.isArray(node)) {
      node.forEach((n) => walk(n, ''));
    } else if (node && typeof node === 'object') {
      for (const [k, v] of Object.entries(node)) walk(v, k);
    }
  };
  walk(view, '');
  return new Date(Number.isFinite(latest) ? latest : 0);
}
