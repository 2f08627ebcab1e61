/**
 * Published troubleshooting methods as plain functions, used by the engine and checked against the papers'
 * examples in the tests:
 * - Heckerman, Breese & Rommelse, "Decision-theoretic troubleshooting", CACM 38(3), 1995: expected cost of repair
 *   (ECR) of an inspect-and-repair sequence, the p/C ordering, and the myopic expected cost of an observation (ECO).
 * - de Kleer & Williams, "Diagnosing multiple faults", Artificial Intelligence 32, 1987: minimum expected entropy.
 * - Expected-cost policies stop / Q1 / Q2 / exact V over a small hypothesis set (see policy.ts).
 */
import {
  entropyBits,
  exactQ,
  exactV,
  expectedEntropyAfter,
  lookaheadQ,
  newExactMemo,
  type PolicyModel,
  type PolicyState,
} from './policy';

export interface RepairComponent {
  /** Probability that this component is the (single) fault. */
  p: number;
  /** Cost to inspect it. */
  inspect: number;
  /** Cost to repair it once found faulty. */
  repair: number;
}

/** ECR(s) = Σ_i [(1 − Σ_{j<i} p_j) · Co_i + p_i · Cr_i] + (1 − Σ_i p_i) · Cs, for components in the given order. */
export function expectedCostOfRepair(sequence: readonly RepairComponent[], serviceCall = 0): number {
  let remaining = 1;
  let cost = 0;
  for (const c of sequence) {
    cost += remaining * c.inspect + c.p * c.repair;
    remaining -= c.p;
  }
  return cost + Math.max(remaining, 0) * serviceCall;
}

/** The optimal single-fault order: decreasing p_i / Co_i. Returns indices into `components` and its ECR. */
export function optimalRepairOrder(components: readonly RepairComponent[], serviceCall = 0): { order: number[]; ecr: number } {
  const order = components.map((_, i) => i).sort((a, b) => components[b]!.p / components[b]!.inspect - components[a]!.p / components[a]!.inspect);
  return { order, ecr: expectedCostOfRepair(order.map((i) => components[i]!), serviceCall) };
}

/**
 * Myopic expected cost of observing a test before repairing: ECO = C_o + Σ_k P(o=k) · ECR*(p | o=k), where
 * ECR* is the best-order ECR under the updated probabilities. `likelihood[i][k]` = P(o=k | component i faulty).
 * Also returns the ECR without observing and the break-even observation cost.
 */
export function expectedCostOfObservation(
  components: readonly RepairComponent[],
  observation: { cost: number; likelihood: readonly (readonly number[])[] },
  serviceCall = 0,
): { eco: number; ecrWithout: number; breakEvenCost: number } {
  const total = components.reduce((a, c) => a + c.p, 0);
  const nK = observation.likelihood[0]!.length;
  let after = 0;
  for (let k = 0; k < nK; k++) {
    const joint = components.map((c, i) => (c.p / total) * observation.likelihood[i]![k]!);
    const pk = joint.reduce((a, b) => a + b, 0);
    if (pk <= 0) continue;
    after += pk * optimalRepairOrder(components.map((c, i) => ({ ...c, p: joint[i]! / pk })), serviceCall).ecr;
  }
  const ecrWithout = optimalRepairOrder(components, serviceCall).ecr;
  return { eco: observation.cost + after, ecrWithout, breakEvenCost: ecrWithout - after };
}

/**
 * Likelihood rows for a consistency-based measurement: a candidate predicting value v gives P(x=v) = 1; one that
 * predicts nothing spreads 1/m over the m possible values (de Kleer & Williams 1987).
 */
export function likelihoodFromPredictions(predictions: ReadonlyArray<string | number | null>, values: ReadonlyArray<string | number>): number[][] {
  return predictions.map((pred) => values.map((v) => (pred === null ? 1 / values.length : pred === v ? 1 : 0)));
}

/** A small decision problem in plain arrays: prior over hypotheses, tests with cost and P(o | h) rows. */
export interface DecisionProblem {
  prior: readonly number[];
  tests: ReadonlyArray<{ cost: number; likelihood: readonly (readonly number[])[] }>;
  /** L: cost of a wrong conclusion; stop(e) = L · (1 − max_h P(h|e)). */
  wrongConclusionCost: number;
}

function toModel(problem: DecisionProblem): { model: PolicyModel; state: PolicyState } {
  const total = problem.prior.reduce((a, b) => a + b, 0);
  const L = problem.wrongConclusionCost;
  const model: PolicyModel = {
    nH: problem.prior.length,
    tests: problem.tests.map((t) => ({ cost: t.cost, setupMask: 0, nO: t.likelihood[0]!.length, like: Float64Array.from(t.likelihood.flat()) })),
    setupCosts: [],
    stopCost: (max) => L * (1 - max),
    isTerminal: () => false,
  };
  const state: PolicyState = { p: Float64Array.from(problem.prior, (x) => x / total), done: new Int16Array(problem.tests.length).fill(-1), paid: 0 };
  return { model, state };
}

/** H_e(x) for each test: expected entropy (bits) of the hypotheses after measuring it. Measure the lowest. */
export function expectedEntropies(problem: Pick<DecisionProblem, 'prior' | 'tests'>): number[] {
  const { model, state } = toModel({ ...problem, wrongConclusionCost: 0 });
  return problem.tests.map((_, t) => expectedEntropyAfter(model, state.p, t));
}

/** Entropy of the prior, in bits. */
export const priorEntropy = (prior: readonly number[]) => {
  const total = prior.reduce((a, b) => a + b, 0);
  return entropyBits(prior.map((p) => p / total));
};

/** stop(e) = L · (1 − max_h P(h|e)) at the prior. */
export function stopCost(problem: DecisionProblem): number {
  const { model, state } = toModel(problem);
  return model.stopCost(Math.max(...state.p));
}

/** Q1(e, t) for each test: its cost, then stop. */
export function myopicQ(problem: DecisionProblem): number[] {
  const { model, state } = toModel(problem);
  return problem.tests.map((_, t) => lookaheadQ(model, state, t, 1));
}

/** Q2(e, t) for each test: its cost, then the better of stopping or the best myopic test. */
export function twoStepQ(problem: DecisionProblem): number[] {
  const { model, state } = toModel(problem);
  return problem.tests.map((_, t) => lookaheadQ(model, state, t, 2));
}

/** Exact V(e) at the prior, and exact Q(e, t) for each first test. */
export function exactValue(problem: DecisionProblem): { value: number; q: number[] } {
  const { model, state } = toModel(problem);
  const memo = newExactMemo();
  return { value: exactV(model, state, memo), q: problem.tests.map((_, t) => exactQ(model, state, t, memo)) };
}
