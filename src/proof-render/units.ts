/**
 * Unit handling for the proof: converting a printed value to its SI unit, to check the view's own `si` numbers and
 * to plot readings and bands on one axis.
 */

/** SI prefixes (BIPM SI Brochure, 9th edition, table 7); both "µ" (U+00B5) and "μ" (U+03BC) and plain "u" accepted. */
const PREFIXES: Readonly<Record<string, number>> = {
  p: 1e-12, n: 1e-9, 'µ': 1e-6, 'μ': 1e-6, u: 1e-6, m: 1e-3, k: 1e3, M: 1e6, G: 1e9,
};

/** Units that take prefixes, and their Ω spellings ("Ω" U+03A9 and "Ω" U+2126 ohm sign). */
const PREFIXABLE = new Set(['V', 'A', 'Ω', 'Ω', 'Pa', 'Hz', 's']);

/** Affine and non-SI conversions: value_si = value · factor + offset. */
const SPECIAL: Readonly<Record<string, { siUnit: string; factor: number; offset: number }>> = {
  // t/K = t/°C + 273.15 (NIST SP 811, 4.2.1.1); t/°C = (t/°F − 32)/1.8 (NIST SP 811, B.8)
  '°C': { siUnit: 'K', factor: 1, offset: 273.15 },
  '°F': { siUnit: 'K', factor: 1 / 1.8, offset: 273.15 - 32 / 1.8 },
  // NIST SP 811, appendix B: 1 psi = 6894.757 Pa; 1 inHg (conventional) = 3386.389 Pa
  psi: { siUnit: 'Pa', factor: 6894.757, offset: 0 },
  inHg: { siUnit: 'Pa', factor: 3386.389, offset: 0 },
};

function normaliseOhm(unit: string): string {
  return unit.replace(/\u2126/g, 'Ω');
}

/** Every SI unit a display unit may map to: its own coherent unit, or the unit itself when it has none. */
export function siTargets(unit: string): Array<{ siUnit: string; convert: (v: number) => number }> {
  const u = normaliseOhm(unit);
  const targets: Array<{ siUnit: string; convert: (v: number) => number }> = [{ siUnit: u, convert: (v) => v }];
  const special = SPECIAL[u];
  if (special) targets.push({ siUnit: special.siUnit, convert: (v) => v * special.factor + special.offset });
  if (u.length > 1 && PREFIXES[u[0]!] !== undefined && PREFIXABLE.has(u.slice(1))) {
    const factor = PREFIXES[u[0]!]!;
    targets.push({ siUnit: u.slice(1), convert: (v) => v * factor });
  }
  return targets;
}

/** Convert `value` in `unit` to `siUnit`, or null when the units do not convert. */
export function convertTo(value: number, unit: string, siUnit: string): number | null {
  const target = siTargets(unit).find((t) => t.siUnit === normaliseOhm(siUnit));
  return target ? target.convert(value) : null;
}

/** Relative agreement used when checking a caller's SI value against the converted one. */
export function nearlyEqual(a: number, b: number, rel = 1e-9): boolean {
  return Math.abs(a - b) <= rel * Math.max(1, Math.abs(a), Math.abs(b));
}

/** Print a bound as entered by the caller (no rounding), with a typographic minus. */
export function printBound(value: number): string {
  const text = String(value);
  return text.startsWith('-') ? `\u2212${text.slice(1)}` : text;
}
