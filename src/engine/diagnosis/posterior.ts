/**
 * Bayes over causes and latent circuit classes jointly, in log space:
 *
 *   log w(h, c) = log P(h) + log P(c) + Σ_groups Σ_clusters log P(y | h, c),   P(h | e) = Σ_c w(h, c) / Z
 *
 * The class (module bias, sensor position, temperature) is one property of the circuit, so every reading of a
 * circuit is weighed under the same class (Gelman et al., *Bayesian Data Analysis*, 3rd ed., ch. 5), never averaged
 * per test. Keeps log Z and compares the evidence under the modelled causes with the leak ("unknown"): far below
 * it means a mis-probe or a wrong connector state rather than a cause.
 */
import { broadDensity } from './meter-error';
import { OUTLIER_WEIGHT, readingLikelihood } from './predictive';
import type { Cluster, Evidence } from './evidence';
import type { Test, Tree } from './tree-model';

export type { Evidence } from './evidence';

export interface Posterior {
  p: Float64Array;
  /** P(class | cause, e) at h * nClasses + c. */
  classGivenCause: Float64Array;
  logWeights: Float64Array;
  /** log P(e) under the tree, "unknown" included. */
  logZ: number;
  /** log P(e | a modelled cause) − log P(e | the leak: anything the instruments can show). */
  logEvidenceVsChance: number;
  /** Per cluster of readings: its likelihood under every (h, c) and the broad density at its value. */
  weighed: Weighed[];
  /** log Σ_c w(h, c) per cause. */
  logPerCause: Float64Array;
}

export interface Weighed {
  evidence: Evidence;
  cluster: Cluster;
  like: Float64Array;
  broad: number;
  /** Leave-one-out view of this cluster, computed once when asked for (see `leaveOneOut`). */
  loo?: LeaveOneOut;
}

export function logSumExp(values: ArrayLike<number>, skip = -1, from = 0, to = values.length): number {
  let max = -Infinity;
  for (let i = from; i < to; i++) if (i !== skip && values[i]! > max) max = values[i]!;
  if (max === -Infinity) return -Infinity;
  let s = 0;
  for (let i = from; i < to; i++) if (i !== skip) s += Math.exp(values[i]! - max);
  return max + Math.log(s);
}

/**
 * Likelihood of one cluster under every (h, c), written into `out` (length nH · nC). A "no fault now" cause on a
 * test whose readings flip is an intermittent: half the healthy circuit, half anything (the notes' mixture
 * q·P(y | fault) + (1 − q)·P(y | healthy), with the fault's reading unknown).
 */
export function clusterLikelihoods(tree: Tree, test: Test, cluster: Cluster, intermittent: boolean, out: Float64Array): void {
  const nH = tree.hypotheses.length;
  const nC = tree.classes.length;
  const pred = test.predictive;
  if (!pred) {
    const nO = test.outcomes.length;
    for (let h = 0; h < nH; h++) {
      const l = h === tree.healthyIndex && intermittent ? 0.5 * test.like[h * nO + cluster.y]! + 0.5 / nO : test.like[h * nO + cluster.y]!;
      for (let c = 0; c < nC; c++) out[h * nC + c] = l;
    }
    return;
  }
  const q = test.weighAs;
  const cache = new Map<number, number>();
  const broad = broadDensity(q, cluster.y);
  for (let k = 0; k < nH * nC; k++) {
    const cell = pred.cellOf[k]!;
    let l = cache.get(cell);
    if (l === undefined) cache.set(cell, (l = readingLikelihood(cell < 0 ? undefined : pred.cells[cell], q, cluster.y, cluster.n)));
    out[k] = intermittent && Math.floor(k / nC) === tree.healthyIndex ? 0.5 * l + 0.5 * broad : l;
  }
}

export function posterior(tree: Tree, evidence: readonly Evidence[]): Posterior {
  const nH = tree.hypotheses.length;
  const nC = tree.classes.length;
  const w = new Float64Array(nH * nC);
  for (let h = 0; h < nH; h++) for (let c = 0; c < nC; c++) w[h * nC + c] = tree.logPrior[h]! + tree.logLatentPrior[h * nC + c]!;
  let logLeak = 0;
  const leak = tree.unknownIndex * nC;
  const weighed: Weighed[] = [];
  for (const e of evidence) {
    const test = tree.tests[e.test]!;
    for (const cluster of e.clusters) {
      const like = new Float64Array(nH * nC);
      clusterLikelihoods(tree, test, cluster, e.intermittent, like);
      weighed.push({ evidence: e, cluster, like, broad: test.predictive ? broadDensity(test.weighAs, cluster.y) : 1 / test.outcomes.length });
      for (let k = 0; k < w.length; k++) if (w[k] !== -Infinity) w[k] = w[k]! + Math.log(like[k]!);
      logLeak += Math.log(like[leak]!);
    }
  }
  const logZ = logSumExp(w);
  const p = new Float64Array(nH);
  const classGivenCause = new Float64Array(nH * nC);
  const perCause = new Float64Array(nH);
  for (let h = 0; h < nH; h++) {
    const lh = logSumExp(w, -1, h * nC, (h + 1) * nC);
    perCause[h] = lh;
    p[h] = Math.exp(lh - logZ);
    for (let c = 0; c < nC; c++) classGivenCause[h * nC + c] = Math.exp(w[h * nC + c]! - lh);
  }
  const modelledPrior = Math.log(1 - tree.hypotheses[tree.unknownIndex]!.prior);
  const logEvidenceVsChance = logSumExp(perCause, tree.unknownIndex) - modelledPrior - logLeak;
  return { p, classGivenCause, logWeights: w, logZ, logEvidenceVsChance, weighed, logPerCause: perCause };
}

/**
 * The group most likely to hold a wrong reading: the one whose removal raises the evidence for the modelled causes
 * the most. Returns its latest reading.
 */
export function mostDoubtfulReading(tree: Tree, evidence: readonly Evidence[]): { readingId: string; gain: number; test: number } | undefined {
  if (evidence.length < 2) return undefined;
  const full = posterior(tree, evidence).logEvidenceVsChance;
  let best: { readingId: string; gain: number; test: number } | undefined;
  evidence.forEach((e, i) => {
    const gain = posterior(tree, evidence.filter((_, j) => j !== i)).logEvidenceVsChance - full;
    if (!best || gain > best.gain) best = { readingId: e.readingIds.at(-1)!, gain, test: e.test };
  });
  return best;
}

/**
 * Leave-one-out view of the posterior for one weighed cluster: P(h | the other readings) and the cluster's
 * likelihood under h as the other readings predict it (its classes weighted by P(class | h, the other readings)).
 * A reading is checked against what the rest predicts, never against a posterior it has already moved (the class
 * can shift to absorb a reading its own prediction would call impossible). Since Σ_c P(c | h, rest)·L(h, c) =
 * Σ_c w(h, c) / Σ_c w(h, c)/L(h, c), one pass over the classes gives both.
 */
export interface LeaveOneOut {
  p: Float64Array;
  /** P(this cluster | h, the other readings). */
  causeLike: Float64Array;
}

export function leaveOneOut(tree: Tree, post: Posterior, x: Weighed): LeaveOneOut {
  if (x.loo) return x.loo;
  const nH = tree.hypotheses.length;
  const nC = tree.classes.length;
  const rest = new Float64Array(nH);
  const w = new Float64Array(nC);
  for (let h = 0; h < nH; h++) {
    for (let c = 0; c < nC; c++) {
      const k = h * nC + c;
      w[c] = post.logWeights[k] === -Infinity ? -Infinity : post.logWeights[k]! - Math.log(x.like[k]!);
    }
    rest[h] = logSumExp(w);
  }
  const logZ = logSumExp(rest);
  const p = new Float64Array(nH);
  const causeLike = new Float64Array(nH);
  for (let h = 0; h < nH; h++) {
    p[h] = rest[h] === -Infinity ? 0 : Math.exp(rest[h]! - logZ);
    causeLike[h] = rest[h] === -Infinity ? 0 : Math.exp(post.logPerCause[h]! - rest[h]!);
  }
  return (x.loo = { p, causeLike });
}

/**
 * Readings a cause cannot explain: better explained by the heavy tail than by what the cause predicts given the
 * other readings (leave-one-out). A "no fault now" cause is not contradicted by readings that flip (that is its
 * intermittent).
 */
export function contradictingReadings(tree: Tree, post: Posterior, h: number): string[] {
  return post.weighed.flatMap((x) => {
    const test = tree.tests[x.evidence.test]!;
    if (h === tree.healthyIndex && x.evidence.intermittent) return [];
    if (!test.predictive) return test.like[h * test.outcomes.length + x.cluster.y]! < 0.05 ? x.cluster.readingIds : [];
    // L = (1 − ε)·core + ε·broad, so the core is below the tail exactly when L < 2ε·broad.
    return leaveOneOut(tree, post, x).causeLike[h]! < 2 * OUTLIER_WEIGHT * x.broad ? x.cluster.readingIds : [];
  });
}

/**
 * Each reading's Bayes factor for the winner against the rest, both as predicted from the other readings
 * (leave-one-out), strongest first: those above 1.5 decided the conclusion, those above 3 confirm it directly.
 */
export function readingFactors(tree: Tree, post: Posterior, winner: number): Array<{ ids: string[]; factor: number }> {
  return post.weighed
    .map((x) => {
      const loo = leaveOneOut(tree, post, x);
      let rest = 0;
      let restMass = 0;
      for (let h = 0; h < loo.p.length; h++) {
        if (h === winner) continue;
        rest += loo.p[h]! * loo.causeLike[h]!;
        restMass += loo.p[h]!;
      }
      return { ids: x.cluster.readingIds, factor: loo.causeLike[winner]! / (restMass > 0 ? rest / restMass : 1) };
    })
    .sort((a, b) => b.factor - a.factor);
}
