import { describe, expect, it } from 'vitest';
import { DenseLu } from '../../../src/engine/circuit/solver';

describe('dense LU with partial pivoting', () => {
  it('solves a system that needs a row swap (zero on the first pivot)', () => {
    // b is built from the known x = (1, 2, 3), so the check is plain substitution.
    const lu = new DenseLu(3);
    lu.a.set([0, 2, 1, 1, 1, 1, 2, 1, 3]);
    const x = [1, 2, 3];
    const b = new Float64Array([0 * 1 + 2 * 2 + 1 * 3, 1 + 2 + 3, 2 + 2 + 9]);
    expect(lu.factor()).toBe(true);
    lu.solve(b);
    b.forEach((v, i) => expect(v).toBeCloseTo(x[i]!, 12));
  });

  it('reports a singular matrix', () => {
    const lu = new DenseLu(2);
    lu.a.set([1, 2, 2, 4]);
    expect(lu.factor()).toBe(false);
  });
});
