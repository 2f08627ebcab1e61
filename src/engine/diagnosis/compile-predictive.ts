/**
 * Compiles a test's stored predictive block: cells as typed arrays, the cell of each (cause, class), the outcomes
 * as a partition of the reading axis, and P(outcome | cause, class) integrated from the same densities (for labels
 * and for planning; a reading itself is weighed by its density, never by its band).
 */
import { broadMass, type WeighQuantity } from './meter-error';
import { coreMass, OUTLIER_WEIGHT, type Cell } from './predictive';
import type { Interval } from './outcome-rules';
import type { CompiledPredictive } from './tree-model';
import type { PredictiveDocument, TestDocument, TreeDocument } from './tree-schema';

/** How a test's value is weighed: its quantity, or for a comparison the difference in the test's unit. */
export function weighAs(test: Pick<TestDocument, 'request' | 'compare' | 'unit'>): WeighQuantity {
  return test.compare ? (test.unit === '°C' ? 'difference_°C' : 'difference_V') : test.request.quantity;
}

/** Outcome intervals made into a partition: each guard band split at its middle, the ends left open. */
export function partitionOf(intervals: Interval[]): Array<{ lo: number; hi: number }> {
  const order = intervals.map((r, i) => ({ r, i })).sort((a, b) => a.r.lo - b.r.lo);
  const out = new Array<{ lo: number; hi: number }>(intervals.length);
  order.forEach(({ i }, k) => {
    const lo = k === 0 ? -Infinity : (order[k - 1]!.r.hi + order[k]!.r.lo) / 2;
    const hi = k === order.length - 1 ? Infinity : (order[k]!.r.hi + order[k + 1]!.r.lo) / 2;
    out[i] = { lo, hi };
  });
  return out;
}

/**
 * `latent` lists the tree's latent slots (alternative a, class c); a cause with fewer alternatives than slots has
 * no cell (-1, weight 0) in the slots beyond its own.
 */
export function compilePredictive(block: PredictiveDocument, test: TestDocument, doc: TreeDocument, latent: ReadonlyArray<{ alternative: number; klass: number }>, nClasses: number, intervals: Interval[]): CompiledPredictive {
  const cells: Cell[] = block.cells.map((c) => ({ q: Float64Array.from(c.q), overload: c.overload ?? 0 }));
  const nH = doc.hypotheses.length;
  const nO = test.outcomes.length;
  const nL = latent.length;
  const cellOf = new Int32Array(nH * nL).fill(-1);
  doc.hypotheses.forEach((h, hi) => {
    const row = block.index[h.id];
    if (!h.unknown && row) latent.forEach((l, k) => (cellOf[hi * nL + k] = row[l.alternative * nClasses + l.klass] ?? -1));
  });
  const partition = partitionOf(intervals);
  const quantity = weighAs(test);
  const broad = partition.map((b) => broadMass(quantity, b.lo, b.hi));
  const core = cells.map((cell) => partition.map((b) => coreMass(cell, b.lo, b.hi, quantity)));
  const bandLike = new Float64Array(nH * nL * nO);
  for (let k = 0; k < nH * nL; k++) {
    const cell = cellOf[k]!;
    let sum = 0;
    for (let o = 0; o < nO; o++) sum += bandLike[k * nO + o] = cell < 0 ? broad[o]! : (1 - OUTLIER_WEIGHT) * core[cell]![o]! + OUTLIER_WEIGHT * broad[o]!;
    for (let o = 0; o < nO; o++) bandLike[k * nO + o] = bandLike[k * nO + o]! / sum;
  }
  return { cells, cellOf, partition, bandLike };
}
