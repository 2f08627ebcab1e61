import type { CircuitKind } from '../vocabulary';
import { parseDtc } from './dtc';

/**
 * Generic meanings of the trouble codes this product works with, in our own words, from the SAE-defined generic
 * code list (SAE J2012). Only the failure types we state with confidence are given ("low", "high"); for the
 * other codes in a range the exact failure type is left to the
 * manufacturer's service information, which always takes precedence over a generic meaning.
 */

export type CircuitGroup = 'throttle_pedal_position_a' | 'map_baro' | 'coolant_temperature' | 'reference_a' | 'reference_b' | 'reference_c';

export interface GenericMeaning {
  code: string;
  group: CircuitGroup;
  /** The circuit the code concerns, in plain words. */
  circuit: string;
  /** Failure type where the generic list summary names one. */
  variant?: 'low input' | 'high input';
  /** One line for display; always says it is the generic SAE meaning. */
  meaning: string;
  /** Which kind of sensor circuit a technician will be testing. */
  circuitKind: CircuitKind;
  source: 'SAE J2012 generic code list';
}

interface RangeRow {
  first: number;
  last: number;
  group: CircuitGroup;
  circuit: string;
  circuitKind: CircuitKind;
  variants?: Readonly<Record<number, 'low input' | 'high input'>>;
}

const RANGES: readonly RangeRow[] = [
  {
    first: 0x105, last: 0x108, group: 'map_baro', circuitKind: 'three_wire_5v',
    circuit: 'manifold absolute pressure / barometric pressure sensor circuit',
  },
  {
    first: 0x115, last: 0x118, group: 'coolant_temperature', circuitKind: 'two_wire_thermistor',
    circuit: 'engine coolant temperature sensor circuit',
  },
  {
    first: 0x120, last: 0x124, group: 'throttle_pedal_position_a', circuitKind: 'three_wire_5v',
    circuit: 'throttle/pedal position sensor "A" circuit',
    variants: { 0x122: 'low input', 0x123: 'high input' },
  },
  { first: 0x641, last: 0x643, group: 'reference_a', circuitKind: 'three_wire_5v', circuit: 'sensor reference voltage "A" circuit' },
  { first: 0x651, last: 0x653, group: 'reference_b', circuitKind: 'three_wire_5v', circuit: 'sensor reference voltage "B" circuit' },
  { first: 0x697, last: 0x699, group: 'reference_c', circuitKind: 'three_wire_5v', circuit: 'sensor reference voltage "C" circuit' },
];

function describe(row: RangeRow, n: number): GenericMeaning {
  const code = `P${n.toString(16).toUpperCase().padStart(4, '0')}`;
  const variant = row.variants?.[n];
  const circuit = row.circuit[0].toUpperCase() + row.circuit.slice(1);
  const meaning = variant
    ? `${circuit}: ${variant} (generic SAE meaning)`
    : `${circuit} (generic SAE meaning; exact failure type per service information)`;
  return {
    code,
    group: row.group,
    circuit: row.circuit,
    ...(variant ? { variant } : {}),
    meaning,
    circuitKind: row.circuitKind,
    source: 'SAE J2012 generic code list',
  };
}

/** Every tabled code, keyed by code ("P0122"). */
export const GENERIC_MEANINGS: ReadonlyMap<string, GenericMeaning> = new Map(
  RANGES.flatMap((row) =>
    Array.from({ length: row.last - row.first + 1 }, (_, i) => describe(row, row.first + i)).map((m) => [m.code, m] as const),
  ),
);

/** The generic meaning of a tabled code, or undefined for codes outside this product's table (or malformed). */
export function genericMeaning(code: string): GenericMeaning | undefined {
  const parsed = parseDtc(code);
  return parsed.ok ? GENERIC_MEANINGS.get(parsed.code) : undefined;
}

/** True for the sensor reference-voltage circuit codes ("A", "B", "C"); P0640 is not one of them. */
export function isReferenceVoltageCode(code: string): boolean {
  const group = genericMeaning(code)?.group;
  return group === 'reference_a' || group === 'reference_b' || group === 'reference_c';
}
