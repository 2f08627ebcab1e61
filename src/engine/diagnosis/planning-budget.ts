/**
 * A time budget for choosing the next test. The full search (exact V or Q2) is bounded by the tree limits, but a
 * busy process must still not be held up by one diagnosis: once the budget is spent, the ranking is redone with
 * one-step lookahead (Q1), whose cost is one pass over causes × outcomes per test, and the diagnosis says so.
 */
import { finding, type Finding } from './findings';

export const DEFAULT_PLANNING_BUDGET_MS = 50;

export interface PlanningBudget {
  readonly ms: number;
  exceeded(): boolean;
}

/** A budget that starts now; 0 is spent at once (the cheap policy always). */
export function planningBudget(ms: number, now: () => number = () => performance.now()): PlanningBudget {
  const until = now() + ms;
  return { ms, exceeded: () => ms <= 0 || now() > until };
}

/**
 * Scores every open test with `score`, or gives up (undefined) as soon as the budget is spent, so the caller can
 * fall back to a cheaper score for all of them (mixing the two would compare unlike numbers).
 */
export function scoreWithin<T>(open: readonly number[], budget: PlanningBudget | undefined, score: (t: number) => T): T[] | undefined {
  const out: T[] = [];
  for (const t of open) {
    if (budget?.exceeded()) return undefined;
    out.push(score(t));
  }
  return out;
}

export const budgetSpent = (budget: PlanningBudget): Finding =>
  finding(
    'diagnosis.planning_budget_spent',
    'nextTest',
    `choosing the next test took longer than its ${budget.ms} ms budget; the test was chosen by one-step lookahead instead`,
    'info',
  );
