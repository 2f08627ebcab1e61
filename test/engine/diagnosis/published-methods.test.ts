import { describe, expect, it } from 'vitest';
import {
  exactValue,
  expectedCostOfObservation,
  expectedCostOfRepair,
  expectedEntropies,
  likelihoodFromPredictions,
  myopicQ,
  optimalRepairOrder,
  stopCost,
  twoStepQ,
  type DecisionProblem,
  type RepairComponent,
} from '../../../src/engine/diagnosis';

// Heckerman, Breese & Rommelse, "Decision-theoretic troubleshooting", CACM 38(3), 1995: single-fault
// inspect-and-repair sequences. Check values computed from the paper's ECR formula (see diagnosis-methods.md).
const components: RepairComponent[] = [
  { p: 0.5, inspect: 10, repair: 20 },
  { p: 0.3, inspect: 3, repair: 15 },
  { p: 0.2, inspect: 5, repair: 30 },
];

function permutations(n: number): number[][] {
  if (n === 1) return [[0]];
  return permutations(n - 1).flatMap((p) => Array.from({ length: n }, (_, i) => [...p.slice(0, i), n - 1, ...p.slice(i)]));
}

describe('expected cost of repair (Heckerman, Breese & Rommelse 1995; values computed from the ECR formula)', () => {
  it.each([
    ['c2, c1, c3', [1, 0, 2], 31.5],
    ['c3, c1, c2', [2, 0, 1], 34.4],
    ['c1, c2, c3', [0, 1, 2], 10 + 10 + 0.5 * 3 + 4.5 + 0.2 * 5 + 6],
  ])('gives ECR of order %s as computed', (_name, order, ecr) => {
    expect(expectedCostOfRepair(order.map((i) => components[i]!))).toBeCloseTo(ecr, 10);
  });

  it('orders by decreasing p / inspection cost: c2, c1, c3 with ECR 31.5, the least of all six orders', () => {
    const best = optimalRepairOrder(components);
    expect(best.order).toEqual([1, 0, 2]);
    expect(best.ecr).toBeCloseTo(31.5, 10);
    const all = permutations(3).map((o) => expectedCostOfRepair(o.map((i) => components[i]!)));
    expect(Math.min(...all)).toBeCloseTo(31.5, 10);
    expect(Math.max(...all)).toBeCloseTo(34.4, 10);
  });

  it('charges the service call for the probability no component explains', () => {
    const partial = components.map((c) => ({ ...c, p: c.p * 0.9 }));
    expect(expectedCostOfRepair(partial, 100) - expectedCostOfRepair(partial, 0)).toBeCloseTo(0.1 * 100, 10);
  });
});

describe('expected cost of an observation (Heckerman, Breese & Rommelse 1995; values computed)', () => {
  const test = { cost: 2, likelihood: [[0.9, 0.1], [0.1, 0.9], [0.5, 0.5]] };
  it('gives ECO 31.55 for a test of cost 2 with P(pos | c1, c2, c3) = (0.9, 0.1, 0.5), so do not test', () => {
    const r = expectedCostOfObservation(components, test);
    expect(r.eco).toBeCloseTo(31.55, 2);
    expect(r.ecrWithout).toBeCloseTo(31.5, 10);
    expect(r.eco).toBeGreaterThan(r.ecrWithout);
  });
  it('breaks even at an observation cost of 1.95', () => {
    const r = expectedCostOfObservation(components, test);
    expect(r.breakEvenCost).toBeCloseTo(1.95, 2);
    expect(expectedCostOfObservation(components, { ...test, cost: r.breakEvenCost }).eco).toBeCloseTo(31.5, 8);
  });
});

describe('minimum expected entropy (de Kleer & Williams, "Diagnosing multiple faults", 1987; values computed)', () => {
  // Multiplier–adder circuit: A=3, B=2, C=2, D=3, E=3; F observed 10, G observed 12. Candidates [A1], [M1],
  // [A2,M2], [M2,M3] with probabilities 0.495, 0.495, 0.005, 0.005 and their predictions for X, Y, Z.
  const prior = [0.495, 0.495, 0.005, 0.005];
  const values = [4, 6, 8];
  const measure = (predictions: number[]) => ({ cost: 1, likelihood: likelihoodFromPredictions(predictions, values) });
  const tests = [measure([6, 4, 6, 6]), measure([6, 6, 4, 4]), measure([6, 6, 6, 8])];

  it.each([
    ['X', 0, 0.0809],
    ['Y', 1, 1.0],
    ['Z', 2, 1.0354],
  ])('gives H_e(%s) as computed', (_name, index, bits) => {
    expect(expectedEntropies({ prior, tests })[index]).toBeCloseTo(bits, 4);
  });

  it('chooses to measure X, the lowest expected entropy', () => {
    const h = expectedEntropies({ prior, tests });
    expect(h.indexOf(Math.min(...h))).toBe(0);
  });

  it('spreads 1/m over the values for a candidate that predicts nothing', () => {
    expect(likelihoodFromPredictions([null, 6], values)).toEqual([[1 / 3, 1 / 3, 1 / 3], [0, 1, 0]]);
  });
});

describe('stop, Q1, Q2 and exact V (two-step lookahead check in diagnosis-methods.md; values computed)', () => {
  // Four equiprobable hypotheses, two halving tests of cost 30, wrong conclusion L = 100.
  const problem: DecisionProblem = {
    prior: [0.25, 0.25, 0.25, 0.25],
    tests: [
      { cost: 30, likelihood: [[1, 0], [1, 0], [0, 1], [0, 1]] },
      { cost: 30, likelihood: [[1, 0], [0, 1], [1, 0], [0, 1]] },
    ],
    wrongConclusionCost: 100,
  };
  it('stops now at 75', () => expect(stopCost(problem)).toBeCloseTo(75, 10));
  it('gives Q1 of either test 80, so a myopic policy stops', () => {
    for (const q of myopicQ(problem)) expect(q).toBeCloseTo(80, 10);
  });
  it('gives Q2 of 60, finding the pair of tests worth doing together', () => {
    for (const q of twoStepQ(problem)) expect(q).toBeCloseTo(60, 10);
  });
  it('gives an exact optimum of 60 (A then B)', () => {
    const v = exactValue(problem);
    expect(v.value).toBeCloseTo(60, 10);
    expect(v.q[0]).toBeCloseTo(60, 10);
  });
  it('prefers stopping when tests cost more than they can save', () => {
    const dear = { ...problem, tests: problem.tests.map((t) => ({ ...t, cost: 50 })) };
    expect(exactValue(dear).value).toBeCloseTo(75, 10);
  });
});
