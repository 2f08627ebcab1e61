import {
  CHECK_DIGIT_POSITION,
  computeCheckDigit,
  type Finding,
  formatFindings,
  VIN_LENGTH,
} from './check-digit';

/**
 * Model-year codes at position 10 in their 30-year cycle, starting 1980 (49 CFR 565.15, from memory). U, Z and 0 are
 * not year codes, nor I, O, Q.
 */
export const MODEL_YEAR_CODES = 'ABCDEFGHJKLMNPRSTVWXY123456789';
const FIRST_CYCLE_START = 1980;

export interface CheckVinOptions {
  /**
   * Vehicle built for markets outside North America: the 17-character format is still checked but the check digit
   * at position 9 is not required (other markets do not mandate it), and position 10 is not read as a model year.
   */
  outsideNorthAmerica?: boolean;
  /** Path reported in findings (default "vin"). */
  path?: string;
}

export type CheckVinResult =
  | {
      ok: true;
      /** Trimmed and upper-cased. */
      vin: string;
      checkDigit: 'valid' | 'not_applicable';
      /** Position 10 when it is a model-year code (North American VINs only). */
      modelYearCode?: string;
      /**
       * Years the code can stand for (one per 30-year cycle, 1980–2039). Telling them apart needs rules by vehicle
       * class, so the choice is left to whoever knows the vehicle.
       */
      modelYearCandidates?: number[];
    }
  | { ok: false; findings: Finding[] };

/** Years a position-10 code stands for, or undefined when the character is not a model-year code. */
export function modelYearsFor(code: string): number[] | undefined {
  const index = code.length === 1 ? MODEL_YEAR_CODES.indexOf(code.toUpperCase()) : -1;
  if (index < 0) return undefined;
  return [FIRST_CYCLE_START + index, FIRST_CYCLE_START + MODEL_YEAR_CODES.length + index];
}

/** Validates a VIN per 49 CFR 565: format always, check digit unless `outsideNorthAmerica`. */
export function checkVin(vin: string, opts: CheckVinOptions = {}): CheckVinResult {
  const path = opts.path ?? 'vin';
  if (typeof vin !== 'string') {
    return {
      ok: false,
      findings: [{ code: 'vin.not_a_string', path, message: `VIN must be a string of ${VIN_LENGTH} characters, got ${vin === null ? 'null' : typeof vin}` }],
    };
  }
  const upper = vin.trim().toUpperCase();
  const findings = formatFindings(upper, path);
  if (findings.length > 0) return { ok: false, findings };

  if (opts.outsideNorthAmerica) return { ok: true, vin: upper, checkDigit: 'not_applicable' };

  const computed = computeCheckDigit(upper, path);
  if (!computed.ok) return computed;
  const actual = upper[CHECK_DIGIT_POSITION - 1];
  if (actual !== computed.checkDigit) {
    return {
      ok: false,
      findings: [
        {
          code: 'vin.check_digit_mismatch',
          path,
          message: `position ${CHECK_DIGIT_POSITION} is '${actual}' but the check digit computed per 49 CFR 565 is '${computed.checkDigit}'; check the VIN for a mistyped character`,
        },
      ],
    };
  }
  const yearCode = upper[9];
  const years = modelYearsFor(yearCode);
  return years
    ? { ok: true, vin: upper, checkDigit: 'valid', modelYearCode: yearCode, modelYearCandidates: years }
    : { ok: true, vin: upper, checkDigit: 'valid' };
}
