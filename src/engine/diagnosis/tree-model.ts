/** The loaded (validated, normalised) form of a fault tree that the inference and policy code work on. */
import type { TreeRequest } from './request-key';
import type { VoltsRequirement } from './safety-rules';
import type { Cell } from './predictive';
import type { OutcomeClassifier, Interval } from './outcome-rules';
import type { BandsDocument, RuleCondition, TestUnit, TreeDocument } from './tree-schema';
import type { WeighQuantity } from './meter-error';

export interface Hypothesis {
  index: number;
  id: string;
  label: string;
  /** Prior after normalisation over all hypotheses. */
  prior: number;
  /** The circuit part its repair concerns: reference, signal, ground, sensor, module, … */
  part: string;
  repairAction: string;
  unknown: boolean;
}

export interface Setup {
  index: number;
  id: string;
  label: string;
  minutes: number;
  steps: string[];
}

export interface Outcome {
  index: number;
  id: string;
  label: string;
  condition: RuleCondition;
  /** Accepted reading interval when the condition is a plain range on the value. */
  interval?: Interval;
}

export interface Caution {
  id: string;
  text: string;
}

export interface Test {
  index: number;
  id: string;
  label: string;
  procedure: string[];
  request: TreeRequest;
  /** For key-on scan tests: the same request with the engine cranking, asked for when the value looks frozen. */
  crankRequest?: TreeRequest;
  setups: Setup[];
  /** Bit i set when the test needs setup i. */
  setupMask: number;
  preconditions: string[];
  /** Wires that must have read at most the given volts, key on, before the test is proposed (declared and implied). */
  requires: VoltsRequirement[];
  cautions: Caution[];
  crankCautions: Caution[];
  minutes: number;
  /** Parts whose repair makes earlier readings of this test stale; undefined means every part. */
  parts?: string[];
  outcomes: Outcome[];
  /** P(outcome | hypothesis), floored and renormalised; index `h * outcomes.length + o`. */
  like: Float64Array;
  logLike: Float64Array;
  bands: Map<string, BandsDocument>;
  classifier: OutcomeClassifier;
  /** Predictive densities (circuit-model trees): when set, they weigh readings and `like` is not used. */
  predictive?: CompiledPredictive;
  /** Scan tests and comparisons: the unit values are compared in. */
  unit?: TestUnit;
  /** A comparison: the test's value is the reading of `request` minus the reading of `compare.request`. */
  compare?: { request: TreeRequest; label: string };
  /** How the value is weighed: the request's quantity, or the difference of a comparison. */
  weighAs: WeighQuantity;
}

export interface ComparisonHalf {
  test: Test;
  half: 'first' | 'second';
}

export interface CompiledPredictive {
  cells: Cell[];
  /** Cell of (hypothesis h, class c) at h * nClasses + c; -1 = the broad density (the leak, or not predictable). */
  cellOf: Int32Array;
  /** The outcomes as a partition of the reading axis (guard bands split at their middle), for labels and planning. */
  partition: Array<{ lo: number; hi: number }>;
  /** P(outcome | h, c), the heavy tail included: index (h * nClasses + c) * nO + o. */
  bandLike: Float64Array;
}

/** A latent class of circuit shared by all readings of one circuit (bias, sensor position, temperature). */
export interface LatentClass {
  index: number;
  id: string;
  /** Prior share of the circuit class, normalised. */
  weight: number;
  alternative: number;
  klass: number;
}

export interface Tree {
  id: string;
  /** Content hash of the normalised document (`sha256:…`): what a diagnosis was computed against. */
  version: string;
  /** The version string the document itself declares. */
  declaredVersion: string;
  circuitKind: string;
  title: string;
  concludeAt: number;
  likelihoodFloor: number;
  hypotheses: Hypothesis[];
  unknownIndex: number;
  /** Index of the "no fault now" cause (the circuit tests good), or -1. */
  healthyIndex: number;
  /** Wires the tests probe on the working circuit (mated, key on): each must be read so before "no fault now". */
  wires: string[];
  logPrior: Float64Array;
  /**
   * Latent slots shared by every reading of a circuit: (cause alternative, circuit class), one for trees without
   * predictive densities.
   */
  classes: LatentClass[];
  /** log P(slot | cause) at h * classes.length + c (−Infinity where a cause has no such alternative). */
  logLatentPrior: Float64Array;
  setups: Setup[];
  tests: Test[];
  /** Request key → test, including the cranking re-read keys (comparisons are not here: see `halvesByRequest`). */
  testByRequest: Map<string, Test>;
  /** Request key → the comparisons that reading is a half of (`first` = `request`, `second` = `compare.request`). */
  halvesByRequest: Map<string, ComparisonHalf[]>;
  /** The normalised document (defaults filled, required cautions added) that the version hashes. */
  document: TreeDocument;
}
