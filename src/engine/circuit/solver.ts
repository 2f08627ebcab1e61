/**
 * Dense LU factorisation with partial pivoting on a row-major Float64Array. The circuits have 20–30 unknowns, so
 * a dense factorisation is fast and simple; factor once, then solve any number of right-hand sides.
 */

/** Smallest pivot accepted; anything below means the system is singular (a floating source loop). */
const PIVOT_FLOOR = 1e-300;

export class DenseLu {
  readonly n: number;
  readonly a: Float64Array;
  readonly pivots: Int32Array;

  constructor(n: number) {
    this.n = n;
    this.a = new Float64Array(n * n);
    this.pivots = new Int32Array(n);
  }

  /** Factors `a` in place (Doolittle, row pivoting). Returns false when the matrix is singular. */
  factor(): boolean {
    const { n, a, pivots } = this;
    for (let k = 0; k < n; k++) {
      let p = k;
      let best = Math.abs(a[k * n + k]!);
      for (let i = k + 1; i < n; i++) {
        const v = Math.abs(a[i * n + k]!);
        if (v > best) {
          best = v;
          p = i;
        }
      }
      if (!(best > PIVOT_FLOOR)) return false;
      pivots[k] = p;
      if (p !== k) {
        const rk = k * n;
        const rp = p * n;
        for (let j = 0; j < n; j++) {
          const t = a[rk + j]!;
          a[rk + j] = a[rp + j]!;
          a[rp + j] = t;
        }
      }
      const rk = k * n;
      const pivot = a[rk + k]!;
      for (let i = k + 1; i < n; i++) {
        const ri = i * n;
        const f = a[ri + k]! / pivot;
        if (f === 0) continue;
        a[ri + k] = f;
        for (let j = k + 1; j < n; j++) a[ri + j] = a[ri + j]! - f * a[rk + j]!;
      }
    }
    return true;
  }

  /** Solves in place: `b` becomes x with A·x = b (A as given before `factor`). */
  solve(b: Float64Array): void {
    const { n, a, pivots } = this;
    for (let k = 0; k < n; k++) {
      const p = pivots[k]!;
      if (p !== k) {
        const t = b[k]!;
        b[k] = b[p]!;
        b[p] = t;
      }
    }
    for (let i = 1; i < n; i++) {
      const ri = i * n;
      let s = b[i]!;
      for (let j = 0; j < i; j++) s -= a[ri + j]! * b[j]!;
      b[i] = s;
    }
    for (let i = n - 1; i >= 0; i--) {
      const ri = i * n;
      let s = b[i]!;
      for (let j = i + 1; j < n; j++) s -= a[ri + j]! * b[j]!;
      b[i] = s / a[ri + i]!;
    }
  }
}
