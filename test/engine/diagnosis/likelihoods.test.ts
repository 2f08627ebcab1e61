import { describe, expect, it } from 'vitest';
import { builtInDocuments } from '../../../src/engine/diagnosis';
import { BUILT_IN_DERIVATION, deriveLikelihoods } from '../../../src/engine/diagnosis/derive-likelihoods';
import { parseTreeDocument } from '../../../src/engine/diagnosis/tree-schema';
import { builtInSharedReferenceTree, deriveSharedReferenceCells, SHARED_DERIVATION, type SharedCellsDocument } from '../../../src/engine/diagnosis/shared-reference-tree';
import storedSharedCells from '../../../src/engine/trees/derived/shared-reference-cells.json';

// The stored predictive densities and tables must be what the circuit model gives (scripts/derive-likelihoods.ts,
// fixed seed, 360 draws per cause and class). A change to the circuit model, a tree's classes or its outcome ranges
// shows up here until the script is rerun.
describe('likelihood tables derived from the circuit model', () => {
  it.each(['three-wire-5v', 'two-wire-thermistor'])('stores for %s exactly the predictive densities, tables and bands a recomputation gives', (id) => {
    const stored = parseTreeDocument(builtInDocuments().find((d) => d.id === id)).document!;
    expect(stored.derivation).toMatchObject({ method: 'circuit_model_monte_carlo', ...BUILT_IN_DERIVATION });
    const { document } = deriveLikelihoods(stored, BUILT_IN_DERIVATION);
    for (const [i, test] of stored.tests.entries()) {
      expect(test.likelihoods, test.id).toEqual(document.tests[i]!.likelihoods);
      expect(test.bands, test.id).toEqual(document.tests[i]!.bands);
      expect(test.predictive, test.id).toEqual(document.tests[i]!.predictive);
      const first = stored.hypotheses[0]!.id;
      expect(test.predictive!.index[first], test.id).toHaveLength(stored.derivation!.classes!.length * (stored.derivation!.alternatives?.[first]?.length ?? 1));
    }
    // About a million circuit solves: a recomputation, not a timing; allow a busy machine.
  }, 300_000);

  it('stores for the shared-reference tree the cells a recomputation of the three-sensor reference gives, laid out as the built-in tree', () => {
    const stored = parseTreeDocument(builtInDocuments().find((d) => d.id === 'shared-reference')).document!;
    const cells = storedSharedCells as SharedCellsDocument;
    expect({ seed: cells.seed, samples: cells.samples }).toEqual(SHARED_DERIVATION);
    expect(deriveSharedReferenceCells(3, SHARED_DERIVATION)).toEqual(cells.counts['3']);
    expect(builtInSharedReferenceTree(cells)).toEqual(stored);
    expect(stored.derivation!.method).toBe('circuit_model_monte_carlo');
  }, 120_000);

  it('predicts the unplugged biased signal near 4.88 V through a 10 MΩ meter (meter loading: V·Rm/(Rm + Rs), computed)', () => {
    // 5 V behind a 250 kΩ pull-up read by 10 MΩ: 5 × 10/10.25 = 4.878 V (computed from the divider formula).
    const stored = parseTreeDocument(builtInDocuments().find((d) => d.id === 'three-wire-5v')).document!;
    const band = stored.tests.find((t) => t.id === 'signal_unplugged')!.bands!['signal_short_reference']!;
    expect(band.p50).toBeCloseTo(5.0, 0);
    const up = deriveLikelihoods({ ...stored, tests: stored.tests.filter((t) => t.id === 'signal_unplugged'), derivation: { method: 'circuit_model_monte_carlo', variants: [{ id: 'up', weight: 1, circuit: { bias: { kind: 'pull_up', ohms: 250000 } } }] } }, { seed: 1, samples: 400 });
    const p50 = up.document.tests[0]!.bands!['sensor_internal']!.p50 as number;
    expect(Math.abs(p50 - 4.878)).toBeLessThan(0.1);
  });
});
