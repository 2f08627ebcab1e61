/**
 * A cause's predicted reading on one test, for one class of circuit: quantiles of the circuit model's Monte Carlo
 * draws (a piecewise-uniform density between them) and the share of ohmmeter overloads. A reading's likelihood is
 * that density convolved with the instrument's error and the model's own discrepancy (meter-error.ts) (a Gaussian kernel no narrower than the meter: Silverman,
 * *Density Estimation for Statistics and Data Analysis*, 1986), mixed with a small weight on the broad density so
 * one misread cannot rule the true cause out (a contaminated model: Box & Tiao, *Biometrika* 1968).
 */
import type { WeighQuantity as Quantity } from './meter-error';
import { broadDensity, kernelSigma } from './meter-error';

/** Weight of the heavy tail in every modelled cause's likelihood. */
export const OUTLIER_WEIGHT = 0.02;

/** The quantile levels stored per cell (denser in the tails, where a reading decides between causes). */
export const QUANTILE_LEVELS = [0, 0.01, 0.025, 0.05, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 0.95, 0.975, 0.99, 1];

export interface Cell {
  /** Quantiles of the finite readings at QUANTILE_LEVELS (empty when every draw was an overload). */
  q: Float64Array;
  /** Share of draws beyond the ohmmeter's range. */
  overload: number;
}

/**
 * Each segment between stored quantiles is blurred by twice its own width besides the meter's error: an adaptive
 * kernel (Silverman 1986, ch. 5) that smooths sampling noise where draws are sparse and keeps point masses (a dead
 * supply's 0 V, a clamped converter's 5.00 V) sharp.
 */
const ADAPTIVE = 2.0;

const SQRT2 = Math.SQRT2;
const INV_SQRT_2PI = 1 / Math.sqrt(2 * Math.PI);

/** erf by Abramowitz & Stegun 7.1.26 (|error| < 1.5e-7). */
function erf(x: number): number {
  const s = x < 0 ? -1 : 1;
  const a = Math.abs(x);
  const t = 1 / (1 + 0.3275911 * a);
  const y = 1 - ((((1.061405429 * t - 1.453152027) * t + 1.421413741) * t - 0.284496736) * t + 0.254829592) * t * Math.exp(-a * a);
  return s * y;
}
export const normalCdf = (z: number) => 0.5 * (1 + erf(z / SQRT2));
const normalPdf = (z: number) => INV_SQRT_2PI * Math.exp(-0.5 * z * z);
/** ∫ Φ: G(z) = z·Φ(z) + φ(z). */
const G = (z: number) => z * normalCdf(z) + normalPdf(z);

/** Sums `term(mass, a, b, sigma)` over the segments between stored quantiles, sigma = the meter's ⊕ the adaptive blur. */
function overSegments(cell: Cell, meterSigma: (a: number, b: number) => number, term: (m: number, a: number, b: number, sigma: number) => number): number {
  const q = cell.q;
  let sum = 0;
  for (let k = 0; k + 1 < q.length; k++) {
    const a = q[k]!;
    const b = q[k + 1]!;
    sum += term(QUANTILE_LEVELS[k + 1]! - QUANTILE_LEVELS[k]!, a, b, Math.hypot(meterSigma(a, b), ADAPTIVE * (b - a)));
  }
  return (1 - cell.overload) * sum;
}

/** Density of the cell at a finite reading y, the meter's error `meterSigma` (or the probability of an overload). */
export function coreDensity(cell: Cell, y: number, meterSigma: number): number {
  if (y === Number.POSITIVE_INFINITY) return cell.overload;
  return overSegments(
    cell,
    () => meterSigma,
    (m, a, b, sigma) => {
      if (y < a - 8 * sigma || y > b + 8 * sigma) return 0;
      const w = b - a;
      return w < 1e-3 * sigma ? (m * normalPdf((y - a) / sigma)) / sigma : (m * (normalCdf((y - a) / sigma) - normalCdf((y - b) / sigma))) / w;
    },
  );
}

/** Probability that a reading lands in [lo, hi) (an open top includes the overload). */
export function coreMass(cell: Cell, lo: number, hi: number, quantity: Quantity): number {
  const finite = overSegments(
    cell,
    (a, b) => kernelSigma(quantity, (a + b) / 2),
    (m, a, b, sigma) => {
      const w = b - a;
      if (w < 1e-3 * sigma) return m * (normalCdf((hi - a) / sigma) - normalCdf((lo - a) / sigma));
      const up = Number.isFinite(hi) ? (sigma * (G((hi - a) / sigma) - G((hi - b) / sigma))) / w : 1;
      const down = Number.isFinite(lo) ? (sigma * (G((lo - a) / sigma) - G((lo - b) / sigma))) / w : 0;
      return m * (up - down);
    },
  );
  return finite + (hi === Number.POSITIVE_INFINITY ? cell.overload : 0);
}

/**
 * Likelihood of a (possibly repeated) reading under a cell: `n` agreeing readings averaging `y` tighten the kernel
 * by √n (the repeats re-measure the meter, not the circuit). `cell` undefined = a cause the model cannot predict
 * on this test: the broad density.
 */
export function readingLikelihood(cell: Cell | undefined, quantity: Quantity, y: number, n = 1): number {
  const broad = broadDensity(quantity, y);
  if (!cell) return broad;
  // Every diagnose() call re-weighs all readings taken so far: the same (cell, reading) pairs come back each time.
  let memo = DENSITY_MEMO.get(cell);
  if (!memo) DENSITY_MEMO.set(cell, (memo = new Map()));
  const key = `${quantity}|${y}|${n}`;
  const known = memo.get(key);
  if (known !== undefined) return known;
  const sigma = kernelSigma(quantity, y, n);
  const l = (1 - OUTLIER_WEIGHT) * coreDensity(cell, y, sigma) + OUTLIER_WEIGHT * broad;
  if (memo.size >= DENSITY_MEMO_SIZE) memo.clear();
  memo.set(key, l);
  return l;
}

/** Densities already computed, per cell (bounded: a long-running service sees endless distinct readings). */
const DENSITY_MEMO = new WeakMap<Cell, Map<string, number>>();
const DENSITY_MEMO_SIZE = 256;
