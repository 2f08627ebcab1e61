/**
 * The trouble codes Tracebay weighs, as data: each SAE J2012 generic code with the sensor it concerns (SAE J1930
 * names), its failure type and the voltage window the module watches for that failure type. The likelihood each
 * cause gives a code is not written here: it is derived from the circuit model (src/engine/diagnosis/code-evidence.ts)
 * as the share of the cause's predicted voltage that falls in the window.
 *
 * Names and failure types: SAE J2012, generic code list (recalled, "from memory"; the manufacturer's service
 * information always takes precedence). Windows: common practice, no source; a module's own thresholds and
 * set times differ by make and are in its service information.
 */
import { z } from 'zod';
import { parseDtc } from './dtc';

/** Sensors in SAE J1930 terms; "5 V reference A/B/C" are the module's sensor supplies. */
export const CODE_SENSORS = ['TP A', 'TP B', 'APP D', 'APP E', 'APP F', 'MAP', 'IAT', 'ECT', 'FTP', '5 V reference A', '5 V reference B', '5 V reference C'] as const;
export type CodeSensor = (typeof CODE_SENSORS)[number];

/**
 * `circuit`: the list names no failure type (or we are not sure of it); `circuit_open` is the reference codes'
 * "Circuit/Open". `range_performance`, `intermittent` and `correlation` set on a comparison (with other signals, over
 * time), not on a voltage window, so they change no cause's weight.
 */
export const FAILURE_TYPES = ['circuit', 'circuit_open', 'range_performance', 'low_input', 'high_input', 'intermittent', 'correlation'] as const;
export type FailureType = (typeof FAILURE_TYPES)[number];

/** What the module compares against the window: the signal it converts, or the reference it supplies (at its own pin). */
export type Monitor = 'signal' | 'reference';

/** A voltage window: the code is taken to set while the monitored voltage is inside [lo, hi). */
export interface CodeWindow {
  lo: number;
  hi: number;
  /** In plain words, for people. */
  words: string;
  basis: 'common practice, no source';
}

const LOW_SIGNAL = 0.2;
const HIGH_SIGNAL = 4.8;
const LOW_REFERENCE = 4.5;
const HIGH_REFERENCE = 5.5;
const basis = 'common practice, no source' as const;

/** Windows per monitor and failure type (common practice, no source: a 5 V module's signal limits of about 0.2 V and 4.8 V, reference within ±0.5 V of 5 V). */
export const CODE_WINDOWS: Readonly<Record<Monitor, Partial<Record<FailureType, CodeWindow>>>> = {
  signal: {
    low_input: { lo: -Infinity, hi: LOW_SIGNAL, words: `signal below about ${LOW_SIGNAL} V`, basis },
    high_input: { lo: HIGH_SIGNAL, hi: Infinity, words: `signal above about ${HIGH_SIGNAL} V`, basis },
  },
  reference: {
    low_input: { lo: -Infinity, hi: LOW_REFERENCE, words: `reference below about ${LOW_REFERENCE} V at the module`, basis },
    high_input: { lo: HIGH_REFERENCE, hi: Infinity, words: `reference above about ${HIGH_REFERENCE} V at the module`, basis },
  },
};

/**
 * "circuit" and "circuit/open" codes: the voltage outside the normal span, either side (two windows, summed).
 * A reference open between module and sensor leaves the module's own pin at 5 V, so it does not show here.
 */
export const OUT_OF_SPAN: Readonly<Record<Monitor, { lo: number; hi: number; words: string }>> = {
  signal: { lo: LOW_SIGNAL, hi: HIGH_SIGNAL, words: `signal outside ${LOW_SIGNAL}–${HIGH_SIGNAL} V (either side)` },
  reference: { lo: LOW_REFERENCE, hi: HIGH_REFERENCE, words: `reference outside ${LOW_REFERENCE}–${HIGH_REFERENCE} V at the module (either side)` },
};

/** One series of codes: a sensor and its codes by failure type. */
const seriesSchema = z.strictObject({
  sensors: z.array(z.enum(CODE_SENSORS)).min(1),
  monitor: z.enum(['signal', 'reference']),
  /** The code list's name of the circuit, in our words. */
  name: z.string().min(1),
  codes: z.record(z.string(), z.enum(FAILURE_TYPES)),
  /** How sure the failure types are. */
  certainty: z.enum(['from memory', 'circuit: failure type not stated']),
});
type Series = z.infer<typeof seriesSchema>;

const SERIES_DATA: unknown = [
  { sensors: ['TP A'], monitor: 'signal', name: 'throttle/pedal position sensor/switch "A" circuit', certainty: 'from memory', codes: { P0120: 'circuit', P0121: 'range_performance', P0122: 'low_input', P0123: 'high_input', P0124: 'intermittent' } },
  { sensors: ['TP B'], monitor: 'signal', name: 'throttle/pedal position sensor/switch "B" circuit', certainty: 'from memory', codes: { P0220: 'circuit', P0221: 'range_performance', P0222: 'low_input', P0223: 'high_input', P0224: 'intermittent' } },
  { sensors: ['APP D'], monitor: 'signal', name: 'throttle/pedal position sensor/switch "D" circuit', certainty: 'from memory', codes: { P2120: 'circuit', P2121: 'range_performance', P2122: 'low_input', P2123: 'high_input', P2124: 'intermittent' } },
  { sensors: ['APP E'], monitor: 'signal', name: 'throttle/pedal position sensor/switch "E" circuit', certainty: 'from memory', codes: { P2125: 'circuit', P2126: 'range_performance', P2127: 'low_input', P2128: 'high_input', P2129: 'intermittent' } },
  { sensors: ['APP F'], monitor: 'signal', name: 'throttle/pedal position sensor/switch "F" circuit', certainty: 'from memory', codes: { P2130: 'circuit', P2131: 'range_performance', P2132: 'low_input', P2133: 'high_input', P2134: 'intermittent' } },
  { sensors: ['TP A', 'TP B'], monitor: 'signal', name: 'throttle/pedal position sensor/switch "A"/"B" voltage correlation', certainty: 'from memory', codes: { P2135: 'correlation' } },
  { sensors: ['MAP'], monitor: 'signal', name: 'manifold absolute pressure/barometric pressure circuit', certainty: 'from memory', codes: { P0105: 'circuit', P0106: 'range_performance', P0107: 'low_input', P0108: 'high_input' } },
  { sensors: ['IAT'], monitor: 'signal', name: 'intake air temperature sensor 1 circuit', certainty: 'from memory', codes: { P0110: 'circuit', P0111: 'range_performance', P0112: 'low_input', P0113: 'high_input' } },
  { sensors: ['ECT'], monitor: 'signal', name: 'engine coolant temperature sensor 1 circuit', certainty: 'from memory', codes: { P0115: 'circuit', P0116: 'range_performance', P0117: 'low_input', P0118: 'high_input' } },
  { sensors: ['FTP'], monitor: 'signal', name: 'evaporative emission system pressure sensor/switch "A" circuit (fuel tank pressure)', certainty: 'from memory', codes: { P0450: 'circuit', P0451: 'range_performance', P0452: 'low_input', P0453: 'high_input', P0454: 'intermittent' } },
  { sensors: ['5 V reference A'], monitor: 'reference', name: 'sensor reference voltage "A" circuit', certainty: 'from memory', codes: { P0641: 'circuit_open', P0642: 'low_input', P0643: 'high_input' } },
  { sensors: ['5 V reference B'], monitor: 'reference', name: 'sensor reference voltage "B" circuit', certainty: 'from memory', codes: { P0651: 'circuit_open', P0652: 'low_input', P0653: 'high_input' } },
  { sensors: ['5 V reference C'], monitor: 'reference', name: 'sensor reference voltage "C" circuit', certainty: 'from memory', codes: { P0697: 'circuit_open', P0698: 'low_input', P0699: 'high_input' } },
];

export interface CodeRow {
  code: string;
  sensors: readonly CodeSensor[];
  monitor: Monitor;
  failure: FailureType;
  /** The circuit the code concerns, in plain words. */
  circuit: string;
  /** One line for display; always says it is the generic SAE meaning. */
  meaning: string;
  certainty: Series['certainty'];
  source: 'SAE J2012, generic code list';
}

const FAILURE_WORDS: Record<FailureType, string> = {
  circuit: 'circuit',
  circuit_open: 'circuit/open',
  range_performance: 'range/performance',
  low_input: 'low input',
  high_input: 'high input',
  intermittent: 'intermittent',
  correlation: 'correlation',
};
export const failureWords = (f: FailureType) => FAILURE_WORDS[f];

/** Validates the series and spreads them into rows; throws on a malformed table (a programming error, caught by tests). */
export function buildCodeTable(data: unknown): ReadonlyMap<string, CodeRow> {
  const series = z.array(seriesSchema).parse(data);
  const rows = new Map<string, CodeRow>();
  for (const s of series) {
    for (const [text, failure] of Object.entries(s.codes)) {
      const parsed = parseDtc(text);
      if (!parsed.ok || parsed.code !== text) throw new Error(`code table: ${JSON.stringify(text)} is not a code in SAE J2012 form`);
      if (rows.has(text)) throw new Error(`code table: ${text} appears twice`);
      if (failure === 'circuit_open' && s.monitor !== 'reference') throw new Error(`code table: ${text} circuit/open is a reference failure type`);
      const circuit = s.name[0]!.toUpperCase() + s.name.slice(1);
      rows.set(text, {
        code: text,
        sensors: s.sensors,
        monitor: s.monitor,
        failure,
        circuit: s.name,
        meaning: `${circuit}: ${FAILURE_WORDS[failure]} (generic SAE meaning; service information takes precedence)`,
        certainty: s.certainty,
        source: 'SAE J2012, generic code list',
      });
    }
  }
  return rows;
}

export const CODE_TABLE: ReadonlyMap<string, CodeRow> = buildCodeTable(SERIES_DATA);

/** The table row of a code ("p0122" → its row), or undefined for a malformed or untabled code. */
export function codeRow(code: string): CodeRow | undefined {
  const parsed = parseDtc(code);
  return parsed.ok ? CODE_TABLE.get(parsed.code) : undefined;
}

/** The window(s) of a row: one for low/high/range, two (below and above the span) for circuit codes, none otherwise. */
export function windowsOf(row: Pick<CodeRow, 'monitor' | 'failure'>): { windows: Array<{ lo: number; hi: number }>; words: string } | undefined {
  const one = CODE_WINDOWS[row.monitor][row.failure];
  if (one) return { windows: [{ lo: one.lo, hi: one.hi }], words: one.words };
  if (row.failure === 'circuit' || row.failure === 'circuit_open') {
    const span = OUT_OF_SPAN[row.monitor];
    return { windows: [{ lo: -Infinity, hi: span.lo }, { lo: span.hi, hi: Infinity }], words: span.words };
  }
  return undefined;
}
