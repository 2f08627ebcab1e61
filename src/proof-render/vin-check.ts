/**
 * 49 CFR 565.15 check digit, integers only (transliterate, weight, sum mod 11, 10 → "X"). Kept local so the
 * renderer depends on nothing mid-flight; the engine's own VIN module says the same thing at greater length.
 */
const VALUES: Readonly<Record<string, number>> = {
  A: 1, B: 2, C: 3, D: 4, E: 5, F: 6, G: 7, H: 8, J: 1, K: 2, L: 3, M: 4, N: 5, P: 7, R: 9,
  S: 2, T: 3, U: 4, V: 5, W: 6, X: 7, Y: 8, Z: 9,
};
const WEIGHTS = [8, 7, 6, 5, 4, 3, 2, 10, 0, 9, 8, 7, 6, 5, 4, 3, 2];

/** The check character a 17-character VIN should carry in position 9, or null for a malformed VIN. */
export function vinCheckCharacter(vin: string): string | null {
  if (!/^[A-HJ-NPR-Z0-9]{17}$/.test(vin)) return null;
  let sum = 0;
  for (let i = 0; i < 17; i++) {
    const ch = vin[i]!;
    sum += (/[0-9]/.test(ch) ? Number(ch) : VALUES[ch]!) * WEIGHTS[i]!;
  }
  const rest = sum % 11;
  return rest === 10 ? 'X' : String(rest);
}

export function vinCheckDigitMatches(vin: string): boolean {
  const want = vinCheckCharacter(vin);
  return want !== null && vin[8] === want;
}
