/**
 * Predicted readings as the API shows them. JSON has no Infinity: an ohms reading beyond the meter's range is
 * `{ value: null, overload: true }`, as the meter shows "OL".
 */
import type { Percentiles, ReadingUnit } from '../../engine/circuit';
import type { Finding } from '../../common/errors/domain.exception';
import { apiFindings } from '../calculators/engine-result';

const UNIT_SYMBOLS: Record<ReadingUnit, 'V' | 'Ω' | 'A'> = { V: 'V', ohm: 'Ω', A: 'A' };

export function unitSymbol(unit: ReadingUnit): 'V' | 'Ω' | 'A' {
  return UNIT_SYMBOLS[unit];
}

export interface ValueView {
  value: number | null;
  overload: boolean;
}

export function valueView(value: number): ValueView {
  return Number.isFinite(value) ? { value, overload: false } : { value: null, overload: true };
}

export function readingView(value: number, unit: ReadingUnit) {
  return { ...valueView(value), unit: unitSymbol(unit) };
}

export function percentilesView(p: Percentiles): Record<keyof Percentiles, ValueView> {
  return {
    p1: valueView(p.p1),
    p5: valueView(p.p5),
    p25: valueView(p.p25),
    p50: valueView(p.p50),
    p75: valueView(p.p75),
    p95: valueView(p.p95),
    p99: valueView(p.p99),
  };
}

/** Why a row has no reading (e.g. an ohmmeter on a circuit the fault powers), paths in the API's dotted form. */
export function rowFindings(findings: Finding[]): Finding[] {
  return apiFindings('', findings).map((f) => ({ ...f, path: f.path.replace(/^\./, '') }));
}
