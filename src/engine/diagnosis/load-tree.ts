/**
 * Loading a tree document: shape check (zod), cross-reference checks, then normalisation: priors summed to one,
 * required safety cautions added, likelihood rows floored and renormalised, a content hash as version.
 */
import { createHash } from 'node:crypto';
import { finding, hasErrors, joinPath, type Finding } from './findings';
import { cautionKind, requiredCautions } from './cautions';
import { compileOutcomes, conditionInterval } from './outcome-rules';
import { canonicalJson, requestKey, withConditions } from './request-key';
import { preconditionText, requirementsOf } from './safety-rules';
import { TREE_CHECKS } from './tree-checks';
import { checkTreeLimits } from './tree-limits';
import { parseTreeDocument, type TestDocument, type TreeDocument } from './tree-schema';
import type { Caution, ComparisonHalf, Hypothesis, LatentClass, Setup, Test, Tree } from './tree-model';
import { compilePredictive, weighAs } from './compile-predictive';
import { classesOf } from './derive-likelihoods';

export const DEFAULT_LIKELIHOOD_FLOOR = 0.02;
export const DEFAULT_CONCLUDE_AT = 0.95;
/** The cause that stands for "the circuit tests good now" (its readings are the healthy circuit's). */
export const HEALTHY_CAUSE = 'no_fault_now';
const WIRES: readonly string[] = ['reference', 'signal', 'ground'];
/**
 * A reading of the working circuit: connector mated, key on (a weak supply or a partial short shows under load). A
 * drop along a wire (a lead at each end) is not the wire's voltage, so it does not count.
 */
export const isLoaded = (t: Test) => t.request.connector !== 'unplugged' && t.request.key === 'on' && t.request.againstLocation === undefined;

export interface LoadOptions {
  /** A document stored before the current safety checks: their findings become warnings (the engine still enforces them). */
  stored?: boolean;
}

export type LoadResult = { ok: true; tree: Tree; findings: Finding[] } | { ok: false; findings: Finding[] };

/** Floors every entry at `floor` and renormalises, so one bad reading cannot eliminate the true cause. */
export function floorRow(row: ArrayLike<number>, floor: number): number[] {
  const sum = Array.from(row).reduce((a, b) => a + b, 0);
  const floored = Array.from(row, (p) => Math.max(sum > 0 ? p / sum : 1 / row.length, floor));
  const total = floored.reduce((a, b) => a + b, 0);
  return floored.map((p) => p / total);
}

function addRequiredCautions(doc: TreeDocument, findings: Finding[]): TreeDocument {
  const tests = doc.tests.map((t, i) => {
    // A comparison's two readings are taken under their own conditions: each one's cautions apply.
    const needed = [...new Set([...requiredCautions(t.request), ...(t.compare ? requiredCautions(t.compare.request) : [])])];
    const missing = needed.filter((c) => !t.cautions.includes(c));
    for (const c of missing)
      findings.push(finding('tree.caution_added', joinPath('tests', i, 'cautions'), `added the "${c}" caution this measurement needs`, c === 'service_information' ? 'info' : 'warning'));
    return missing.length ? { ...t, cautions: [...t.cautions, ...missing] } : t;
  });
  return { ...doc, tests };
}

const toCautions = (ids: string[]): Caution[] => ids.map((id) => ({ id, text: cautionKind(id)!.text }));

function compileTest(t: TestDocument, index: number, doc: TreeDocument, setups: Setup[], floor: number, latent: LatentClass[], nClasses: number): Test {
  const nO = t.outcomes.length;
  const nH = doc.hypotheses.length;
  const like = new Float64Array(nH * nO);
  doc.hypotheses.forEach((h, hi) => {
    const given = t.likelihoods[h.id];
    const row = given ? floorRow(t.outcomes.map((o) => given[o.id] ?? 0), floor) : t.outcomes.map(() => 1 / nO);
    row.forEach((p, o) => (like[hi * nO + o] = p));
  });
  const mine = setups.filter((s) => t.setups.includes(s.id));
  const requires = requirementsOf(t);
  const safety = preconditionText(requires, t.request.location);
  const intervals = t.outcomes.map((o) => conditionInterval(o.condition));
  const predictive = t.predictive && intervals.every((r) => r) ? compilePredictive(t.predictive, t, doc, latent, nClasses, intervals.map((r) => r!)) : undefined;
  // Not with the input moved: a throttle held open while cranking cuts fuel on many engines.
  const crankable = !t.compare && t.request.quantity === 'scan_value' && t.request.key === 'on' && t.request.engine === 'off' && t.request.sensorInput !== 'moved';
  const crankRequest = crankable ? withConditions(t.request, { engine: 'cranking' }) : undefined;
  return {
    index,
    id: t.id,
    label: t.label,
    procedure: t.procedure,
    request: t.request,
    crankRequest,
    setups: mine,
    setupMask: mine.reduce((m, s) => m | (1 << s.index), 0),
    preconditions: safety && !t.preconditions.includes(safety) ? [safety, ...t.preconditions] : t.preconditions,
    requires,
    cautions: toCautions(t.cautions),
    crankCautions: crankRequest ? toCautions([...new Set([...t.cautions, ...requiredCautions(crankRequest)])]) : [],
    minutes: t.minutes,
    parts: t.parts,
    outcomes: t.outcomes.map((o, oi) => ({ index: oi, id: o.id, label: o.label, condition: o.condition, interval: intervals[oi] })),
    like,
    logLike: like.map(Math.log),
    bands: new Map(Object.entries(t.bands ?? {})),
    classifier: compileOutcomes(t.outcomes),
    predictive,
    unit: t.unit ?? (t.request.quantity === 'scan_value' || t.compare ? 'V' : undefined),
    compare: t.compare,
    weighAs: weighAs(t),
  };
}

/**
 * Validates and normalises a tree document (parsed JSON). Returns the loaded tree, or the findings that stop it
 * (each with a JSON path and a reason). Warnings (e.g. an added caution) come back with a loaded tree too.
 */
export function loadTree(json: unknown, options: LoadOptions = {}): LoadResult {
  const limits = checkTreeLimits(json);
  if (limits.length > 0) return { ok: false, findings: limits };
  const parsed = parseTreeDocument(json);
  if (!parsed.document) return { ok: false, findings: parsed.findings };
  const findings = TREE_CHECKS.flatMap((check) =>
    check.run(parsed.document!).map((f) => (options.stored && check.relaxedWhenStored && f.severity === 'error' ? { ...f, severity: 'warning' as const } : f)),
  );
  if (hasErrors(findings)) return { ok: false, findings };
  const doc = addRequiredCautions(parsed.document, findings);
  const floor = doc.settings.likelihoodFloor ?? DEFAULT_LIKELIHOOD_FLOOR;
  const priorSum = doc.hypotheses.reduce((a, h) => a + h.prior, 0);
  if (Math.abs(priorSum - 1) > 1e-6) findings.push(finding('tree.priors_renormalised', 'hypotheses', `priors summed to ${priorSum.toFixed(4)}; they were scaled to sum to 1`, 'info'));
  const hypotheses: Hypothesis[] = doc.hypotheses.map((h, index) => ({
    index,
    id: h.id,
    label: h.label,
    prior: h.prior / priorSum,
    part: h.repair.part,
    repairAction: h.repair.action,
    unknown: h.unknown === true,
  }));
  const setups: Setup[] = doc.setups.map((s, index) => ({ index, ...s }));
  const predictiveTree = doc.tests.some((t) => t.predictive);
  const classDocs = predictiveTree ? classesOf(doc) : [{ id: 'any', weight: 1 }];
  const classWeight = classDocs.reduce((a, c) => a + c.weight, 0);
  const alternatives = (predictiveTree && doc.derivation?.alternatives) || {};
  const slots = Math.max(1, ...Object.values(alternatives).map((w) => w.length));
  const classes: LatentClass[] = Array.from({ length: slots }, (_, a) =>
    classDocs.map((c, k) => ({ index: a * classDocs.length + k, id: slots > 1 ? `${a}:${c.id}` : c.id, weight: c.weight / classWeight, alternative: a, klass: k })),
  ).flat();
  const logLatentPrior = new Float64Array(doc.hypotheses.length * classes.length);
  doc.hypotheses.forEach((h, hi) => {
    const w = alternatives[h.id] ?? [1];
    const sum = w.reduce((x, y) => x + y, 0);
    for (const l of classes) logLatentPrior[hi * classes.length + l.index] = l.alternative < w.length ? Math.log((w[l.alternative]! / sum) * l.weight) : -Infinity;
  });
  const tests = doc.tests.map((t, i) => compileTest(t, i, doc, setups, floor, classes, classDocs.length));
  const singles = tests.filter((t) => !t.compare);
  const testByRequest = new Map<string, Test>(singles.map((t) => [requestKey(t.request), t]));
  const halvesByRequest = new Map<string, ComparisonHalf[]>();
  for (const t of tests.filter((x) => x.compare))
    for (const [half, request] of [['first', t.request], ['second', t.compare!.request]] as const) {
      const key = requestKey(request);
      halvesByRequest.set(key, [...(halvesByRequest.get(key) ?? []), { test: t, half }]);
    }
  doc.tests.forEach((t, i) => t.compare || (t.alsoAnswers ?? []).forEach((r) => testByRequest.has(requestKey(r)) || testByRequest.set(requestKey(r), tests[i]!)));
  for (const t of tests) {
    if (!t.crankRequest) continue;
    const key = requestKey(t.crankRequest);
    if (testByRequest.has(key)) t.crankRequest = testByRequest.get(key)!.request;
    else testByRequest.set(key, t);
  }
  const hash = createHash('sha256').update(canonicalJson(doc)).digest('hex');
  const tree: Tree = {
    id: doc.id,
    version: `sha256:${hash}`,
    declaredVersion: doc.version,
    circuitKind: doc.circuitKind,
    title: doc.title,
    concludeAt: doc.settings.concludeAt ?? DEFAULT_CONCLUDE_AT,
    likelihoodFloor: floor,
    hypotheses,
    unknownIndex: hypotheses.findIndex((h) => h.unknown),
    healthyIndex: hypotheses.findIndex((h) => h.id === HEALTHY_CAUSE),
    wires: [...new Set(singles.filter(isLoaded).map((t) => t.request.at).filter((at) => WIRES.includes(at)))],
    logPrior: Float64Array.from(hypotheses, (h) => Math.log(h.prior)),
    classes,
    logLatentPrior,
    setups,
    tests,
    testByRequest,
    halvesByRequest,
    document: doc,
  };
  return { ok: true, tree, findings };
}
