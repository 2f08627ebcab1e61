import { describe, expect, it } from 'vitest';
import { mulberry32 } from '../../../src/engine/circuit';
import { builtInTrees } from '../../../src/engine/diagnosis';
import { driveToEnd } from '../../../src/engine/diagnosis/drive';
import { drawCase } from '../../../src/engine/diagnosis/simulate';

// End to end against the circuit model (src/engine/circuit): the fault is injected into a circuit drawn with part
// spreads, every test the engine asks for is answered with the model's reading plus meter error (seeded), and the
// engine must reach the right conclusion. Both module biases are exercised (pull-up and pull-down).
const threeWire = builtInTrees()['three-wire-5v']!;
// Every fault of the tree (its hypotheses but the catch-all "unknown").
const faults = threeWire.hypotheses.map((h) => h.id).filter((id) => id !== 'unknown');
const cases = faults.flatMap((f, i) => ['bias_pull_up', 'bias_pull_down'].map((v, j) => [f, v, 1000 + 10 * i + j] as const));

describe('diagnosing simulated three-wire faults end to end', () => {
  it.each(cases)('finds %s on a circuit with %s (seed %i)', async (fault, variant, seed) => {
    const c = drawCase(threeWire, mulberry32(seed), { hypothesisId: fault, variantId: variant });
    const result = await driveToEnd(threeWire, c);
    expect(result.status).toBe('concluded');
    expect(result.conclusion).toBe(fault);
    expect(result.last.conclusion!.probability).toBeGreaterThanOrEqual(0.95);
    expect(result.last.conclusion!.decidedBy.length).toBeGreaterThan(0);
  });
});

describe('diagnosing simulated thermistor faults end to end', () => {
  const twoWire = builtInTrees()['two-wire-thermistor']!;
  const ids = twoWire.hypotheses.filter((h) => !h.unknown).map((h) => h.id);
  it.each(ids.map((id, i) => [id, 2000 + i] as const))('finds %s (seed %i)', async (fault, seed) => {
    const c = drawCase(twoWire, mulberry32(seed), { hypothesisId: fault });
    const result = await driveToEnd(twoWire, c);
    // A two-wire circuit has no reference to read: a healthy one may end "not proven" against a slightly weak
    // supply, never with a wrong conclusion. Every fault is concluded.
    if (fault === 'no_fault_now' && result.conclusion === null) expect(result.last.undecided!.leading[0]!.id).toBe(fault);
    else expect(result.conclusion).toBe(fault);
  });
});
