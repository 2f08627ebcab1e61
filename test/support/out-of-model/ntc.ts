/**
 * A generic NTC thermistor curve by the Steinhart–Hart equation, 1/T = A + B·ln R + C·(ln R)³ with T in kelvin
 * (J. S. Steinhart and S. R. Hart, "Calibration curves for thermistors", Deep-Sea Research 15 (1968) 497–503).
 * The curves are generic, not any maker's part: each is fitted exactly through three (temperature, resistance)
 * points that are typical of automotive coolant/air temperature sensors — the points are "from memory".
 */

export interface SteinhartHart {
  id: string;
  A: number;
  B: number;
  C: number;
}

const KELVIN = 273.15;

/** Fits A, B, C exactly through three points (computed: a 3 × 3 linear system in A, B, C). */
export function fitSteinhartHart(id: string, points: ReadonlyArray<readonly [celsius: number, ohms: number]>): SteinhartHart {
  const [p1, p2, p3] = points.map(([c, r]) => ({ y: 1 / (c + KELVIN), L: Math.log(r) }));
  // Differences eliminate A, then B, leaving C (the standard closed form of the three-point fit).
  const g2 = (p2!.y - p1!.y) / (p2!.L - p1!.L);
  const g3 = (p3!.y - p1!.y) / (p3!.L - p1!.L);
  const C = (g3 - g2) / (p3!.L - p2!.L) / (p1!.L + p2!.L + p3!.L);
  const B = g2 - C * (p1!.L ** 2 + p1!.L * p2!.L + p2!.L ** 2);
  const A = p1!.y - (B + C * p1!.L ** 2) * p1!.L;
  return { id, A, B, C };
}

/** Resistance at a temperature: the cubic in ln R solved in closed form (Cardano; one real root for A, B, C > 0). */
export function ntcOhms(curve: SteinhartHart, celsius: number): number {
  const y = (curve.A - 1 / (celsius + KELVIN)) / curve.C;
  const x = Math.sqrt((curve.B / (3 * curve.C)) ** 3 + (y / 2) ** 2);
  return Math.exp(Math.cbrt(x - y / 2) - Math.cbrt(x + y / 2));
}

/** Temperature of a resistance (the equation itself). */
export function ntcCelsius(curve: SteinhartHart, ohms: number): number {
  const L = Math.log(ohms);
  return 1 / (curve.A + curve.B * L + curve.C * L ** 3) - KELVIN;
}

/** Generic curves, points from memory: a low-ohm coolant-style sensor and a 10 kΩ-at-25 °C air-style sensor. */
export const NTC_CURVES: readonly SteinhartHart[] = [
  fitSteinhartHart('generic-2k2-at-25C', [
    [-20, 21_500],
    [25, 2_200],
    [100, 150],
  ]),
  fitSteinhartHart('generic-10k-at-25C', [
    [-20, 97_000],
    [25, 10_000],
    [100, 680],
  ]),
];
