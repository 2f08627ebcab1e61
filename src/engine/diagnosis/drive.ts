/**
 * Drives a diagnosis to its end against a simulated case: ask the engine, take the reading it asks for (or the
 * one a baseline policy picks), repeat. Used by the end-to-end tests and the benchmark.
 */
import { diagnose, type Diagnosis, type DiagnosisOptions, type Reading } from './index';
import { planningLikelihoods, policyModel, resolve } from './diagnose';
import { groupEvidence } from './evidence';
import { posterior } from './posterior';
import { exactQ, newExactMemo, type ExactMemo, type PolicyState } from './policy';
import { arbitraryReading, simulateReading, type SimulatedCase } from './simulate';
import { requestKey, type TreeRequest } from './request-key';
import { jumperViolations } from './safety-rules';
import type { Test, Tree } from './tree-model';

/** Picks the next test while the engine's status is "testing"; undefined keeps the engine's choice. */
export type TestChooser = (tree: Tree, diagnosis: Diagnosis) => Test | undefined;

export interface DriveResult {
  conclusion: string | null;
  status: Diagnosis['status'];
  minutes: number;
  readings: Reading[];
  /** Every next test the engine asked for, in order (including the ones a baseline chooser overrode). */
  asked: NonNullable<Diagnosis['nextTest']>[];
  /** Milliseconds per `diagnose` call. */
  latencies: number[];
  last: Diagnosis;
}

/** Tests answered (counted) or set aside (indeterminate too often), by id. */
export function settledTests(tree: Tree, d: Diagnosis, maxAttempts = 2): Set<string> {
  const done = new Set(d.path.filter((e) => e.verdict === 'counted').map((e) => e.testId!));
  const tries = new Map<string, number>();
  for (const e of d.path) if (e.verdict === 'indeterminate') tries.set(e.testId!, (tries.get(e.testId!) ?? 0) + 1);
  for (const [id, n] of tries) if (n >= maxAttempts) done.add(id);
  // A test that means nothing on this circuit (the pedal does not move its sensor) is settled for baselines too.
  for (const f of d.findings) if (f.code === 'diagnosis.input_not_moved_by_pedal') done.add(tree.tests[Number(/\d+/.exec(f.path)![0])]!.id);
  return done;
}

/** True when taking `test` now keeps the jumper safety rule, given the readings in the diagnosis path (baselines obey it too). */
export function safeNow(tree: Tree, d: Diagnosis, test: Test): boolean {
  const taken = d.path.flatMap((e) => {
    const t = tree.tests.find((x) => x.id === e.testId);
    return t && (typeof e.value === 'number' || e.value === 'overload') ? [{ id: e.readingId, request: t.request, value: e.value as number | 'overload' }] : [];
  });
  return jumperViolations([...taken, { id: '#next', request: test.request, value: 0 }]).every((v) => v.readingId !== '#next');
}

const PART_ORDER = ['reference', 'signal', 'ground', 'sensor', 'module'];

/** The fixed checklist: reference tests, then signal, ground, sensor, module; tree order within a part. */
export const checklistChooser: TestChooser = (tree, d) => {
  const done = settledTests(tree, d);
  const rank = (t: Test) => Math.min(...(t.parts ?? tree.hypotheses.map((h) => h.part)).map((p) => (PART_ORDER.includes(p) ? PART_ORDER.indexOf(p) : PART_ORDER.length)));
  return [...tree.tests].sort((a, b) => rank(a) - rank(b) || a.index - b.index).find((t) => !done.has(t.id) && safeNow(tree, d, t));
};

/**
 * The exact optimal policy (V by dynamic programming), with a memo shared across cases of one tree. It plans on the
 * outcome tables averaged over the circuit classes by their prior (fixed tables, so the memo stays valid); the
 * engine's own tables follow the class posterior.
 */
export function exactChooser(options: DiagnosisOptions = {}, memo: ExactMemo = newExactMemo()): TestChooser {
  const fixed = new WeakMap<Tree, ReturnType<typeof policyModel>>();
  return (tree, d) => {
    const done = new Int16Array(tree.tests.length).fill(-1);
    const evidence = groupEvidence(
      d.path.flatMap((e) => {
        if (e.verdict !== 'counted') return [];
        const test = tree.tests.find((t) => t.id === e.testId)!;
        return [{ id: e.readingId, test, value: e.value === 'overload' ? Infinity : (e.value as number), outcome: test.outcomes.findIndex((o) => o.id === e.outcomeId) }];
      }),
    );
    const post = posterior(tree, evidence);
    let model = fixed.get(tree);
    if (!model) fixed.set(tree, (model = policyModel(tree, resolve(tree, options).resolved, planningLikelihoods(tree))));
    for (const e of evidence) done[e.test] = e.outcome;
    const settled = settledTests(tree, d);
    tree.tests.forEach((t) => done[t.index] === -1 && settled.has(t.id) && (done[t.index] = -2));
    const paid = tree.tests.filter((t) => d.path.some((e) => e.testId === t.id)).reduce((m, t) => m | t.setupMask, 0);
    const state: PolicyState = { p: post.p, done, paid };
    let best: { t: number; q: number } | undefined;
    for (let t = 0; t < done.length; t++) {
      if (done[t] !== -1 || !safeNow(tree, d, tree.tests[t]!)) continue;
      const q = exactQ(model, state, t, memo);
      if (!best || q < best.q - 1e-9) best = { t, q };
    }
    return best && tree.tests[best.t];
  };
}

/** A planning budget no drive reaches (the option takes finite numbers only). */
export const UNBOUNDED_PLANNING_MS = 1e9;

export async function driveToEnd(tree: Tree, c: SimulatedCase, opts: { options?: DiagnosisOptions; choose?: TestChooser; maxSteps?: number } = {}): Promise<DriveResult> {
  const readings: Reading[] = [];
  const asked: DriveResult['asked'] = [];
  const latencies: number[] = [];
  const attempts = new Map<string, number>();
  const start = Date.parse('2025-01-06T08:00:00Z');
  let paid = 0;
  let minutes = 0;
  for (let step = 0; ; step++) {
    const t0 = performance.now();
    // A simulated drive is reproducible whatever the machine's load: no planning deadline unless one is given.
    const d = await diagnose(tree, readings, [], { planningBudgetMs: UNBOUNDED_PLANNING_MS, ...opts.options });
    latencies.push(performance.now() - t0);
    if (d.status === 'concluded' || d.status === 'exhausted' || !d.nextTest || step >= (opts.maxSteps ?? 60))
      return { conclusion: d.conclusion?.hypothesisId ?? null, status: d.status, minutes, readings, asked, latencies, last: d };
    asked.push(d.nextTest);
    const override = d.status === 'testing' && opts.choose ? opts.choose(tree, d) : undefined;
    const test = override ?? tree.tests.find((t) => t.id === d.nextTest!.id)!;
    const request: TreeRequest = override ? test.request : d.nextTest.request;
    minutes += test.minutes + test.setups.filter((s) => !((paid >> s.index) & 1)).reduce((a, s) => a + s.minutes, 0);
    paid |= test.setupMask;
    const key = requestKey(request);
    const attempt = attempts.get(key) ?? 0;
    attempts.set(key, attempt + 1);
    const value = simulateReading(c, request, attempt) ?? arbitraryReading(c, request, attempt);
    const id = `r${step + 1}`;
    if (!override && d.nextTest.reason === 'recheck_contradiction' && d.nextTest.recheckOf) {
      const old = readings.find((r) => r.id === d.nextTest!.recheckOf);
      if (old) old.supersededBy = id;
    }
    readings.push({ id, request, value, takenAt: new Date(start + (step + 1) * 60_000).toISOString(), phase: 'diagnosis' });
  }
}
