/**
 * Plausibility of a thermistor's scan temperature: SAE J1979 service $01 PID 05 (engine coolant temperature) and
 * PID 0F (intake air temperature) are one byte A read as A − 40 °C, so −40…215 °C (SAE J1979, mode 01 scaling).
 * A module that sees its thermistor input pulled to the rail (an open sensor, signal wire or ground) reports the
 * coldest value, the PID's floor; an input pulled to ground (a shorted sensor or signal wire) the hottest. And
 * with the key on, what the technician knows of the conditions bounds the value: a cold-soaked engine sits at the
 * air's temperature, and no stopped or running engine is colder than the air around it.
 */
import { finding, joinPath, type Finding } from './findings';
import { parsePid } from '../scan/decode-pid';
import { PIDS } from '../scan/pid-table';
import type { Reading } from './index';

/** What the technician knows about the vehicle's temperatures when the readings were taken. */
export interface ScanConditions {
  /** The air temperature around the vehicle, °C. */
  ambientC?: number;
  /** The engine has stood long enough (overnight) to reach the air's temperature. */
  coldSoaked?: boolean;
}

/** PIDs this check reads: the thermistor temperatures of SAE J1979 mode 01. */
const TEMPERATURE_PIDS = ['05', '0F'] as const;
/** How close to the PID's floor or top counts as at it: half of the PID's 1 °C step (SAE J1979 scaling: A − 40). */
const AT_LIMIT_C = 0.5;
/** How far a cold-soaked engine's reading may sit from the ambient, °C (common practice, no source). */
export const COLD_SOAK_SPREAD_C = 8;
/** How far below the ambient a reading may sit before it is implausible, °C (common practice, no source). */
export const BELOW_AMBIENT_SPREAD_C = 8;
/** Ambient temperatures the check accepts, °C (common practice, no source: where vehicles are driven). */
export const AMBIENT_RANGE_C = { min: -50, max: 60 } as const;

const FROM_UNIT: Record<string, (v: number) => number> = { '°C': (v) => v, '°F': (v) => ((v - 32) * 5) / 9 };

interface TemperatureReading {
  index: number;
  reading: Reading;
  pid: (typeof TEMPERATURE_PIDS)[number];
  celsius: number;
}

interface PlausibilityRule {
  code: string;
  /** The message when the rule applies to this reading under these conditions, else undefined. */
  check(r: TemperatureReading, c: ScanConditions, range: { min: number; max: number }): string | undefined;
}

const name = (r: TemperatureReading) => `${PIDS.get(r.pid)!.j1930} (PID ${r.pid})`;
const shown = (c: number) => `${Number(c.toFixed(1))} °C`;

const RULES: readonly PlausibilityRule[] = [
  {
    code: 'scan_temperature.at_floor',
    check: (r, _c, range) =>
      r.celsius <= range.min + AT_LIMIT_C
        ? `${name(r)} reads ${shown(r.celsius)}, the lowest the PID can report: the signature of an open circuit (sensor, signal wire or sensor ground open) unless the air really is that cold.`
        : undefined,
  },
  {
    code: 'scan_temperature.at_top',
    check: (r, _c, range) =>
      r.celsius >= range.max - AT_LIMIT_C
        ? `${name(r)} reads ${shown(r.celsius)}, the highest the PID can report: the signature of a shorted sensor or a signal wire shorted to ground.`
        : undefined,
  },
  {
    code: 'scan_temperature.far_from_ambient_cold_soaked',
    check: (r, c, range) =>
      c.coldSoaked && c.ambientC !== undefined && r.reading.request.engine === 'off' && !atLimit(r, range) && Math.abs(r.celsius - c.ambientC) > COLD_SOAK_SPREAD_C
        ? `${name(r)} reads ${shown(r.celsius)} on a cold-soaked engine with the air at ${shown(c.ambientC)}: more than ${COLD_SOAK_SPREAD_C} °C apart, so the sensor or its circuit misreads (threshold: common practice, no source).`
        : undefined,
  },
  {
    code: 'scan_temperature.below_ambient',
    check: (r, c, range) =>
      !c.coldSoaked && c.ambientC !== undefined && !atLimit(r, range) && r.celsius < c.ambientC - BELOW_AMBIENT_SPREAD_C
        ? `${name(r)} reads ${shown(r.celsius)} with the air at ${shown(c.ambientC)}: an engine and its intake are not colder than the air around them, so the sensor or its circuit misreads (threshold: common practice, no source).`
        : undefined,
  },
];

function atLimit(r: TemperatureReading, range: { min: number; max: number }): boolean {
  return r.celsius <= range.min + AT_LIMIT_C || r.celsius >= range.max - AT_LIMIT_C;
}

/** The key-on scan readings of PID 05 or 0F in °C or °F, live (not replaced by a correction). */
function temperatureReadings(readings: readonly Reading[]): TemperatureReading[] {
  const replaced = new Set(readings.filter((r) => typeof r?.supersededBy === 'string').map((r) => r.id));
  return readings.flatMap((reading, index) => {
    const request = reading?.request;
    if (request?.quantity !== 'scan_value' || request.key !== 'on' || request.pid === undefined || replaced.has(reading.id)) return [];
    const parsed = parsePid(request.pid);
    const pid = parsed.ok ? TEMPERATURE_PIDS.find((p) => p === parsed.pid) : undefined;
    const convert = FROM_UNIT[reading.unit ?? ''];
    if (!pid || !convert || typeof reading.value !== 'number' || !Number.isFinite(reading.value)) return [];
    return [{ index, reading, pid, celsius: convert(reading.value) }];
  });
}

/** Checks the conditions the technician gave; paths start at `options.conditions`. */
export function checkScanConditions(c: ScanConditions | undefined): Finding[] {
  if (c === undefined) return [];
  const found: Finding[] = [];
  if (c.ambientC !== undefined && (typeof c.ambientC !== 'number' || !(c.ambientC >= AMBIENT_RANGE_C.min && c.ambientC <= AMBIENT_RANGE_C.max)))
    found.push(finding('options.invalid', 'options.conditions.ambientC', `expected the air temperature in °C, ${AMBIENT_RANGE_C.min} to ${AMBIENT_RANGE_C.max}`));
  if (c.coldSoaked !== undefined && typeof c.coldSoaked !== 'boolean') found.push(finding('options.invalid', 'options.conditions.coldSoaked', 'expected true or false'));
  return found;
}

/** One warning per implausible scan temperature, on the reading's value, with the reading it concerns. */
export function scanTemperatureFindings(readings: readonly Reading[], conditions: ScanConditions = {}): Array<{ readingId: string; finding: Finding }> {
  const usable: ScanConditions = checkScanConditions(conditions).length ? {} : conditions;
  return temperatureReadings(readings).flatMap((r) => {
    const range = PIDS.get(r.pid)!.range!;
    return RULES.flatMap((rule) => {
      const message = rule.check(r, usable, range);
      return message ? [{ readingId: r.reading.id, finding: finding(rule.code, joinPath('readings', r.index, 'value'), message, 'warning') }] : [];
    });
  });
}
