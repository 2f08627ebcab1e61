/**
 * Which code-table sensor a circuit's free-text sensor name stands for. The J1930 term comes first (sensors.ts);
 * a letter or a number after it picks the sensor of a pair or set: TP A/B (1/2), APP D/E/F (1/2/3). Without one a
 * TP or APP circuit could be either, and codes of the set are not weighed.
 */
import { sensorTerm } from '../sensors';
import type { CodeRow, CodeSensor } from './code-table';

export type CodeSensorMatch = { sensor: CodeSensor } | { ambiguous: CodeSensor[] };

const SETS: Record<string, CodeSensor[]> = {
  TP: ['TP A', 'TP B'],
  APP: ['APP D', 'APP E', 'APP F'],
};
const SINGLE: Record<string, CodeSensor> = { MAP: 'MAP', BARO: 'MAP', IAT: 'IAT', ECT: 'ECT', FTP: 'FTP' };

/** "TP sensor 2" → TP B; "APP E" → APP E; "MAP" → MAP; "TP" → ambiguous; "O2S" → undefined. */
export function codeSensorOf(text: string): CodeSensorMatch | undefined {
  const term = sensorTerm(text)?.term;
  if (!term) return undefined;
  if (SINGLE[term]) return { sensor: SINGLE[term] };
  const set = SETS[term];
  if (!set) return undefined;
  const rest = text.trim().split(/[\s_-]+/).slice(1).filter((w) => !/^sensor$/i.test(w));
  const mark = rest[0]?.toUpperCase();
  if (mark) {
    const byLetter = set.find((s) => s.endsWith(` ${mark}`));
    if (byLetter) return { sensor: byLetter };
    const n = Number(mark);
    if (Number.isInteger(n) && n >= 1 && n <= set.length) return { sensor: set[n - 1]! };
  }
  return { ambiguous: set };
}

/**
 * Whether a code may concern a circuit, for a gate that must not let a returned fault through: a signal code of the
 * circuit's sensor (of either sensor of an unnamed pair), or any 5 V reference code on a circuit fed by a 5 V
 * reference (which one feeds it is in the service information, not known here).
 */
export function codeMayConcern(row: CodeRow, sensorText: string, circuitKind: string): boolean {
  if (row.monitor === 'reference') return circuitKind === 'three_wire_5v';
  const match = codeSensorOf(sensorText);
  if (!match) return false;
  const sensors = 'sensor' in match ? [match.sensor] : match.ambiguous;
  return row.sensors.some((s) => sensors.includes(s));
}
