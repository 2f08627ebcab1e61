/**
 * Lets a diagnosis run on an out-of-model case: ask `diagnose`, take the reading its next test names (value from
 * our own circuit model and instruments), repeat until it concludes, has no test left, or reaches the step cap.
 * With a chooser (the fixed checklist) the chooser picks the test while the engine is plainly testing; re-checks
 * and crank-and-reread requests are the engine's either way. Scoring:
 *
 * - right: proven (status "concluded" at or above the threshold) on the true cause;
 * - confidently wrong: proven on any other cause;
 * - undecided: everything else (no test left, "not proven", step cap). For a healthy circuit (`no_fault_now`)
 *   only a proven `no_fault_now` is right; undecided is safe but not right; proven as a wire or part fault
 *   (any cause whose repair names a part, not "none" or "unknown") is the worst error and is counted on its own.
 * - a wiring fault that shows on none of the tree's tests (`faultShows`: every reading within the instrument's
 *   accuracy of the same circuit without it) cannot be told from a healthy circuit: for it, undecided and a proven
 *   "no fault now" are right too (a proven wire or part fault other than the true one stays confidently wrong).
 *   Such cases are counted on their own line.
 */
import { diagnose, requestKey, type Diagnosis, type DiagnosisOptions, type Reading, type Tree } from '../../../src/engine/diagnosis';
import { UNBOUNDED_PLANNING_MS, type TestChooser } from '../../../src/engine/diagnosis/drive';
import type { TreeRequest } from '../../../src/engine/diagnosis/request-key';
import { HEALTHY_CAUSE } from '../../../src/engine/diagnosis/load-tree';
import { answerOomRequest, faultShows, type OomCase } from './cases';

export type Verdict = 'right' | 'confidently_wrong' | 'undecided';

export interface OomRun {
  verdict: Verdict;
  /** The proven cause, or null. */
  proven: string | null;
  /** A healthy circuit proven as a wire or part fault. */
  healthyBlamed: boolean;
  /** Proven on a wrong cause whose repair names a wire or part (not "none" or "unknown"). */
  wrongPartBlamed: boolean;
  /** The case's fault shows on none of the tree's tests. */
  hidden: boolean;
  /** Proven wrongly as `no_fault_now` (a fault missed) or as `unknown` (not modelled). */
  wrongNoFault: boolean;
  wrongUnknown: boolean;
  status: Diagnosis['status'];
  readings: number;
  minutes: number;
  /** Milliseconds per `diagnose` call (a full recompute). */
  latencies: number[];
  last: Diagnosis;
  taken: Reading[];
}

export const STEP_CAP = 40;

/** A conclusion counts only when proven (the shape of the contract between the engine and its readers). */
export function isProven(d: Diagnosis): boolean {
  return d.status === 'concluded' && d.conclusion !== null && d.conclusion.reachedThreshold !== false;
}

/** Parts whose conclusion sends a technician to repair a wire or replace a part. */
export function blamesAPart(tree: Tree, hypothesisId: string): boolean {
  const part = tree.hypotheses.find((h) => h.id === hypothesisId)?.part;
  return part !== undefined && part !== 'none' && part !== 'unknown';
}

/** The circuit's sensor as a technician enters it (no codes): a position sensor, or a pressure sensor for an active one. */
function sensorNamed(c: OomCase): DiagnosisOptions {
  if (!('kind' in c.circuit) || c.circuit.kind !== 'three_wire_5v') return {};
  return { codes: { codes: [], sensor: c.circuit.sensor.kind === 'active' ? 'MAP' : 'TP A' } };
}

export async function runOomCase(tree: Tree, c: OomCase, opts: { choose?: TestChooser; options?: DiagnosisOptions; maxSteps?: number } = {}): Promise<OomRun> {
  const readings: Reading[] = [];
  const latencies: number[] = [];
  const attempts = new Map<string, number>();
  const start = Date.parse('2026-01-05T08:00:00Z');
  let paid = 0;
  let minutes = 0;
  for (let step = 0; ; step++) {
    const t0 = performance.now();
    // A simulated drive is reproducible whatever the machine's load: no planning deadline unless one is given.
    const d = await diagnose(tree, readings, [], { planningBudgetMs: UNBOUNDED_PLANNING_MS, ...sensorNamed(c), ...opts.options });
    latencies.push(performance.now() - t0);
    if (d.status === 'concluded' || d.status === 'exhausted' || !d.nextTest || step >= (opts.maxSteps ?? STEP_CAP)) {
      const proven = isProven(d) ? d.conclusion!.hypothesisId : null;
      const hidden = !faultShows(c, tree.tests.map((t) => t.request));
      const verdict: Verdict = proven === c.cause || (hidden && (proven === null || proven === HEALTHY_CAUSE)) ? 'right' : proven === null ? 'undecided' : 'confidently_wrong';
      const blames = proven !== null && blamesAPart(tree, proven);
      return { verdict, proven, hidden, healthyBlamed: c.cause === 'no_fault_now' && blames, wrongPartBlamed: verdict === 'confidently_wrong' && blames, wrongNoFault: verdict === 'confidently_wrong' && proven === 'no_fault_now', wrongUnknown: verdict === 'confidently_wrong' && proven === 'unknown', status: d.status, readings: readings.length, minutes, latencies, last: d, taken: readings };
    }
    const override = d.status === 'testing' && opts.choose ? opts.choose(tree, d) : undefined;
    const test = override ?? tree.tests.find((t) => t.id === d.nextTest!.id)!;
    const request: TreeRequest = override ? test.request : d.nextTest.request;
    minutes += test.minutes + test.setups.filter((s) => !((paid >> s.index) & 1)).reduce((a, s) => a + s.minutes, 0);
    paid |= test.setupMask;
    const key = requestKey(request);
    const attempt = attempts.get(key) ?? 0;
    attempts.set(key, attempt + 1);
    const id = `r${step + 1}`;
    if (!override && d.nextTest.recheckOf) {
      const old = readings.find((r) => r.id === d.nextTest!.recheckOf);
      if (old) old.supersededBy = id;
    }
    readings.push({ id, request, value: answerOomRequest(c, request, attempt), takenAt: new Date(start + (step + 1) * 60_000).toISOString(), phase: 'diagnosis' });
  }
}

export interface Tally {
  cases: number;
  right: number;
  confidentlyWrong: number;
  undecided: number;
  healthyBlamed: number;
  wrongPartBlamed: number;
  wrongNoFault: number;
  wrongUnknown: number;
  hidden: number;
  readings: number;
  minutes: number;
}

export const emptyTally = (): Tally => ({ cases: 0, right: 0, confidentlyWrong: 0, undecided: 0, healthyBlamed: 0, wrongPartBlamed: 0, wrongNoFault: 0, wrongUnknown: 0, hidden: 0, readings: 0, minutes: 0 });

export function addRun(t: Tally, run: OomRun): void {
  t.cases++;
  if (run.verdict === 'right') t.right++;
  else if (run.verdict === 'confidently_wrong') t.confidentlyWrong++;
  else t.undecided++;
  if (run.healthyBlamed) t.healthyBlamed++;
  if (run.wrongPartBlamed) t.wrongPartBlamed++;
  if (run.wrongNoFault) t.wrongNoFault++;
  if (run.wrongUnknown) t.wrongUnknown++;
  if (run.hidden) t.hidden++;
  t.readings += run.readings;
  t.minutes += run.minutes;
}
