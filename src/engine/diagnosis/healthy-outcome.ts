/**
 * What a healthy circuit reads on a tree's test, for printing an "expected" range beside each reading: the
 * circuit model's nominal reading of the fault-free circuit, and the outcome interval it falls in.
 */
import { defaultCircuit, predictReading } from '../circuit';
import { CIRCUIT_KINDS, type CircuitKind } from '../vocabulary';
import type { Test, Tree } from './tree-model';

export interface HealthyOutcome {
  outcomeId: string;
  label: string;
  /** The accepted interval; null bounds are open-ended. */
  min: number | null;
  max: number | null;
  /** V, Ω or A (SI), as the tree's conditions compare SI values. */
  unit: 'V' | 'Ω' | 'A';
  /** The nominal healthy reading itself. */
  nominal: number;
}

const UNIT = { V: 'V', ohm: 'Ω', A: 'A' } as const;

const isModelled = (kind: string): kind is CircuitKind => (CIRCUIT_KINDS as readonly string[]).includes(kind);

/**
 * The healthy outcome of a test, or undefined when the circuit model does not cover the tree's circuit kind, the
 * reading cannot be predicted, or the healthy reading falls in no plain-range outcome.
 */
export function healthyOutcome(tree: Tree, test: Test): HealthyOutcome | undefined {
  // A comparison's healthy difference is not one reading of the circuit.
  if (test.compare) return undefined;
  if (!isModelled(tree.circuitKind)) return namedHealthyOutcome(test);
  const predicted = predictReading(defaultCircuit(tree.circuitKind), [], test.request);
  if (!predicted.ok) return undefined;
  const outcome = test.outcomes.find((o) => o.interval && predicted.value >= o.interval.lo && predicted.value < o.interval.hi);
  if (!outcome?.interval) return undefined;
  return describe(outcome, UNIT[predicted.unit], predicted.value);
}

/** Trees the circuit model does not solve name their healthy outcome by id ("ok", "good" or "normal"). */
const HEALTHY_IDS = ['ok', 'good', 'normal'];
const QUANTITY_UNIT = { dc_volts: 'V', scan_value: 'V', ohms: 'Ω', amps: 'A' } as const;

function namedHealthyOutcome(test: Test): HealthyOutcome | undefined {
  const outcome = test.outcomes.find((o) => HEALTHY_IDS.includes(o.id) && o.interval);
  if (!outcome?.interval) return undefined;
  const { lo, hi } = outcome.interval;
  return describe(outcome, QUANTITY_UNIT[test.request.quantity], Number.isFinite(lo) && Number.isFinite(hi) ? (lo + hi) / 2 : Number.NaN);
}

function describe(outcome: Test['outcomes'][number], unit: HealthyOutcome['unit'], nominal: number): HealthyOutcome {
  const interval = outcome.interval!;
  const bound = (v: number) => (Number.isFinite(v) ? v : null);
  // Trees close "at most 0.1 V" outcomes with a negative floor as a guard; printed, that floor is open-ended.
  const floor = interval.lo < 0 ? null : bound(interval.lo);
  return { outcomeId: outcome.id, label: outcome.label, min: floor, max: bound(interval.hi), unit, nominal };
}
