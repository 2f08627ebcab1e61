/**
 * Likelihoods from the circuit model: for every test and hypothesis of a tree, sample the reading by Monte Carlo
 * (part spreads and meter error, averaged over the tree's circuit variants), count the share landing in each
 * outcome's range, and record the p5–p95 percentiles. Readings in a guard band are the indeterminate case, so
 * each row is the distribution of determinate readings. The same seed and sample count give the same table.
 */
import { bandProbabilities, defaultCircuit, faultsFor, percentile, sampleReadings, type DefaultCircuitOptions } from '../circuit';
import { CIRCUIT_KINDS, type CircuitKind, type MeasurementRequest } from '../vocabulary';
import { finding, joinPath, type Finding } from './findings';
import { conditionInterval } from './outcome-rules';
import type { BandsDocument, TestDocument, TreeDocument, VariantDocument } from './tree-schema';

export interface DeriveOptions {
  seed: number;
  /** Samples per (test, hypothesis) cell, split over the variants by weight. */
  samples: number;
}

const round = (x: number, digits = 4) => Number(x.toFixed(digits));
const sig = (x: number) => (Number.isFinite(x) ? Number(x.toPrecision(4)) : ('overload' as const));

/** The request the circuit model understands (the tree-only `sensor` field removed). */
function circuitRequest(request: TestDocument['request']): MeasurementRequest {
  const { sensor: _sensor, ...rest } = request;
  return rest;
}

function sampleCell(kind: CircuitKind, variants: VariantDocument[], hypothesis: string, test: TestDocument, opts: DeriveOptions): { values: Float64Array } | { problem: string } {
  const faults = faultsFor(hypothesis);
  if (!faults) return { problem: `the circuit model has no faults for "${hypothesis}"` };
  const total = variants.reduce((a, v) => a + v.weight, 0);
  const parts: Float64Array[] = [];
  for (const [i, variant] of variants.entries()) {
    const samples = Math.max(1, Math.round((opts.samples * variant.weight) / total));
    const circuit = defaultCircuit(kind, variant.circuit as DefaultCircuitOptions);
    const sampled = sampleReadings({ circuit, faults: faultsFor(hypothesis)!, request: circuitRequest(test.request), samples, seed: opts.seed + i });
    if (!sampled.ok) return { problem: sampled.findings.map((f) => f.message).join('; ') };
    parts.push(sampled.values);
  }
  const values = new Float64Array(parts.reduce((a, p) => a + p.length, 0));
  let at = 0;
  for (const p of parts) values.set(p, (at += p.length) - p.length);
  return { values: values.sort() };
}

/**
 * Recomputes the likelihood rows and bands of a circuit-model tree. Cells the model cannot predict (an ohms reading
 * on a powered circuit, say) get a flat row: the test says nothing about that cause.
 */
export function deriveLikelihoods(doc: TreeDocument, opts: DeriveOptions): { document: TreeDocument; findings: Finding[] } {
  const findings: Finding[] = [];
  if (!(CIRCUIT_KINDS as readonly string[]).includes(doc.circuitKind)) {
    return { document: doc, findings: [finding('derive.unknown_circuit_kind', 'circuitKind', `the circuit model has no "${doc.circuitKind}" circuit; keep hand-given likelihoods`)] };
  }
  const kind = doc.circuitKind as CircuitKind;
  const variants = doc.derivation?.variants ?? [{ id: 'default', weight: 1, circuit: {} }];
  const tests = doc.tests.map((test, ti) => {
    const intervals = test.outcomes.map((o) => conditionInterval(o.condition));
    if (intervals.some((r) => !r)) {
      findings.push(finding('derive.outcome_not_a_range', joinPath('tests', ti, 'outcomes'), 'every outcome must be a plain range on the value to derive likelihoods'));
      return test;
    }
    const bandsSpec = test.outcomes.map((o, oi) => ({
      id: o.id,
      min: Number.isFinite(intervals[oi]!.lo) ? intervals[oi]!.lo : undefined,
      max: Number.isFinite(intervals[oi]!.hi) ? intervals[oi]!.hi : undefined,
    }));
    const likelihoods: TestDocument['likelihoods'] = {};
    const bands: Record<string, BandsDocument> = {};
    for (const h of doc.hypotheses) {
      if (h.unknown) continue;
      const cell = sampleCell(kind, variants, h.id, test, opts);
      if ('problem' in cell) {
        findings.push(finding('derive.cell_flat', joinPath('tests', ti, 'likelihoods', h.id), `flat row: ${cell.problem}`, 'info'));
        likelihoods[h.id] = Object.fromEntries(test.outcomes.map((o) => [o.id, round(1 / test.outcomes.length)]));
        continue;
      }
      const probs = bandProbabilities(cell.values, bandsSpec);
      const determinate = 1 - probs.other!;
      likelihoods[h.id] = Object.fromEntries(test.outcomes.map((o) => [o.id, determinate > 0 ? round(probs[o.id]! / determinate) : round(1 / test.outcomes.length)]));
      if (determinate <= 0) findings.push(finding('derive.all_in_guard_band', joinPath('tests', ti, 'likelihoods', h.id), 'every sampled reading fell in a guard band; flat row', 'warning'));
      const q = (p: number) => sig(percentile(cell.values, p));
      bands[h.id] = { p5: q(0.05), p25: q(0.25), p50: q(0.5), p75: q(0.75), p95: q(0.95) };
    }
    return { ...test, likelihoods, bands };
  });
  return {
    document: { ...doc, tests, derivation: { ...doc.derivation, method: 'circuit_model_monte_carlo', seed: opts.seed, samples: opts.samples, variants } },
    findings,
  };
}

/** The seed and sample count the built-in trees are derived with (scripts/derive-likelihoods.ts). */
export const BUILT_IN_DERIVATION: DeriveOptions = { seed: 20_240_611, samples: 2000 };
