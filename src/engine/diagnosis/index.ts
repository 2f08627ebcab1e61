/**
 * Fault-tree diagnosis engine: data in, result out. Plain TypeScript; json-rules-engine sits behind
 * `outcome-rules.ts` only.
 *
 * - `loadTree(json)` validates a tree document (built-in or a shop's upload) → a loaded tree whose `version` is a
 *   content hash, or coded findings `{ code, path, message, severity }`.
 * - `builtInTrees()` the trees shipped in `src/engine/trees/`, keyed by tree id.
 * - `diagnose(tree, readings, repairs?, options?)` → ranked causes, the next test (with the exact `request` a
 *   client posts back with the value), the path so far, the conclusion (only when proven) or what is undecided,
 *   and a status. Pure and deterministic. How readings are weighed: posterior.ts, predictive.ts, evidence.ts.
 * - Published methods for checks and reuse: ECR ordering and ECO (Heckerman, Breese & Rommelse 1995), expected
 *   entropy (de Kleer & Williams 1987), stop / Q1 / Q2 / exact V.
 */
import type { Phase } from '../vocabulary';
import { runDiagnosis } from './diagnose';
import type { Finding } from './findings';
import { loadTree as load, type LoadOptions, type LoadResult } from './load-tree';
import type { TreeRequest } from './request-key';
import type { DiagnosisStatus, NextTestReason } from './status-rules';
import type { Caution, Tree } from './tree-model';
import type { BandsDocument, TreeDocument } from './tree-schema';
import type { Verdict } from './reading-checks';
import type { Undecided } from './undecided';
import type { ComparisonEntry, ComparisonHalfReading } from './comparisons';
export type { ComparisonEntry, ComparisonHalfReading } from './comparisons';
import type { CodeOptions, CodeWeighed } from './code-evidence';
import threeWire from '../trees/three-wire-5v.json';
import twoWire from '../trees/two-wire-thermistor.json';
import sharedReference from '../trees/shared-reference.json';

export type { Finding } from './findings';
export type { Tree, Test, Hypothesis, Outcome, Setup, Caution } from './tree-model';
export type { TreeDocument } from './tree-schema';
export type { TreeRequest } from './request-key';
export type { DiagnosisStatus, NextTestReason } from './status-rules';
export type { Verdict } from './reading-checks';
export type { LoadOptions, LoadResult } from './load-tree';
export type { Undecided } from './undecided';
export { codeLikelihoods, weighCodes, type CodeLikelihood, type CodeOptions, type CodeWeighed, type WeighedCodes } from './code-evidence';
export { TREE_FORMAT } from './tree-schema';
export { TREE_LIMITS, checkTreeLimits, jsonDepth, treeLimitsTable, type TreeLimitName } from './tree-limits';
export { requestKey } from './request-key';
export { scanUnitRefusal } from './scan-units';
export { healthyOutcome, type HealthyOutcome } from './healthy-outcome';
export { retestsStillNeeded, type Retest } from './retests';
export { CAUTION_KINDS, cautionsInContext, requiredCautions, type WorkContext } from './cautions';
export {
  expectedCostOfRepair,
  optimalRepairOrder,
  expectedCostOfObservation,
  likelihoodFromPredictions,
  expectedEntropies,
  priorEntropy,
  stopCost,
  myopicQ,
  twoStepQ,
  exactValue,
  type RepairComponent,
  type DecisionProblem,
} from './published-methods';

import type { ScanConditions } from './scan-temperature';

/** A reading as entered against a repair order. */
export interface Reading {
  id: string;
  /** Where and under which conditions: must equal a test's `request` to answer that test. */
  request: TreeRequest;
  /** SI units (volts, ohms, amps); scan values as shown. An open ohms reading is `"overload"`. */
  value: number | 'overload';
  /**
   * The unit of a scan value (when absent: V, or °C for a half of a comparison of two temperature PIDs). Another unit is converted to the test's where a published conversion
   * exists (% of the converter's full scale; °C on a thermistor circuit), else the reading is refused.
   */
  unit?: string;
  /** ISO 8601. */
  takenAt: string;
  phase: Phase;
  /** Id of the reading that replaced this one (a re-check); a superseded reading no longer counts. */
  supersededBy?: string;
}

/** A repair done on the vehicle: readings taken before it on tests that concern `part` stop counting. */
export interface Repair {
  id: string;
  /** reference | signal | ground | sensor | module | … (a tree hypothesis's `repair.part`). */
  part: string;
  /** ISO 8601. */
  at: string;
}

export interface DiagnosisOptions {
  /** Conclude once one cause reaches this probability (default: the tree's, else 0.95). */
  concludeAt?: number;
  /** L: minutes a wrong conclusion costs (comeback), used by stop(e) = L · (1 − max P). Default 240. */
  wrongConclusionMinutes?: number;
  /** `exact` dynamic programming, `lookahead` (Q_k), or `auto` (exact when the state space is small). */
  strategy?: 'auto' | 'exact' | 'lookahead';
  /** k of Q_k for the lookahead strategy (default 2). */
  lookaheadDepth?: number;
  /** `auto` uses exact V when at most this many evidence states remain (default 100). */
  exactStateBudget?: number;
  /** log P(e | modelled cause) − log P(e | chance) below this is a contradiction (default −4). */
  contradictionThreshold?: number;
  /** Added to the converter's own tolerance when two key-on scan values are compared as "unchanged" (default 0). */
  frozenScanTolerance?: number;
  /** Indeterminate readings of one test before it is set aside (default 2). */
  maxAttempts?: number;
  /** How many leading causes get a predicted reading range (default 3). */
  leadingCauses?: number;
  /**
   * Milliseconds allowed for choosing the next test (default 50); past it the choice falls back to one-step
   * lookahead and a `diagnosis.planning_budget_spent` finding says so. 0 always takes the cheap choice.
   */
  planningBudgetMs?: number;
  /**
   * The order's trouble codes and the circuit's sensor: codes that concern this sensor's circuit multiply the prior
   * by P(code | cause) before any reading is weighed; others are listed as not weighed.
   */
  codes?: CodeOptions;
  /** What the technician knows of the temperatures (ambient, cold soak): bounds a scan temperature's plausibility. */
  conditions?: ScanConditions;
}

export interface PathEntry {
  readingId: string;
  takenAt: string;
  value: unknown;
  testId?: string;
  testLabel?: string;
  verdict: Verdict;
  outcomeId?: string;
  outcomeLabel?: string;
  note: string;
}

export interface NextTest {
  id: string;
  label: string;
  reason: NextTestReason;
  /** The reading to be replaced (re-checks): post the new one and set the old one's `supersededBy`. */
  recheckOf?: string;
  procedure: string[];
  preconditions: string[];
  cautions: Caution[];
  /** Set-up steps still to do before this test. */
  setups: Array<{ id: string; label: string; minutes: number; steps: string[] }>;
  minutes: number;
  setupMinutes: number;
  totalMinutes: number;
  /** Exactly what the client sends back with the value (for a comparison: the half still to take). */
  request: TreeRequest;
  /**
   * A comparison test: the two readings whose difference is weighed (first − second, in `unit`), each with the
   * reading already taken for it, if any. Each is posted as an ordinary reading.
   */
  comparison?: { unit: string; first: ComparisonHalfReading; second: ComparisonHalfReading };
  outcomes: Array<{ id: string; label: string; range: [number, number] | null }>;
  /** Predicted reading for the leading causes: percentiles from the tree's stored bands, and the likeliest outcome. */
  predictions: Array<{ hypothesisId: string; label: string; probability: number; band: BandsDocument | null; likelyOutcome: string }>;
  /** Expected minutes to finish if this test is taken (Q2 or exact Q). */
  expectedMinutesToFinish: number | null;
  strategy: 'exact' | 'lookahead' | null;
  /** All candidate tests, best first. */
  ranking: Array<{ testId: string; expectedMinutes: number; informationBits: number; minutes: number }>;
}

export interface Conclusion {
  hypothesisId: string;
  label: string;
  probability: number;
  repair: { part: string; action: string };
  /** Counted readings that favoured this cause over the others, strongest first. */
  decidedBy: string[];
  /** Readings that confirm this cause directly (Bayes factor above 3 against the rest), strongest first. */
  confirmedBy?: string[];
  /** Always true: a conclusion is given only when a cause is proven (kept for clients that read it). */
  reachedThreshold: boolean;
}

export interface Diagnosis {
  treeId: string;
  treeVersion: string;
  status: DiagnosisStatus;
  ranked: Array<{ id: string; label: string; part: string; probability: number }>;
  nextTest: NextTest | null;
  path: PathEntry[];
  /** Set only with `status === 'concluded'`: the cause reached the threshold and no counted reading contradicts it. */
  conclusion: Conclusion | null;
  /** Set when no test is left and nothing is proven: the leading causes and how to separate them; no repair. */
  undecided: Undecided | null;
  logZ: number;
  logEvidenceVsChance: number;
  /** The order's codes: which were weighed on this circuit, the window each was read as and what it did. */
  codesWeighed: CodeWeighed[];
  /** Each comparison test: its two readings, their difference and outcome, or what it still waits for. */
  comparisons: ComparisonEntry[];
  findings: Finding[];
}

/** Validates and normalises a tree document (parsed JSON): a loaded tree with a content-hash version, or findings. */
export function loadTree(json: unknown, options: LoadOptions = {}): LoadResult {
  return load(json, options);
}

export { loadingCause, sharedReferenceTree, sharedReferenceTreeFor, sensorsOf as sharedReferenceSensors, type SharedSensor } from './shared-reference-tree';
export { SHARED_REFERENCE_SENSORS } from './tree-limits';
export { scanTemperatureFindings, checkScanConditions, COLD_SOAK_SPREAD_C, BELOW_AMBIENT_SPREAD_C, AMBIENT_RANGE_C, type ScanConditions } from './scan-temperature';

let builtIns: Record<string, Tree> | undefined;

/** The built-in trees (three-wire 5 V, two-wire thermistor, shared 5 V reference), keyed by tree id. */
export function builtInTrees(): Record<string, Tree> {
  if (builtIns) return builtIns;
  const out: Record<string, Tree> = {};
  for (const doc of [threeWire, twoWire, sharedReference] as unknown[]) {
    const result = load(doc);
    if (!result.ok) throw new Error(`built-in tree does not load: ${JSON.stringify(result.findings.slice(0, 3))}`);
    out[result.tree.id] = result.tree;
  }
  return (builtIns = out);
}

/** The built-in tree made for a kind of circuit (there is one per kind), or undefined for a kind without one. */
export function builtInTreeFor(circuitKind: string): Tree | undefined {
  return Object.values(builtInTrees()).find((t) => t.circuitKind === circuitKind);
}

/** The raw built-in documents (for the derive script and for shops copying a tree to adapt). */
export function builtInDocuments(): TreeDocument[] {
  return [threeWire, twoWire, sharedReference] as unknown as TreeDocument[];
}

/**
 * Diagnoses from the readings so far. Pure: the same tree, readings, repairs and options give the same result.
 * `repairs` may be omitted (`diagnose(tree, readings, options)`).
 */
export async function diagnose(
  tree: Tree,
  readings: readonly Reading[],
  repairsOrOptions: readonly Repair[] | DiagnosisOptions = [],
  options: DiagnosisOptions = {},
): Promise<Diagnosis> {
  const repairs = Array.isArray(repairsOrOptions) ? (repairsOrOptions as readonly Repair[]) : [];
  const opts = Array.isArray(repairsOrOptions) ? options : (repairsOrOptions as DiagnosisOptions);
  return runDiagnosis(tree, readings, repairs, opts);
}
