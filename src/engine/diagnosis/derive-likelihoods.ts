/**
 * Predictive densities from the circuit model: for every test, cause and latent class of circuit (module bias
 * direction and resistance, sensor position or temperature), draw the reading by Monte Carlo over the part spreads
 * and store its quantiles and overload share (a cell; identical cells are stored once). The meter's error is not
 * drawn here: the engine adds it as a kernel when it weighs a reading. Outcome-band probabilities (over the outcomes
 * as a partition) and p5–p95 bands are recorded beside them for people. The same seed gives the same file.
 */
import { causeAlternatives, defaultCircuit, percentile, sampleDifferences, sampleReadings, type CauseAlternative, type DefaultCircuitOptions, type Spreads } from '../circuit';
import { CIRCUIT_KINDS, type CircuitKind, type MeasurementRequest } from '../vocabulary';
import { finding, joinPath, type Finding } from './findings';
import { conditionInterval } from './outcome-rules';
import { partitionOf, weighAs } from './compile-predictive';
import { coreMass, QUANTILE_LEVELS, type Cell } from './predictive';
import type { BandsDocument, ClassDocument, PredictiveDocument, TestDocument, TreeDocument } from './tree-schema';

export interface DeriveOptions {
  seed: number;
  /** Samples per (test, cause, class) cell, split over the class's circuits and the cause's alternatives. */
  samples: number;
}

const round = (x: number, digits = 4) => Number(x.toFixed(digits)) || 0;
const sig = (x: number) => (Number.isFinite(x) ? Number(x.toPrecision(4)) : ('overload' as const));

/** The request the circuit model understands (the tree-only `sensor` field removed). */
function circuitRequest(request: TestDocument['request']): MeasurementRequest {
  const { sensor: _sensor, ...rest } = request;
  return rest;
}

/** The classes of a document: its own, else one class per legacy variant. */
export function classesOf(doc: TreeDocument): ClassDocument[] {
  if (doc.derivation?.classes?.length) return doc.derivation.classes;
  return (doc.derivation?.variants ?? [{ id: 'default', weight: 1, circuit: {} }]).map((v) => ({ id: v.id, weight: v.weight, circuits: [v.circuit] }));
}

/**
 * What every derived circuit carries besides its class (common practice, no source): the module's own draw key on
 * (0.1–1 A) returns through its ground strap (3–40 mΩ) and the chassis strap (1–30 mΩ), so a wire grounded at the
 * chassis or the sensor ground reads a few to a few tens of millivolts against battery negative, never exactly 0;
 * and the 5 V output of a module switched off looks to an ohmmeter like anything from 300 Ω to 100 kΩ to ground.
 */
const MODULE_AMPS_NOMINAL = 0.5;
const MODULE_SPREADS: Partial<Spreads> = { moduleAmps: [0.1, 1.0], moduleGroundOhms: [0.003, 0.04], chassisGroundOhms: [0.001, 0.03], regulatorOffOhms: [300, 100_000] };

/**
 * What an ohmmeter shows on a wire a short keeps at battery voltage with the key off: its test current is swamped,
 * so it shows overload or a value that means nothing (common practice, no source: taken as half overload, half
 * anywhere from 0.1 Ω to 60 MΩ log-uniformly). Sorted, overloads (+Infinity) last.
 */
function poweredOhms(samples: number): Float64Array {
  const finite = Math.max(2, Math.floor(samples / 2));
  const [lo, hi] = [Math.log(0.1), Math.log(60e6)];
  return Float64Array.from({ length: 2 * finite }, (_, i) => (i < finite ? Math.exp(lo + ((hi - lo) * i) / (finite - 1)) : Infinity));
}

/** Sorted readings of one cell, or why the model cannot predict it. */
function sampleCell(kind: CircuitKind, cls: ClassDocument, alt: CauseAlternative, test: TestDocument, spreads: Partial<Spreads>, opts: DeriveOptions): { values: Float64Array } | { problem: string } {
  const parts: Float64Array[] = [];
  for (const [j, options] of cls.circuits.entries()) {
    const circuit = defaultCircuit(kind, options as DefaultCircuitOptions);
    circuit.module.supplyAmps ??= MODULE_AMPS_NOMINAL;
    circuit.module.regulator = { ...circuit.module.regulator, ...alt.regulator };
    const samples = Math.max(1, Math.round(opts.samples / cls.circuits.length));
    const input = { circuit, faults: alt.faults, request: circuitRequest(test.request), samples, seed: opts.seed + 97 * j, spreads: { ...MODULE_SPREADS, ...spreads, ...alt.spreads, meterError: false } };
    // A comparison: both readings on the same sampled circuit, their difference stored.
    const sampled = test.compare ? sampleDifferences({ ...input, compare: circuitRequest(test.compare.request) }) : sampleReadings(input);
    if (!sampled.ok && sampled.findings.every((f) => f.code === 'measurement.ohms_on_powered_circuit')) return { values: poweredOhms(opts.samples) };
    if (!sampled.ok) return { problem: sampled.findings.map((f) => f.message).join('; ') };
    parts.push(sampled.values);
  }
  const values = new Float64Array(parts.reduce((a, p) => a + p.length, 0));
  let at = 0;
  for (const p of parts) values.set(p, (at += p.length) - p.length);
  return { values: values.sort() };
}

function toCell(values: Float64Array): { q: number[]; overload?: number } {
  let finite = values.length;
  while (finite > 0 && !Number.isFinite(values[finite - 1]!)) finite--;
  const head = values.subarray(0, finite);
  const q = finite ? QUANTILE_LEVELS.map((l) => Number(percentile(head, l).toPrecision(4))) : [];
  const overload = round(1 - finite / values.length);
  return overload > 0 ? { q, overload } : { q };
}

const asCell = (c: { q: number[]; overload?: number }): Cell => ({ q: Float64Array.from(c.q), overload: c.overload ?? 0 });

/**
 * Recomputes the predictive block, likelihood rows and bands of a circuit-model tree. An ohms reading on a circuit
 * a short keeps powered is half overload, half anything (`poweredOhms`); a cell the model cannot predict otherwise is
 * stored as -1: the broad density, the test says nothing about that cause.
 */
export function deriveLikelihoods(doc: TreeDocument, opts: DeriveOptions): { document: TreeDocument; findings: Finding[] } {
  const findings: Finding[] = [];
  if (!(CIRCUIT_KINDS as readonly string[]).includes(doc.circuitKind)) {
    return { document: doc, findings: [finding('derive.unknown_circuit_kind', 'circuitKind', `the circuit model has no "${doc.circuitKind}" circuit; keep hand-given likelihoods`)] };
  }
  const kind = doc.circuitKind as CircuitKind;
  const classes = classesOf(doc);
  const spreads = (doc.derivation?.spreads ?? {}) as Partial<Spreads>;
  const totalWeight = classes.reduce((a, c) => a + c.weight, 0);
  const alternatives: Record<string, number[]> = {};
  const faultsOf = new Map<string, CauseAlternative[] | undefined>();
  for (const h of doc.hypotheses) {
    if (h.unknown) continue;
    const alts = causeAlternatives(h.id, kind);
    faultsOf.set(h.id, alts);
    if (alts && alts.length > 1) alternatives[h.id] = alts.map((a) => a.weight);
  }
  const tests = doc.tests.map((test, ti) => {
    const intervals = test.outcomes.map((o) => conditionInterval(o.condition));
    if (intervals.some((r) => !r)) {
      findings.push(finding('derive.outcome_not_a_range', joinPath('tests', ti, 'outcomes'), 'every outcome must be a plain range on the value to derive likelihoods'));
      return test;
    }
    // Band probabilities over the outcomes as a partition (guard bands split at their middle), as the engine plans.
    const partition = partitionOf(intervals.map((r) => r!));
    const cells: PredictiveDocument['cells'] = [];
    const cellIds = new Map<string, number>();
    const index: Record<string, number[]> = {};
    const likelihoods: TestDocument['likelihoods'] = {};
    const bands: Record<string, BandsDocument> = {};
    for (const h of doc.hypotheses) {
      if (h.unknown) continue;
      const row = new Float64Array(test.outcomes.length);
      const pooled: Float64Array[] = [];
      const alts: Array<CauseAlternative | { weight: number; faults: undefined }> = faultsOf.get(h.id) ?? [{ weight: 1, faults: undefined }];
      const altWeight = alts.reduce((a, x) => a + x.weight, 0);
      index[h.id] = alts.flatMap((alt) => classes.map((cls) => {
        const share = (alt.weight / altWeight) * (cls.weight / totalWeight);
        const sampled = alt.faults ? sampleCell(kind, cls, alt as CauseAlternative, test, spreads, opts) : { problem: `the circuit model has no faults for "${h.id}"` };
        if ('problem' in sampled) {
          findings.push(finding('derive.cell_broad', joinPath('tests', ti, 'predictive', h.id), `broad density: ${sampled.problem}`, 'info'));
          test.outcomes.forEach((_, o) => (row[o]! += share / test.outcomes.length));
          return -1;
        }
        pooled.push(sampled.values);
        const cell = toCell(sampled.values);
        const key = JSON.stringify(cell);
        if (!cellIds.has(key)) cellIds.set(key, cells.push(cell) - 1);
        const masses = partition.map((r) => Math.max(0, coreMass(asCell(cell), r.lo, r.hi, weighAs(test))));
        const determinate = masses.reduce((a, b) => a + b, 0);
        masses.forEach((m, o) => (row[o]! += share * (determinate > 0 ? m / determinate : 1 / masses.length)));
        return cellIds.get(key)!;
      }));
      likelihoods[h.id] = Object.fromEntries(test.outcomes.map((o, oi) => [o.id, round(row[oi]!)]));
      if (pooled.length) {
        const all = Float64Array.from(pooled.flatMap((p) => Array.from(p))).sort();
        const q = (p: number) => sig(percentile(all, p));
        bands[h.id] = { p5: q(0.05), p25: q(0.25), p50: q(0.5), p75: q(0.75), p95: q(0.95) };
      }
    }
    return { ...test, likelihoods, bands, predictive: { cells, index } };
  });
  return {
    document: { ...doc, tests, derivation: { ...doc.derivation, method: 'circuit_model_monte_carlo', seed: opts.seed, samples: opts.samples, classes, alternatives } },
    findings,
  };
}

/** The seed and sample count the built-in trees are derived with (scripts/derive-likelihoods.ts). */
export const BUILT_IN_DERIVATION: DeriveOptions = { seed: 20_261_203, samples: 360 };
