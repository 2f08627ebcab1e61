import type { CircuitKind } from '../vocabulary';
import { CODE_TABLE, codeRow, failureWords, type CodeRow, type CodeSensor } from './code-table';

/**
 * Generic meanings of the trouble codes this product works with, in our own words, read from the code table
 * (SAE J2012, generic code list). The manufacturer's service information always takes precedence.
 */

const GROUPS = {
  'TP A': 'throttle_pedal_position_a',
  'TP B': 'throttle_pedal_position_b',
  'APP D': 'pedal_position_d',
  'APP E': 'pedal_position_e',
  'APP F': 'pedal_position_f',
  MAP: 'map_baro',
  IAT: 'intake_air_temperature',
  ECT: 'coolant_temperature',
  FTP: 'fuel_tank_pressure',
  '5 V reference A': 'reference_a',
  '5 V reference B': 'reference_b',
  '5 V reference C': 'reference_c',
} as const satisfies Record<CodeSensor, string>;

export type CircuitGroup = (typeof GROUPS)[CodeSensor] | 'throttle_position_correlation';

const THERMISTORS: readonly CodeSensor[] = ['IAT', 'ECT'];

export interface GenericMeaning {
  code: string;
  group: CircuitGroup;
  /** The circuit the code concerns, in plain words. */
  circuit: string;
  /** Failure type where the generic list names one (absent for a plain "circuit" code). */
  variant?: string;
  /** One line for display; always says it is the generic SAE meaning. */
  meaning: string;
  /** Which kind of sensor circuit a technician will be testing. */
  circuitKind: CircuitKind;
  source: 'SAE J2012, generic code list';
}

function describe(row: CodeRow): GenericMeaning {
  return {
    code: row.code,
    group: row.sensors.length > 1 ? 'throttle_position_correlation' : GROUPS[row.sensors[0]!],
    circuit: row.circuit,
    ...(row.failure === 'circuit' ? {} : { variant: failureWords(row.failure) }),
    meaning: row.meaning,
    circuitKind: THERMISTORS.includes(row.sensors[0]!) ? 'two_wire_thermistor' : 'three_wire_5v',
    source: row.source,
  };
}

/** Every tabled code, keyed by code ("P0122"). */
export const GENERIC_MEANINGS: ReadonlyMap<string, GenericMeaning> = new Map([...CODE_TABLE.values()].map((row) => [row.code, describe(row)] as const));

/** The generic meaning of a tabled code, or undefined for codes outside this product's table (or malformed). */
export function genericMeaning(code: string): GenericMeaning | undefined {
  const row = codeRow(code);
  return row && GENERIC_MEANINGS.get(row.code);
}

/** True for the sensor reference-voltage circuit codes ("A", "B", "C"); P0640 is not one of them. */
export function isReferenceVoltageCode(code: string): boolean {
  return codeRow(code)?.monitor === 'reference';
}
