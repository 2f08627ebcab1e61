import type { Finding } from '../findings';
/**
 * VIN check digit per 49 CFR 565.15: transliterate each character, multiply by its position weight, sum, take the
 * remainder mod 11; a remainder of 10 is written "X". All integer arithmetic: the regulation's printed table of
 * decimal quotients has a rounding slip, so dividing and comparing decimals is avoided on purpose.
 */


export const VIN_LENGTH = 17;

/** 49 CFR 565.15 table: letter → value. Digits stand for themselves; I, O and Q are never assigned. */
export const VIN_TRANSLITERATION: Readonly<Record<string, number>> = Object.freeze({
  A: 1, B: 2, C: 3, D: 4, E: 5, F: 6, G: 7, H: 8,
  J: 1, K: 2, L: 3, M: 4, N: 5, P: 7, R: 9,
  S: 2, T: 3, U: 4, V: 5, W: 6, X: 7, Y: 8, Z: 9,
  '0': 0, '1': 1, '2': 2, '3': 3, '4': 4, '5': 5, '6': 6, '7': 7, '8': 8, '9': 9,
});

/** 49 CFR 565.15 position weights; position 9 (the check digit itself) weighs 0. */
export const VIN_WEIGHTS: readonly number[] = Object.freeze([8, 7, 6, 5, 4, 3, 2, 10, 0, 9, 8, 7, 6, 5, 4, 3, 2]);

/** 1-based position of the check digit. */
export const CHECK_DIGIT_POSITION = 9;

const FORBIDDEN = new Set(['I', 'O', 'Q']);

/**
 * Format findings for an already trimmed, upper-cased VIN: length and every bad character (all reported at once,
 * so the technician fixes the whole entry in one go).
 */
export function formatFindings(vin: string, path: string): Finding[] {
  const findings: Finding[] = [];
  if (vin.length !== VIN_LENGTH) {
    findings.push({
      code: 'vin.wrong_length',
      path,
      message:
        vin.length === 0
          ? `VIN is empty; expected ${VIN_LENGTH} characters`
          : `VIN has ${vin.length} character${vin.length === 1 ? '' : 's'}; expected exactly ${VIN_LENGTH}`,
    });
  }
  [...vin].forEach((ch, i) => {
    const position = i + 1;
    if (FORBIDDEN.has(ch)) {
      findings.push({
        code: 'vin.forbidden_letter',
        path,
        message: `letter '${ch}' at position ${position} never appears in a VIN (I, O and Q are excluded by 49 CFR 565; did you mean '${ch === 'I' ? '1' : '0'}'?)`,
      });
    } else if (!(ch in VIN_TRANSLITERATION)) {
      findings.push({
        code: 'vin.bad_character',
        path,
        message: `character ${JSON.stringify(ch)} at position ${position} is not allowed; a VIN holds only letters A–Z (not I, O, Q) and digits 0–9`,
      });
    }
  });
  return findings;
}

export type CheckDigitResult =
  | { ok: true; checkDigit: string; sum: number }
  | { ok: false; findings: Finding[] };

/** The weighted sum of 49 CFR 565.15; call only on a VIN that passed `formatFindings`. */
function weightedSum(vin: string): number {
  let sum = 0;
  for (let i = 0; i < VIN_LENGTH; i++) sum += VIN_TRANSLITERATION[vin[i]] * VIN_WEIGHTS[i];
  return sum;
}

function digitFor(sum: number): string {
  const remainder = sum % 11;
  return remainder === 10 ? 'X' : String(remainder);
}

function normalise(vin: unknown): string | undefined {
  return typeof vin === 'string' ? vin.trim().toUpperCase() : undefined;
}

/**
 * The check digit a 17-character VIN should carry at position 9, and the weighted sum it came from. Whatever stands
 * at position 9 is ignored (its weight is 0). Input is trimmed and upper-cased first.
 */
export function computeCheckDigit(vin: string, path = 'vin'): CheckDigitResult {
  const upper = normalise(vin);
  if (upper === undefined) {
    return { ok: false, findings: [{ code: 'vin.not_a_string', path, message: `VIN must be a string of ${VIN_LENGTH} characters` }] };
  }
  const findings = formatFindings(upper, path);
  if (findings.length > 0) return { ok: false, findings };
  const sum = weightedSum(upper);
  return { ok: true, checkDigit: digitFor(sum), sum };
}

export type WithCheckDigitResult = { ok: true; vin: string } | { ok: false; findings: Finding[] };

/**
 * Returns the VIN with position 9 replaced by the correct check digit (for building demo and test vehicles; the
 * other sixteen characters are kept as given).
 */
export function withCheckDigit(vin17: string, path = 'vin'): WithCheckDigitResult {
  const computed = computeCheckDigit(vin17, path);
  if (!computed.ok) return computed;
  const upper = vin17.trim().toUpperCase();
  const i = CHECK_DIGIT_POSITION - 1;
  return { ok: true, vin: upper.slice(0, i) + computed.checkDigit + upper.slice(i + 1) };
}

export type { Finding };
