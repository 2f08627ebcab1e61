/**
 * What the status rules that hold a conclusion back share: propose the cheapest of some open tests (expected
 * minutes, set-ups included), and ask whether a reading of some kind argues for the leading cause against another.
 */
import type { Finding } from './findings';
import { testCost } from './policy';
import { leaveOneOut } from './posterior';
import type { Decision, RuleContext } from './status-rules';

/** Index of the cheapest of `candidates` (test indices, at least one). */
export function cheapestTest(ctx: RuleContext, candidates: readonly number[]): number {
  return candidates.reduce((a, b) => (testCost(ctx.model, ctx.state, b) < testCost(ctx.model, ctx.state, a) ? b : a));
}

/** Keep testing with test `t` (by lowest expected cost), saying why. */
export function proposeTest(ctx: RuleContext, t: number, why: Finding): Decision {
  const test = ctx.tree.tests[t]!;
  return {
    status: 'testing',
    choice: { test, reason: 'lowest_expected_cost', request: test.request, expectedMinutes: testCost(ctx.model, ctx.state, t) },
    findings: [why],
  };
}

/**
 * Whether a counted reading of a test that `kind` accepts is `factor` times likelier under cause `leader` than under
 * cause `other`, each predicted from the other readings (leave-one-out).
 */
export function readingArguesFor(ctx: RuleContext, leader: number, other: number, factor: number, kind: (test: number) => boolean): boolean {
  return ctx.posterior.weighed.some((x) => {
    if (!kind(x.evidence.test)) return false;
    const loo = leaveOneOut(ctx.tree, ctx.posterior, x);
    return loo.causeLike[leader]! > factor * loo.causeLike[other]!;
  });
}
