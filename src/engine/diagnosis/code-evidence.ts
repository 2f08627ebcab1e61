/**
 * Trouble codes as evidence on the prior. A code sets while the voltage the module watches sits in a window
 * (code-table.ts), so P(code | cause) is the share of the cause's predicted voltage in that window:
 *
 *   P(code | h) = Σ_c P(c | h) · [(1 − ε)·mass of cell(h, c) in the window + ε·broad mass in the window]
 *
 * the same densities, heavy tail ε and latent classes that weigh a reading (predictive.ts). The signal's window is
 * read from the tree's own key-on, connector-mated scan test; the reference's is at the module's pin, drawn from
 * the circuit model by Monte Carlo (the tree's classes, spreads and seed), since a reference open out in the harness
 * leaves the module's pin at 5 V. A "no fault now" cause stands for an intermittent: half the healthy circuit, half
 * anything (as its flipping readings are weighed). Several codes multiply (taken as independent).
 */
import { codeRow, codeSensorOf, failureWords, parseDtc, windowsOf, type CodeRow, type CodeSensor } from '../codes';
import { CIRCUIT_KINDS, type CircuitKind, type MeasurementRequest, type Quantity } from '../vocabulary';
import { causeAlternatives, defaultCircuit, sampleReadings, type DefaultCircuitOptions, type Spreads } from '../circuit';
import { BUILT_IN_DERIVATION, classesOf } from './derive-likelihoods';
import { finding, type Finding } from './findings';
import { broadMass } from './meter-error';
import { coreMass, OUTLIER_WEIGHT } from './predictive';
import type { Test, Tree } from './tree-model';

export interface CodeOptions {
  /** The order's codes as stored ("P0122"). */
  codes: readonly string[];
  /** The circuit's sensor as entered ("TP A", "TP sensor 2", "ECT"). */
  sensor: string;
  /** The 5 V reference (A, B or C) that feeds this circuit, when known: reference codes are weighed only then. */
  reference?: 'A' | 'B' | 'C';
}

export interface CodeWeighed {
  code: string;
  meaning: string;
  weighed: boolean;
  /** What the code did to the ranking, in plain words, or why it was not weighed. */
  effect: string;
  /** The voltage window the code was read as, with its basis. */
  window?: string;
  /** P(code | cause) per cause id, when weighed. */
  likelihoods?: Record<string, number>;
}

export type CodeLikelihood = { ok: true; row: CodeRow; like: Float64Array; window: string } | { ok: false; row?: CodeRow; reason: string };

const SIGNAL_MONITOR = { quantity: 'scan_value', at: 'signal', connector: 'plugged' } as const;
const REFERENCE_MONITOR: MeasurementRequest = { quantity: 'dc_volts', at: 'reference', against: 'battery_negative', location: 'module_connector', connector: 'plugged', key: 'on', engine: 'off', jumpers: [] };
const REFERENCE_SAMPLES = 24;

/** The tree's test that reads what the module watches, key on, engine off, connectors mated, no jumpers. */
function monitorTest(tree: Tree, monitor: CodeRow['monitor']): Test | undefined {
  const keyOn = (t: Test) => t.request.key === 'on' && t.request.engine === 'off' && t.request.jumpers.length === 0;
  if (monitor === 'signal') return tree.tests.find((t) => keyOn(t) && t.request.quantity === SIGNAL_MONITOR.quantity && t.request.at === SIGNAL_MONITOR.at && t.request.connector === SIGNAL_MONITOR.connector);
  const atModule = tree.tests.find((t) => keyOn(t) && t.predictive && t.request.quantity === 'dc_volts' && t.request.at === 'reference' && t.request.location === 'module_connector' && t.request.connector === 'plugged');
  if (atModule || isModelTree(tree)) return atModule;
  // A hand-given tree, or the shared reference (no module-pin reading): its reference with the sensor mated stands for the module's.
  return tree.tests.find((t) => keyOn(t) && t.request.quantity === 'dc_volts' && t.request.at === 'reference' && t.request.connector !== 'unplugged');
}

const isModelTree = (tree: Tree) => tree.document.derivation?.method === 'circuit_model_monte_carlo' && (CIRCUIT_KINDS as readonly string[]).includes(tree.circuitKind);

const windowBroad = (q: Quantity, windows: Array<{ lo: number; hi: number }>) => windows.reduce((a, w) => a + broadMass(q, w.lo, w.hi), 0);

/** From a test's predictive cells, mixed over each cause's latent classes. */
function fromCells(tree: Tree, test: Test, windows: Array<{ lo: number; hi: number }>): Float64Array {
  const pred = test.predictive!;
  const q = test.request.quantity;
  const nC = tree.classes.length;
  const broad = windowBroad(q, windows);
  const like = new Float64Array(tree.hypotheses.length);
  for (const h of tree.hypotheses) {
    let sum = 0;
    for (let c = 0; c < nC; c++) {
      const w = Math.exp(tree.logLatentPrior[h.index * nC + c]!);
      if (w < 1e-12) continue;
      const cell = pred.cellOf[h.index * nC + c]!;
      const core = cell < 0 ? broad : windows.reduce((a, x) => a + coreMass(pred.cells[cell]!, x.lo, x.hi, q), 0);
      sum += w * ((1 - OUTLIER_WEIGHT) * Math.min(1, Math.max(0, core)) + OUTLIER_WEIGHT * broad);
    }
    like[h.index] = sum;
  }
  return like;
}

/** From a hand-given test's outcome rows: the outcomes whose range centre lies in the window. */
function fromRows(tree: Tree, test: Test, windows: Array<{ lo: number; hi: number }>): Float64Array | undefined {
  const nO = test.outcomes.length;
  if (test.outcomes.some((o) => !o.interval)) return undefined;
  const inside = test.outcomes.map((o) => windows.some((w) => (o.interval!.lo + o.interval!.hi) / 2 >= w.lo && (o.interval!.lo + o.interval!.hi) / 2 < w.hi));
  return Float64Array.from(tree.hypotheses, (h) => inside.reduce((a, yes, o) => a + (yes ? test.like[h.index * nO + o]! : 0), 0));
}

type Draws = Array<{ weight: number; values: Float64Array }>;
const sampled = new Map<string, Map<string, Draws>>();

/** The reference at the module's pin per cause, per (alternative, class) with its weight (cached per tree version). */
function referenceDraws(tree: Tree): Map<string, Draws> {
  const hit = sampled.get(tree.version);
  if (hit) return hit;
  const doc = tree.document;
  const seed = doc.derivation?.seed ?? BUILT_IN_DERIVATION.seed;
  const spreads = (doc.derivation?.spreads ?? {}) as Partial<Spreads>;
  const classes = classesOf(doc);
  const out = new Map<string, Draws>();
  for (const h of tree.hypotheses) {
    const alts = h.unknown ? undefined : causeAlternatives(h.id);
    if (!alts) continue;
    const draws: Draws = [];
    for (const alt of alts)
      for (const cls of classes) {
        const values: number[] = [];
        cls.circuits.forEach((options, j) => {
          const samples = Math.max(2, Math.round(REFERENCE_SAMPLES / cls.circuits.length));
          const r = sampleReadings({ circuit: defaultCircuit(tree.circuitKind as CircuitKind, options as DefaultCircuitOptions), faults: alt.faults, request: REFERENCE_MONITOR, samples, seed: seed + 97 * j, spreads: { ...spreads, meterError: false } });
          if (r.ok) values.push(...r.values);
        });
        if (values.length) draws.push({ weight: alt.weight * cls.weight, values: Float64Array.from(values) });
      }
    if (draws.length) out.set(h.id, draws);
  }
  if (sampled.size > 16) sampled.clear();
  sampled.set(tree.version, out);
  return out;
}

function fromDraws(tree: Tree, windows: Array<{ lo: number; hi: number }>): Float64Array {
  const draws = referenceDraws(tree);
  const broad = windowBroad('dc_volts', windows);
  const inWindow = (x: number) => windows.some((w) => x >= w.lo && x < w.hi);
  return Float64Array.from(tree.hypotheses, (h) => {
    const d = draws.get(h.id);
    if (!d) return broad;
    const total = d.reduce((a, x) => a + x.weight, 0);
    const share = d.reduce((a, x) => a + (x.weight * x.values.filter(inWindow).length) / x.values.length, 0) / total;
    return (1 - OUTLIER_WEIGHT) * share + OUTLIER_WEIGHT * broad;
  });
}

/**
 * P(code | cause) for every cause of the tree (index = hypothesis index), from the code's window. Not about whether
 * the code concerns the circuit: the caller decides that (weighCodes does for one sensor's circuit).
 */
export function codeLikelihoods(tree: Tree, code: string): CodeLikelihood {
  const row = codeRow(code);
  if (!row) return { ok: false, reason: `${code} has no row in the code table` };
  const win = windowsOf(row);
  if (!win) return { ok: false, row, reason: `a "${failureWords(row.failure)}" code has no voltage window (it sets on a comparison)` };
  const test = monitorTest(tree, row.monitor);
  let like: Float64Array | undefined;
  if (test?.predictive) like = fromCells(tree, test, win.windows);
  else if (row.monitor === 'reference' && isModelTree(tree)) like = fromDraws(tree, win.windows);
  else if (test) like = fromRows(tree, test, win.windows);
  if (!like) return { ok: false, row, reason: `the tree "${tree.id}" has no key-on reading of the ${row.monitor} to weigh it with` };
  if (tree.healthyIndex >= 0) like[tree.healthyIndex] = 0.5 * like[tree.healthyIndex]! + 0.5 * windowBroad(test?.request.quantity ?? 'dc_volts', win.windows);
  return { ok: true, row, like, window: `${win.words} (common practice, no source)` };
}

/** Whether a tabled code concerns the circuit of `sensor` (fed by `reference`, when known). */
function concern(row: CodeRow, sensor: CodeSensor | undefined, reference: CodeOptions['reference']): 'yes' | 'no' | 'unknown_reference' {
  if (row.monitor === 'reference') return reference ? (row.sensors.includes(`5 V reference ${reference}`) ? 'yes' : 'no') : 'unknown_reference';
  return sensor && row.sensors.includes(sensor) ? 'yes' : 'no';
}

const pct = (p: number) => (p >= 0.095 ? `${Math.round(p * 100)} %` : p >= 0.001 ? `${(p * 100).toFixed(1)} %` : 'under 0.1 %');

/** In words: the causes a code moved most, up and down (prior → after). */
function effectWords(tree: Tree, before: Float64Array, after: Float64Array): string {
  const moves = tree.hypotheses.map((h) => ({ label: h.label, from: before[h.index]!, to: after[h.index]!, ratio: after[h.index]! / before[h.index]! }));
  const up = moves.filter((m) => m.ratio > 1.25).sort((a, b) => b.to - b.from - (a.to - a.from)).slice(0, 3);
  const down = moves.filter((m) => m.ratio < 0.8).sort((a, b) => a.ratio - b.ratio).slice(0, 3);
  const list = (ms: typeof moves) => ms.map((m) => `${m.label.charAt(0).toLowerCase()}${m.label.slice(1)} (${pct(m.from)} → ${pct(m.to)})`).join('; ');
  if (!up.length && !down.length) return 'hardly changes the ranking: every cause explains it about equally';
  return [up.length ? `raises ${list(up)}` : '', down.length ? `lowers ${list(down)}` : ''].filter(Boolean).join('; ');
}

export interface WeighedCodes {
  /** The tree with its prior multiplied by the codes' likelihoods (the same tree when no code was weighed). */
  tree: Tree;
  codesWeighed: CodeWeighed[];
  /** Π P(code | cause) over the weighed codes, per cause id (1 everywhere when none was). */
  likelihood: Record<string, number>;
  findings: Finding[];
}

/**
 * The tree with its prior multiplied by the likelihoods of the codes that concern this circuit, what each code did,
 * and findings for codes that could not be read or weighed. Codes about other sensors are listed as not weighed.
 */
export function weighCodes(tree: Tree, options: CodeOptions | undefined): WeighedCodes {
  const findings: Finding[] = [];
  const product = new Float64Array(tree.hypotheses.length).fill(1);
  const likelihood = () => Object.fromEntries(tree.hypotheses.map((h) => [h.id, product[h.index]!]));
  if (options === undefined) return { tree, codesWeighed: [], likelihood: likelihood(), findings };
  if (!options || typeof options !== 'object' || !Array.isArray(options.codes)) {
    return { tree, codesWeighed: [], likelihood: likelihood(), findings: [finding('codes.invalid', 'options.codes', 'expected { codes: ["P0122", …], sensor: "TP A" }', 'warning')] };
  }
  const match = typeof options.sensor === 'string' ? codeSensorOf(options.sensor) : undefined;
  const sensor = match && 'sensor' in match ? match.sensor : undefined;
  const p = Float64Array.from(tree.hypotheses, (h) => h.prior);
  const codesWeighed: CodeWeighed[] = [];
  const seen = new Set<string>();
  options.codes.forEach((text, i) => {
    const path = `options.codes.codes[${i}]`;
    const parsed = parseDtc(text as string, path);
    if (!parsed.ok) return findings.push(...parsed.findings.map((f) => ({ ...f, severity: 'warning' as const })));
    const code = parsed.code;
    if (seen.has(code)) return;
    seen.add(code);
    const row = codeRow(code);
    if (!row) {
      findings.push(finding('codes.not_in_table', path, `${code} has no row in the code table (manufacturer-specific or outside the generic ranges weighed): not weighed; look it up in the service information`, 'info'));
      return codesWeighed.push({ code, meaning: 'not in the code table', weighed: false, effect: 'not weighed: no row in the code table' });
    }
    const about = concern(row, sensor, options.reference);
    const notWeighed = (effect: string) => codesWeighed.push({ code, meaning: row.meaning, weighed: false, effect });
    if (about === 'unknown_reference') {
      findings.push(finding('codes.reference_unknown', path, `${code} concerns sensor reference voltage ${row.sensors[0]!.slice(-1)}; which reference feeds this sensor is in the service information, so it is not weighed here`, 'info'));
      return notWeighed('not weighed: which 5 V reference feeds this sensor is not known');
    }
    if (about === 'no') {
      if (!sensor && row.monitor === 'signal') {
        const why = match && 'ambiguous' in match ? `the circuit's sensor "${options.sensor}" could be ${match.ambiguous.join(' or ')}; name it (e.g. "${match.ambiguous[0]}")` : `the circuit's sensor "${options.sensor}" has no codes in the table`;
        findings.push(finding('codes.sensor_unknown', 'options.codes.sensor', `${code} not weighed: ${why}`, 'info'));
        return notWeighed(`not weighed: ${why}`);
      }
      return notWeighed(`not weighed: concerns ${row.sensors.join(' / ')}, not this circuit`);
    }
    const result = codeLikelihoods(tree, code);
    if (!result.ok) {
      if (!result.reason.includes('no voltage window')) findings.push(finding('codes.not_weighable', path, `${code} not weighed: ${result.reason}`, 'info'));
      return notWeighed(`not weighed: ${result.reason}`);
    }
    const before = Float64Array.from(p);
    let z = 0;
    for (let h = 0; h < p.length; h++) {
      product[h] = product[h]! * result.like[h]!;
      z += p[h] = p[h]! * result.like[h]!;
    }
    for (let h = 0; h < p.length; h++) p[h] = p[h]! / z;
    codesWeighed.push({
      code,
      meaning: row.meaning,
      weighed: true,
      effect: effectWords(tree, before, p),
      window: result.window,
      likelihoods: Object.fromEntries(tree.hypotheses.map((h) => [h.id, Number(result.like[h.index]!.toPrecision(4))])),
    });
  });
  if (!codesWeighed.some((c) => c.weighed)) return { tree, codesWeighed, likelihood: likelihood(), findings };
  const hypotheses = tree.hypotheses.map((h) => ({ ...h, prior: p[h.index]! }));
  return { tree: { ...tree, hypotheses, logPrior: Float64Array.from(p, Math.log) }, codesWeighed, likelihood: likelihood(), findings };
}
