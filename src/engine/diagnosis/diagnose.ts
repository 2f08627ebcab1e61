/**
 * The diagnosis: a pure function of (tree, readings, repairs, options). Readings are checked and matched to tests,
 * counted ones (grouped per test) update the joint posterior over causes and circuit classes, and the status rules
 * pick what to do next. Nothing is stored.
 */
import { finding, type Finding } from './findings';
import { planningBudget, DEFAULT_PLANNING_BUDGET_MS } from './planning-budget';
import { groupEvidence, type CountedReading } from './evidence';
import { isPluggedSignalVolts, looksFrozen, unchangedFrom } from './frozen-scan';
import { contradictingReadings, posterior, readingFactors } from './posterior';
import { argmax, type PolicyModel, type PolicyState } from './policy';
import { checkReadingShapes, checkRepairs, verdictOf, type CheckedReading, type ReadingContext } from './reading-checks';
import { jumperSafety } from './safety-rules';
import { pedalMovesInput } from '../sensors';
import { decide, type ResolvedOptions, type TestProgress } from './status-rules';
import { weighCodes } from './code-evidence';
import { undecided } from './undecided';
import { checkScanConditions, scanTemperatureFindings } from './scan-temperature';
import { pairComparisons, halfLabel, type ComparisonEntry } from './comparisons';
import type { Test, Tree } from './tree-model';
import type { Diagnosis, DiagnosisOptions, NextTest, PathEntry, Reading, Repair } from './index';
import type { Posterior } from './posterior';

/** A reading confirms a cause directly when it favours it by more than this Bayes factor over the rest (leave-one-out). */
const CONFIRMING_FACTOR = 3;

export const DEFAULT_OPTIONS: Omit<ResolvedOptions, 'concludeAt'> = {
  wrongConclusionMinutes: 240,
  strategy: 'auto',
  lookaheadDepth: 2,
  exactStateBudget: 100,
  contradictionThreshold: -4,
  frozenScanTolerance: 0,
  maxAttempts: 2,
  leadingCauses: 3,
  planningBudgetMs: DEFAULT_PLANNING_BUDGET_MS,
};

export function resolve(tree: Tree, options: DiagnosisOptions): { resolved: ResolvedOptions; findings: Finding[] } {
  const resolved: ResolvedOptions = { ...DEFAULT_OPTIONS, concludeAt: tree.concludeAt };
  const findings: Finding[] = [];
  for (const [key, value] of Object.entries(options) as Array<[keyof ResolvedOptions, unknown]>) {
    if (value === undefined) continue;
    if (!(key in resolved)) {
      findings.push(finding('options.unknown', `options.${key}`, `unknown option "${key}"`, 'warning'));
      continue;
    }
    if (key === 'strategy') {
      if (value === 'auto' || value === 'exact' || value === 'lookahead') resolved.strategy = value;
      else findings.push(finding('options.invalid', 'options.strategy', 'expected "auto", "exact" or "lookahead"'));
      continue;
    }
    if (typeof value !== 'number' || !Number.isFinite(value)) findings.push(finding('options.invalid', `options.${key}`, 'expected a finite number'));
    else if (key === 'concludeAt' && (value <= 0.5 || value >= 1)) findings.push(finding('options.invalid', 'options.concludeAt', 'expected a probability between 0.5 and 1'));
    else (resolved as unknown as Record<string, number>)[key] = value;
  }
  return { resolved, findings };
}

/**
 * P(outcome | cause) per test for planning: the predictive densities integrated over the outcome partition, the
 * classes weighted by their posterior given each cause (the same numbers that weigh readings). Trees without
 * densities use their stored rows.
 */
export function planningLikelihoods(tree: Tree, post?: Posterior): Float64Array[] {
  const nH = tree.hypotheses.length;
  const nC = tree.classes.length;
  return tree.tests.map((t) => {
    const pred = t.predictive;
    if (!pred) return t.like;
    const nO = t.outcomes.length;
    const like = new Float64Array(nH * nO);
    for (let h = 0; h < nH; h++)
      for (let c = 0; c < nC; c++) {
        const w = post ? post.classGivenCause[h * nC + c]! : Math.exp(tree.logLatentPrior[h * nC + c]!);
        if (w < 1e-12) continue;
        for (let o = 0; o < nO; o++) like[h * nO + o] = like[h * nO + o]! + w * pred.bandLike[(h * nC + c) * nO + o]!;
      }
    return like;
  });
}

/** The decision model the engine plans with: test costs, set-ups, and stop(e) = 0 once a cause reaches the threshold. */
export function policyModel(tree: Tree, options: ResolvedOptions, likes: Float64Array[] = planningLikelihoods(tree)): PolicyModel {
  const L = options.wrongConclusionMinutes;
  const tau = options.concludeAt;
  return {
    nH: tree.hypotheses.length,
    tests: tree.tests.map((t, i) => ({ cost: t.minutes, setupMask: t.setupMask, nO: t.outcomes.length, like: likes[i]! })),
    setupCosts: tree.setups.map((s) => s.minutes),
    stopCost: (max) => (max >= tau ? 0 : L * (1 - max)),
    isTerminal: (max) => max >= tau,
    budget: planningBudget(options.planningBudgetMs),
  };
}

/** The outcome a reading's value falls in: the partition for density tests, the tree's rules otherwise. */
function outcomesOf(test: Test, r: CheckedReading): Promise<string[]> | string[] {
  const pred = test.predictive;
  if (!pred) return test.classifier.classify(r.value, r.request);
  const o = pred.partition.findIndex((b) => r.value >= b.lo && (r.value < b.hi || b.hi === Infinity));
  return [test.outcomes[o]!.id];
}

/** See `diagnose` in index.ts. */
export async function runDiagnosis(untouched: Tree, readings: readonly Reading[], repairs: readonly Repair[], allOptions: DiagnosisOptions): Promise<Diagnosis> {
  // The order's trouble codes weigh the prior before any reading (code-evidence.ts).
  const { codes, conditions, ...options } = allOptions;
  const coded = weighCodes(untouched, codes);
  const tree = coded.tree;
  const { resolved, findings } = resolve(tree, options);
  findings.push(...coded.findings);
  const shapes = checkReadingShapes(tree, Array.isArray(readings) ? readings : []);
  if (!Array.isArray(readings)) findings.push(finding('readings.not_array', 'readings', 'expected an array of readings'));
  const repairCheck = checkRepairs(Array.isArray(repairs) ? repairs : []);
  findings.push(...shapes.findings, ...repairCheck.findings, ...checkScanConditions(conditions));
  const implausible = scanTemperatureFindings(Array.isArray(readings) ? readings : [], conditions);
  const ctx: ReadingContext = {
    tree,
    readings: shapes.checked,
    byId: new Map(shapes.checked.map((r) => [r.id, r])),
    repairs: repairCheck.repairs,
    options: resolved,
  };

  const path: PathEntry[] = shapes.invalid.map(({ reading, note }) => ({
    readingId: String(reading?.id ?? ''),
    takenAt: String(reading?.takenAt ?? ''),
    value: reading?.value,
    verdict: 'invalid',
    note,
  }));
  const counted: CountedReading[] = [];
  const keyOnScans: CheckedReading[] = [];
  const progress: TestProgress[] = tree.tests.map(() => ({ counted: 0, indeterminate: [] }));
  let paid = 0;
  // Within one call each reading's outcome rules run once (cached by reading id).
  const classified = new Map<string, Promise<string[]> | string[]>();
  // Superseded readings are classified too: one that sat in a guard band still counts as an attempt at its test.
  for (const r of ctx.readings) {
    const early = r.test ? verdictOf(r, ctx) : undefined;
    if (r.test && (!early || early.verdict === 'superseded')) classified.set(r.id, outcomesOf(r.test, r));
  }
  const matches = new Map<string, string[]>();
  await Promise.all([...classified].map(async ([id, pending]) => matches.set(id, await pending)));

  for (const r of ctx.readings) {
    const base = { readingId: r.id, takenAt: new Date(r.takenAtMs).toISOString(), value: r.value === Infinity ? 'overload' : r.value, testId: r.test?.id, testLabel: r.test?.label };
    const early = verdictOf(r, ctx);
    // A reading that answers only a comparison is paired below.
    if (!r.test && r.halves.length && early?.verdict !== 'invalid') continue;
    if (r.test && early?.verdict !== 'not_in_tree' && early?.verdict !== 'verification') paid |= r.test.setupMask;
    if (early) {
      path.push({ ...base, verdict: early.verdict, note: early.note });
      if (early.verdict === 'superseded' && r.test && (matches.get(r.id)?.length ?? 1) !== 1) progress[r.test.index]!.indeterminate.push(r);
      continue;
    }
    const test = r.test!;
    const same = unchangedFrom(r, keyOnScans, resolved.frozenScanTolerance);
    if (same && looksFrozen(tree, posterior(tree, groupEvidence(counted)), r, same, resolved.frozenScanTolerance)) {
      path.push({ ...base, verdict: 'frozen_scan', note: `scan value unchanged from reading ${same.id} although the new set-up should have moved it, engine stopped: the module may not refresh until it sees engine speed` });
      progress[test.index]!.frozen = r;
      continue;
    }
    const hit = matches.get(r.id) ?? [];
    const prog = progress[test.index]!;
    if (hit.length !== 1) {
      prog.indeterminate.push(r);
      path.push({ ...base, verdict: 'indeterminate', note: hit.length === 0 ? 'in a guard band: matches no outcome' : `matches several outcomes (${hit.join(', ')})` });
      continue;
    }
    const outcome = test.outcomes.find((o) => o.id === hit[0])!;
    counted.push({ id: r.id, test, value: r.value, outcome: outcome.index });
    if ((r.request.quantity === 'scan_value' && r.request.engine === 'off') || isPluggedSignalVolts(r)) keyOnScans.push(r);
    prog.counted++;
    prog.indeterminate = [];
    prog.frozen = undefined;
    const within = test.predictive && outcome.interval && !(r.value >= outcome.interval.lo && r.value < outcome.interval.hi) ? ' (between outcome ranges: weighed by its value all the same)' : '';
    path.push({ ...base, verdict: 'counted', outcomeId: outcome.id, outcomeLabel: outcome.label, note: `outcome: ${outcome.label}${within}${r.conversion ? `; ${r.conversion}` : ''}` });
  }

  const frozen = new Set(path.filter((p) => p.verdict === 'frozen_scan').map((p) => p.readingId));
  const paired = await pairComparisons(ctx, frozen);
  // When both halves answer tests of their own, the later one is weighed only through the difference (its own value
  // given the earlier one's): counting it twice would count the same reading twice. Its test is still done.
  const standIns: Array<{ test: number; outcome: number }> = [];
  for (const { earlier, later } of paired.pairs) {
    const own = counted.findIndex((c) => c.id === later.id && c.test === later.test);
    if (!earlier.test || own < 0 || !counted.some((c) => c.id === earlier.id && c.test === earlier.test)) continue;
    standIns.push({ test: counted[own]!.test.index, outcome: counted[own]!.outcome });
    counted.splice(own, 1);
    const entry = path.find((p) => p.readingId === later.id);
    if (entry) entry.note += '; weighed through its comparison with the reading paired with it, not again on its own';
  }
  counted.push(...paired.counted);
  path.push(...paired.path);
  paid |= paired.paid;
  for (const c of paired.counted) progress[c.test.index]!.counted++;
  for (const { test, reading } of paired.indeterminate) progress[test.index]!.indeterminate.push(reading);
  // Time order as read (refused readings, which have none, stay first).
  const order = new Map(ctx.readings.map((r) => [r.id, r.index]));
  path.sort((x, y) => (order.get(x.readingId) ?? -1) - (order.get(y.readingId) ?? -1));
  const evidence = groupEvidence(counted);
  const post = posterior(tree, evidence);
  const model = policyModel(tree, resolved, planningLikelihoods(tree, post));
  const done = new Int16Array(tree.tests.length).fill(-1);
  for (const e of evidence) done[e.test] = e.outcome;
  for (const s of standIns) if (done[s.test] === -1) done[s.test] = s.outcome;
  progress.forEach((p, i) => {
    if (p.counted === 0 && p.indeterminate.length >= resolved.maxAttempts) {
      done[i] = -2;
      findings.push(finding('diagnosis.test_unresolved', `tests[${i}]`, `"${tree.tests[i]!.label}" stayed in a guard band after ${p.indeterminate.length} attempts; it is set aside`, 'warning'));
    }
  });
  const safety = jumperSafety(tree, ctx.readings, ctx.repairs, done);
  for (const t of safety.closed) if (done[t] === -1) done[t] = -2;
  findings.push(...safety.findings);
  // Pressing the pedal with the engine stopped moves nothing on a sensor the pedal does not drive (a MAP sensor).
  if (pedalMovesInput(codes?.sensor) === false)
    for (const t of tree.tests)
      if (t.request.sensorInput === 'moved' && t.request.engine === 'off' && done[t.index] === -1) {
        done[t.index] = -2;
        safety.blocked.add(t.index);
        findings.push(finding('diagnosis.input_not_moved_by_pedal', `tests[${t.index}]`, `"${t.label}" is not proposed: the pedal does not move the input of a ${codes!.sensor} sensor`, 'info'));
      }
  const state: PolicyState = { p: post.p, done, paid };
  const replacements = new Set(ctx.readings.flatMap((r) => (r.supersededBy && ctx.byId.has(r.supersededBy) ? [r.supersededBy] : [])));
  const readingIndex = new Map(ctx.readings.map((r) => [r.id, r.inputIndex]));
  const leader = argmax(post.p);
  const against = contradictingReadings(tree, post, leader);
  const factors = readingFactors(tree, post, leader);
  const confirmedBy = [...new Set(factors.filter((f) => f.factor > CONFIRMING_FACTOR).flatMap((f) => f.ids))];
  const decision = decide({ tree, options: resolved, evidence, posterior: post, progress, replacements, readingIndex, model, state, leaderContradictedBy: against, leaderConfirmedBy: confirmedBy, blocked: safety.blocked });

  const ranked = tree.hypotheses
    .map((h) => ({ id: h.id, label: h.label, part: h.part, probability: post.p[h.index]! }))
    .sort((a, b) => b.probability - a.probability);
  const conclusion =
    decision.status === 'concluded'
      ? {
          hypothesisId: tree.hypotheses[leader]!.id,
          label: tree.hypotheses[leader]!.label,
          probability: post.p[leader]!,
          repair: { part: tree.hypotheses[leader]!.part, action: tree.hypotheses[leader]!.repairAction },
          decidedBy: [...new Set(factors.filter((f) => f.factor > 1.5).flatMap((f) => f.ids))],
          confirmedBy,
          reachedThreshold: true,
        }
      : null;
  const nextTest: NextTest | null = decision.choice ? nextTestOf(tree, decision.choice, paid, ranked, resolved.leadingCauses, model, paired.entries) : null;
  return {
    treeId: tree.id,
    treeVersion: tree.version,
    status: decision.status,
    ranked,
    nextTest,
    path: path.map((entry) => {
      const notes = implausible.filter((x) => x.readingId === entry.readingId).map((x) => x.finding.message);
      return notes.length ? { ...entry, note: [entry.note, ...notes].join('; ') } : entry;
    }),
    conclusion,
    undecided: decision.status === 'exhausted' ? undecided(tree, ranked, decision.noneFits ? 'none_fits' : 'no_test_left') : null,
    logZ: post.logZ,
    logEvidenceVsChance: post.logEvidenceVsChance,
    codesWeighed: coded.codesWeighed,
    comparisons: paired.entries,
    findings: [...findings, ...implausible.map((x) => x.finding), ...decision.findings],
  };
}

const EXTRA_STEPS: Partial<Record<NextTest['reason'], string>> = {
  crank_and_reread: 'Crank the engine (or let it idle) and read the scan value again while it turns.',
  wiggle_test: 'Wiggle test: repeat this reading while flexing the harness along its run and at both connectors; note any jump in the value.',
};

function nextTestOf(
  tree: Tree,
  choice: NonNullable<ReturnType<typeof decide>['choice']>,
  paid: number,
  ranked: Diagnosis['ranked'],
  leading: number,
  model: PolicyModel,
  comparisons: readonly ComparisonEntry[],
): NextTest {
  const test = choice.test;
  const setupsToDo = test.setups.filter((s) => !((paid >> s.index) & 1));
  const setupMinutes = setupsToDo.reduce((a, s) => a + s.minutes, 0);
  const extra = EXTRA_STEPS[choice.reason];
  const like = model.tests[test.index]!.like;
  return {
    id: test.id,
    label: test.label,
    reason: choice.reason,
    recheckOf: choice.recheckOf,
    procedure: extra ? [...test.procedure, extra] : test.procedure,
    preconditions: test.preconditions,
    cautions: choice.reason === 'crank_and_reread' ? test.crankCautions : test.cautions,
    setups: setupsToDo.map((s) => ({ id: s.id, label: s.label, minutes: s.minutes, steps: s.steps })),
    minutes: test.minutes,
    setupMinutes,
    totalMinutes: test.minutes + setupMinutes,
    // A comparison asks for the half still missing (its first half once both are in, to take them again).
    request: structuredClone(halfToTake(test, choice.request, comparisons.find((c) => c.testId === test.id))),
    ...(test.compare ? { comparison: comparisonOf(tree, test, comparisons.find((c) => c.testId === test.id)) } : {}),
    outcomes: test.outcomes.map((o) => ({ id: o.id, label: o.label, range: o.interval ? [o.interval.lo, o.interval.hi] : null })),
    predictions: ranked
      .filter((h) => h.probability > 0.01)
      .slice(0, leading)
      .map((h) => {
        const hyp = tree.hypotheses.find((x) => x.id === h.id)!;
        const nO = test.outcomes.length;
        const row = test.outcomes.map((o) => like[hyp.index * nO + o.index]!);
        return { hypothesisId: h.id, label: h.label, probability: h.probability, band: test.bands.get(h.id) ?? null, likelyOutcome: test.outcomes[argmax(row)]!.id };
      }),
    expectedMinutesToFinish: choice.expectedMinutes ?? null,
    strategy: choice.strategy ?? null,
    ranking: choice.ranking ?? [],
  };
}

function halfToTake(test: Test, request: NextTest['request'], entry: ComparisonEntry | undefined): NextTest['request'] {
  if (!test.compare || !entry) return request;
  return entry.first.readingId !== null && entry.second.readingId === null ? test.compare.request : request;
}

/** Both halves of a comparison for the screen: what each reads and what is already taken. */
function comparisonOf(tree: Tree, test: Test, entry: ComparisonEntry | undefined): NonNullable<NextTest['comparison']> {
  const half = (h: 'first' | 'second') => ({
    label: halfLabel(tree, test, h),
    request: structuredClone(h === 'first' ? test.request : test.compare!.request),
    readingId: entry?.[h].readingId ?? null,
    value: entry?.[h].value ?? null,
  });
  return { unit: test.unit ?? 'V', first: half('first'), second: half('second') };
}
