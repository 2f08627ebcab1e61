/**
 * What to do next, as an ordered table of rules: each looks at the evidence and either decides (status, next
 * test, findings) or passes. The first rule that decides wins; the last one always does.
 */
import { finding, type Finding } from './findings';
import { mostDoubtfulReading, type Evidence, type Posterior } from './posterior';
import {
  argmax,
  canChangeConclusion,
  entropyBits,
  exactQ,
  expectedEntropyAfter,
  lookaheadQ,
  newExactMemo,
  openTests,
  stateSpaceSize,
  testCost,
  type PolicyModel,
  type PolicyState,
} from './policy';
import { budgetSpent, scoreWithin } from './planning-budget';
import type { CheckedReading } from './reading-checks';
import type { TreeRequest } from './request-key';
import type { Test, Tree } from './tree-model';
import { isLoaded } from './load-tree';
import { backprobeConfirmation, thermistorOpenConfirmation } from './backprobe-confirmation';
import { supplyOrShortConfirmation } from './supply-or-short';
import { cheapestTest, proposeTest } from './propose-test';

export type DiagnosisStatus = 'testing' | 'concluded' | 'recheck' | 'crank_and_reread' | 'exhausted';
export type NextTestReason = 'lowest_expected_cost' | 'recheck_indeterminate' | 'recheck_contradiction' | 'crank_and_reread' | 'wiggle_test';

/** Readings of a test that flipped are followed by a wiggle test until the test has this many readings. */
const WIGGLE_READINGS = 5;

export interface TestProgress {
  counted: number;
  /** Indeterminate readings since the last counted one. */
  indeterminate: CheckedReading[];
  /** A frozen key-on scan reading with no counted reading of the test after it. */
  frozen?: CheckedReading;
}

export interface ResolvedOptions {
  concludeAt: number;
  wrongConclusionMinutes: number;
  strategy: 'auto' | 'exact' | 'lookahead';
  lookaheadDepth: number;
  exactStateBudget: number;
  contradictionThreshold: number;
  frozenScanTolerance: number;
  maxAttempts: number;
  leadingCauses: number;
  planningBudgetMs: number;
}

export interface RuleContext {
  tree: Tree;
  options: ResolvedOptions;
  evidence: Evidence[];
  posterior: Posterior;
  progress: TestProgress[];
  /** Ids of readings that were taken to replace another (their target has `supersededBy` = this id). */
  replacements: Set<string>;
  /** Reading id → position in the caller's readings array. */
  readingIndex: Map<string, number>;
  model: PolicyModel;
  state: PolicyState;
  /** Tests that may not be proposed now (the jumper safety rule, safety-rules.ts). */
  blocked?: ReadonlySet<number>;
  /** Counted readings the leading cause cannot explain (beyond its predicted spread, leave-one-out). */
  leaderContradictedBy: string[];
  /** Counted readings that confirm the leading cause directly (leave-one-out Bayes factor above 3). */
  leaderConfirmedBy: string[];
}

export interface Choice {
  test: Test;
  reason: NextTestReason;
  request: TreeRequest;
  recheckOf?: string;
  expectedMinutes?: number;
  ranking?: Array<{ testId: string; expectedMinutes: number; informationBits: number; minutes: number }>;
  strategy?: 'exact' | 'lookahead';
  /** Set when the planning budget ran out and the ranking fell back to one-step lookahead. */
  fellBack?: boolean;
}

export interface Decision {
  status: DiagnosisStatus;
  choice?: Choice;
  findings: Finding[];
  /** Set with "exhausted" when the readings fit none of the modelled causes (the leak leads). */
  noneFits?: boolean;
}

interface StatusRule {
  name: string;
  /** A decision, findings to carry while passing to the next rule, or undefined to pass silently. */
  decide(ctx: RuleContext): Decision | Finding[] | undefined;
}

function rankTests(ctx: RuleContext): Choice | undefined {
  const { model, state, options, tree } = ctx;
  const open = openTests(state).filter((t) => !ctx.blocked?.has(t));
  if (open.length === 0) return undefined;
  const useExact = options.strategy === 'exact' || (options.strategy === 'auto' && stateSpaceSize(model, state) <= options.exactStateBudget);
  const memo = newExactMemo();
  const h0 = entropyBits(state.p);
  const scored = (q: (t: number) => number) => (t: number) => ({ t, q: q(t), cost: testCost(model, state, t), bits: h0 - expectedEntropyAfter(model, state.p, t) });
  const full = scoreWithin(open, model.budget, scored((t) => (useExact ? exactQ(model, state, t, memo) : lookaheadQ(model, state, t, options.lookaheadDepth))));
  const ranking = (full ?? open.map(scored((t) => lookaheadQ(model, state, t, 1)))).sort((a, b) => a.q - b.q || a.cost - b.cost || a.t - b.t);
  const best = ranking[0]!;
  const test = tree.tests[best.t]!;
  return {
    test,
    reason: 'lowest_expected_cost',
    request: test.request,
    expectedMinutes: best.q,
    strategy: useExact && full ? 'exact' : 'lookahead',
    fellBack: !full,
    ranking: ranking.map((r) => ({ testId: tree.tests[r.t]!.id, expectedMinutes: r.q, informationBits: r.bits, minutes: r.cost })),
  };
}

/**
 * "No fault now" is not concluded while a wire of the working circuit (connector mated, key on) has not been read:
 * a fault the tree does not model well (a partial short, a supply that sags only under load) can hide there. The
 * cheapest open test on such a wire comes first.
 */
function wireStillToRead(ctx: RuleContext): Decision | undefined {
  const loaded = (t: number) => isLoaded(ctx.tree.tests[t]!);
  const read = new Set<string>(ctx.evidence.filter((e) => loaded(e.test)).map((e) => ctx.tree.tests[e.test]!.request.at));
  const missing = ctx.tree.wires.filter((w) => !read.has(w));
  const candidates = openTests(ctx.state).filter((t) => loaded(t) && missing.includes(ctx.tree.tests[t]!.request.at));
  if (!candidates.length) return undefined;
  return proposeTest(
    ctx,
    cheapestTest(ctx, candidates),
    finding('diagnosis.wire_not_read', 'tests', `the circuit reads good so far, but the ${missing.join(' and ')} wire has not been read with the circuit working: one more test before "no fault now"`, 'info'),
  );
}

export const STATUS_RULES: readonly StatusRule[] = [
  {
    name: 'indeterminate reading',
    decide: (ctx) => {
      const test = ctx.tree.tests.find((t, i) => ctx.progress[i]!.indeterminate.length > 0 && ctx.progress[i]!.indeterminate.length < ctx.options.maxAttempts);
      if (!test) return undefined;
      const last = ctx.progress[test.index]!.indeterminate.at(-1)!;
      return {
        status: 'recheck',
        choice: { test, reason: 'recheck_indeterminate', request: last.request, recheckOf: last.id },
        findings: [finding('diagnosis.reading_indeterminate', `readings[${last.inputIndex}]`, `reading ${last.id} (${last.value}) of "${test.label}" matches no single outcome (a guard band between outcomes): check the probe points and connector state, then measure again`, 'warning')],
      };
    },
  },
  {
    name: 'frozen scan value',
    decide: (ctx) => {
      const test = ctx.tree.tests.find((t, i) => ctx.progress[i]!.frozen && t.crankRequest);
      if (!test) return undefined;
      const frozen = ctx.progress[test.index]!.frozen!;
      return {
        status: 'crank_and_reread',
        choice: { test, reason: 'crank_and_reread', request: test.crankRequest!, recheckOf: frozen.id },
        findings: [finding('diagnosis.scan_value_frozen', `readings[${frozen.inputIndex}]`, `the scan value did not change when the signal set-up changed with the engine stopped; some modules refresh only with engine speed: crank the engine and read again before blaming the circuit`, 'warning')],
      };
    },
  },
  {
    name: 'intermittent',
    decide: (ctx) => {
      const flips = ctx.evidence.filter((e) => e.intermittent);
      if (!flips.length) return undefined;
      const notes = flips.map((e) => {
        const test = ctx.tree.tests[e.test]!;
        const values = e.clusters.map((c) => (Number.isFinite(c.y) && test.predictive ? c.y.toPrecision(3) : test.predictive ? 'overload' : test.outcomes[c.y]!.label)).join(' / ');
        return finding('diagnosis.intermittent', `tests[${e.test}]`, `"${test.label}" read ${values} under the same conditions: more than the instrument's error, so the circuit changed between readings (an intermittent)`, 'warning');
      });
      const open = flips.find((e) => e.readingIds.length < WIGGLE_READINGS);
      if (!open) return notes;
      const test = ctx.tree.tests[open.test]!;
      return { status: 'testing', choice: { test, reason: 'wiggle_test', request: test.request }, findings: notes };
    },
  },
  {
    name: 'contradiction',
    decide: (ctx) => {
      if (ctx.posterior.logEvidenceVsChance >= ctx.options.contradictionThreshold) return undefined;
      const doubtful = mostDoubtfulReading(ctx.tree, ctx.evidence);
      const ev = doubtful && ctx.evidence.find((e) => e.test === doubtful.test)!;
      const message = `the readings together are improbable under every modelled cause (log evidence ${ctx.posterior.logEvidenceVsChance.toFixed(2)} against chance)`;
      if (!doubtful || !ev || ctx.replacements.has(doubtful.readingId) || ev.readingIds.length > 1)
        return [finding('diagnosis.contradiction_persists', 'readings', `${message}; the doubtful reading was already repeated, so the "not modelled" cause is weighed instead`, 'warning')];
      const test = ctx.tree.tests[ev.test]!;
      const inputIndex = ctx.readingIndex.get(doubtful.readingId) ?? -1;
      return {
        status: 'recheck',
        choice: { test, reason: 'recheck_contradiction', request: test.request, recheckOf: doubtful.readingId },
        findings: [finding('diagnosis.contradiction', `readings[${inputIndex}]`, `${message}: repeat reading ${doubtful.readingId} ("${test.label}"), the one most likely to be wrong; mark the old one superseded by the new one`, 'warning')],
      };
    },
  },
  { name: 'back-probe confirmed', decide: backprobeConfirmation },
  { name: 'open thermistor confirmed by ohms', decide: thermistorOpenConfirmation },
  { name: 'harness proven before a shorted reference or a failed supply', decide: supplyOrShortConfirmation },
  {
    name: 'none of the modelled causes fits',
    decide: (ctx) => {
      // The leak ("not modelled") is never a conclusion: it names no repair. Once it holds the threshold, or leads
      // while the readings stay improbable under every modelled cause after the re-check, the result is undecided.
      const leak = ctx.tree.unknownIndex;
      if (argmax(ctx.posterior.p) !== leak) return undefined;
      const improbable = ctx.posterior.logEvidenceVsChance < ctx.options.contradictionThreshold;
      if (ctx.posterior.p[leak]! < ctx.options.concludeAt && !improbable && openTests(ctx.state).length > 0 && canChangeConclusion(ctx.model, ctx.state)) return undefined;
      return {
        status: 'exhausted',
        noneFits: true,
        findings: [finding('diagnosis.no_modelled_cause_fits', 'readings', `none of the modelled causes fits these readings (log evidence ${ctx.posterior.logEvidenceVsChance.toFixed(2)} against chance): not proven, no repair offered`, 'warning')],
      };
    },
  },
  {
    name: 'concluded',
    decide: (ctx) => {
      const leader = argmax(ctx.posterior.p);
      if (ctx.posterior.p[leader]! < ctx.options.concludeAt) return undefined;
      const unread = leader === ctx.tree.healthyIndex ? wireStillToRead(ctx) : undefined;
      if (unread) return unread;
      const h = ctx.tree.hypotheses[leader]!;
      if (ctx.leaderContradictedBy.length)
        return [finding('diagnosis.leader_contradicted', 'readings', `"${h.label}" leads but reading(s) ${ctx.leaderContradictedBy.join(', ')} fall outside what it predicts: not concluded`, 'warning')];
      if (!ctx.leaderConfirmedBy.length)
        return [finding('diagnosis.leader_unconfirmed', 'readings', `"${h.label}" leads but no single reading confirms it directly (each fits another cause about as well): not concluded`, 'warning')];
      return { status: 'concluded', findings: [] };
    },
  },
  {
    name: 'exhausted',
    decide: (ctx) => {
      if (openTests(ctx.state).length > 0 && canChangeConclusion(ctx.model, ctx.state)) return undefined;
      return {
        status: 'exhausted',
        findings: [finding('diagnosis.no_test_can_change_conclusion', 'tests', `no remaining test can change the leading cause or settle it at ${ctx.options.concludeAt}: not proven, no repair offered`, 'warning')],
      };
    },
  },
  {
    name: 'testing',
    decide: (ctx) => {
      const choice = rankTests(ctx);
      return { status: 'testing', choice, findings: choice?.fellBack && ctx.model.budget ? [budgetSpent(ctx.model.budget)] : [] };
    },
  },
];

/** Runs the rules in order; a rule may add findings and pass (status "testing" without a choice). */
export function decide(ctx: RuleContext): Decision {
  const carried: Finding[] = [];
  for (const rule of STATUS_RULES) {
    const d = rule.decide(ctx);
    if (!d) continue;
    if (!Array.isArray(d) && d.choice && ctx.blocked?.has(d.choice.test.index)) continue;
    if (Array.isArray(d)) {
      carried.push(...d);
      continue;
    }
    return { ...d, findings: [...carried, ...d.findings] };
  }
  throw new Error('unreachable: the last status rule always decides');
}
