/**
 * Bayes in log space: log P(h | e) = log P(h) + Σ_j log L_tj[h][o_j] − log Z. Keeps log Z, and compares the
 * evidence under the modelled causes with chance (every outcome equally likely): far below chance means a
 * mis-probe or a wrong connector state rather than a cause.
 */
import type { Tree } from './tree-model';

export interface Evidence {
  readingId: string;
  test: number;
  outcome: number;
}

export interface Posterior {
  p: Float64Array;
  logWeights: Float64Array;
  /** log P(e) under the tree, "unknown" included. */
  logZ: number;
  /** log P(e | a modelled cause) − log P(e | every outcome equally likely). */
  logEvidenceVsChance: number;
}

function logSumExp(values: ArrayLike<number>, skip = -1): number {
  let max = -Infinity;
  for (let i = 0; i < values.length; i++) if (i !== skip && values[i]! > max) max = values[i]!;
  if (max === -Infinity) return -Infinity;
  let s = 0;
  for (let i = 0; i < values.length; i++) if (i !== skip) s += Math.exp(values[i]! - max);
  return max + Math.log(s);
}

export function posterior(tree: Tree, evidence: readonly Evidence[]): Posterior {
  const nH = tree.hypotheses.length;
  const w = tree.logPrior.slice();
  let logChance = 0;
  for (const e of evidence) {
    const test = tree.tests[e.test]!;
    const nO = test.outcomes.length;
    for (let h = 0; h < nH; h++) w[h] = w[h]! + test.logLike[h * nO + e.outcome]!;
    logChance -= Math.log(nO);
  }
  const logZ = logSumExp(w);
  const p = w.map((x) => Math.exp(x - logZ));
  const modelledPrior = Math.log(1 - tree.hypotheses[tree.unknownIndex]!.prior);
  const logEvidenceVsChance = logSumExp(w, tree.unknownIndex) - modelledPrior - logChance;
  return { p, logWeights: w, logZ, logEvidenceVsChance };
}

/**
 * The reading most likely to be wrong: the one whose removal raises the evidence for the modelled causes the most.
 */
export function mostDoubtfulReading(tree: Tree, evidence: readonly Evidence[]): { readingId: string; gain: number } | undefined {
  if (evidence.length < 2) return undefined;
  const full = posterior(tree, evidence).logEvidenceVsChance;
  let best: { readingId: string; gain: number } | undefined;
  evidence.forEach((e, i) => {
    const gain = posterior(tree, evidence.filter((_, j) => j !== i)).logEvidenceVsChance - full;
    if (!best || gain > best.gain) best = { readingId: e.readingId, gain };
  });
  return best;
}

/**
 * The readings that decided a conclusion: those whose outcome favoured the winner over the other causes (Bayes
 * factor against the posterior-weighted rest above 1.5), strongest first.
 */
export function decidingReadings(tree: Tree, evidence: readonly Evidence[], p: Float64Array, winner: number): string[] {
  const scored = evidence.map((e) => {
    const test = tree.tests[e.test]!;
    const nO = test.outcomes.length;
    let rest = 0;
    let restMass = 0;
    for (let h = 0; h < p.length; h++) {
      if (h === winner) continue;
      rest += p[h]! * test.like[h * nO + e.outcome]!;
      restMass += p[h]!;
    }
    const factor = test.like[winner * nO + e.outcome]! / (restMass > 0 ? rest / restMass : 1);
    return { id: e.readingId, factor };
  });
  return scored.filter((s) => s.factor > 1.5).sort((a, b) => b.factor - a.factor).map((s) => s.id);
}
