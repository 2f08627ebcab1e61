import { describe, expect, it } from 'vitest';
import { builtInDocuments, builtInTrees, loadTree, type TreeDocument } from '../../../src/engine/diagnosis';

const base = (): TreeDocument => structuredClone(builtInDocuments().find((d) => d.id === 'three-wire-5v')!);
type Mutation = (doc: TreeDocument) => void;

describe('loading fault trees', () => {
  it.each(['three-wire-5v', 'two-wire-thermistor', 'shared-reference'])('loads the built-in %s tree without errors', (id) => {
    const tree = builtInTrees()[id]!;
    expect(tree.version).toMatch(/^sha256:[0-9a-f]{64}$/);
    expect(tree.hypotheses.filter((h) => h.unknown)).toHaveLength(1);
  });

  it('gives the three-wire tree every required hypothesis id', () => {
    const ids = builtInTrees()['three-wire-5v']!.hypotheses.map((h) => h.id);
    expect(ids).toEqual(
      expect.arrayContaining(['reference_open', 'reference_short_ground', 'reference_short_voltage', 'signal_open', 'signal_short_ground', 'signal_short_voltage', 'signal_short_reference', 'ground_open', 'ground_high_resistance', 'sensor_internal', 'module_internal', 'unknown']),
    );
  });

  it.each<[string, Mutation, string, string]>([
    ['a tree without an unknown hypothesis', (d) => d.hypotheses.forEach((h) => delete h.unknown), 'tree.no_unknown_hypothesis', 'hypotheses'],
    ['a negative prior', (d) => (d.hypotheses[0]!.prior = -1), 'tree.schema.too_small', 'hypotheses[0].prior'],
    ['overlapping outcomes', (d) => ((d.tests[0]!.outcomes[1]!.condition as { all: Array<{ value: unknown }> }).all[0]!.value = [0.4, 4.8]), 'tree.outcomes_overlap', 'tests[0].outcomes[1].condition'],
    ['a lenient numeric operator', (d) => ((d.tests[1]!.outcomes[0]!.condition as { all: Array<{ operator: string }> }).all[0]!.operator = 'greaterThan'), 'tree.condition.coercing_operator', 'tests[1].outcomes[0].condition.all[0].operator'],
    ['an inRange value that is not [low, high]', (d) => ((d.tests[1]!.outcomes[0]!.condition as { all: Array<{ value: unknown }> }).all[0]!.value = ['0', 1]), 'tree.condition.bad_value', 'tests[1].outcomes[0].condition.all[0].value'],
    ['an unknown set-up', (d) => d.tests[2]!.setups.push('remove_bumper'), 'tree.unknown_setup', 'tests[2].setups[1]'],
    ['an unknown caution', (d) => d.tests[2]!.cautions.push('wear_gloves'), 'tree.unknown_caution', 'tests[2].cautions'],
    ['a missing likelihood row', (d) => delete d.tests[3]!.likelihoods['signal_open'], 'tree.likelihood_row_missing', 'tests[3].likelihoods.signal_open'],
    ['a likelihood for an outcome the test lacks', (d) => (d.tests[3]!.likelihoods['signal_open']!['sideways'] = 0.1), 'tree.likelihood_unknown_outcome', 'tests[3].likelihoods.signal_open.sideways'],
    ['two tests with the same request', (d) => (d.tests[4]!.request = structuredClone(d.tests[0]!.request)), 'tree.duplicate_request', 'tests[4].request'],
    ['a scan request without a parameter', (d) => delete d.tests[3]!.request.pid, 'tree.request.pid_missing', 'tests[3].request.pid'],
    ['a volts request without a second lead', (d) => delete d.tests[0]!.request.against, 'tree.request.against_missing', 'tests[0].request.against'],
    ['a predictive cell with too few quantiles', (d) => (d.tests[1]!.predictive!.cells[0]!.q = [0.1, 0.2]), 'tree.predictive_cell_invalid', 'tests[1].predictive.cells[0].q'],
    ['a cause with a cell for too few circuit classes', (d) => (d.tests[1]!.predictive!.index['signal_open'] = [0]), 'tree.predictive_classes_mismatch', 'tests[1].predictive.index.signal_open'],
    ['an unknown probe point', (d) => ((d.tests[0]!.request as { at: string }).at = 'pin_7'), 'tree.schema.invalid_value', 'tests[0].request.at'],
  ])('refuses %s with a coded finding at its JSON path', (_name, mutate, code, path) => {
    const doc = base();
    mutate(doc);
    const result = loadTree(doc);
    expect(result.ok).toBe(false);
    const hit = result.findings.find((f) => f.code === code);
    expect(hit, JSON.stringify(result.findings.slice(0, 3))).toBeDefined();
    expect(hit!.path.startsWith(path)).toBe(true);
    expect(hit!.message.length).toBeGreaterThan(5);
  });

  it('adds the safety cautions a test needs and says so (common practice, no source)', () => {
    const doc = base();
    // A test with the engine turning must list its caution (a tree is refused without it); the rest are added.
    doc.tests.forEach((t) => (t.cautions = t.request.engine === 'off' ? [] : ['engine_turning']));
    const result = loadTree(doc);
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const jumper = result.tree.tests.find((t) => t.id === 'jumper_reference_to_signal')!;
    expect(jumper.cautions.map((c) => c.id)).toEqual(expect.arrayContaining(['fused_jumper_only', 'no_battery_on_reference']));
    expect(jumper.crankCautions.map((c) => c.id)).toContain('engine_turning');
    expect(result.tree.tests.find((t) => t.id === 'reference_backprobed')!.cautions.map((c) => c.id)).toContain('backprobe_gently');
    expect(result.tree.tests.find((t) => t.id === 'ground_ohms_to_battery')!.cautions.map((c) => c.id)).toContain('ohms_unpowered');
    expect(result.findings.some((f) => f.code === 'tree.caution_added' && f.path === 'tests[7].cautions')).toBe(true);
  });

  it('floors and renormalises every likelihood row so no outcome rules a cause out', () => {
    const tree = builtInTrees()['three-wire-5v']!;
    for (const test of tree.tests) {
      const nO = test.outcomes.length;
      for (let h = 0; h < tree.hypotheses.length; h++) {
        const row = Array.from(test.like.slice(h * nO, (h + 1) * nO));
        expect(row.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
        expect(Math.min(...row)).toBeGreaterThanOrEqual(tree.likelihoodFloor / (1 + nO * tree.likelihoodFloor) - 1e-12);
      }
    }
  });

  it('versions an uploaded shop tree by its content hash: same content, same version; any change, a new one', () => {
    const a = loadTree(base());
    const b = loadTree(base());
    const changed = base();
    changed.tests[0]!.minutes += 1;
    const c = loadTree(changed);
    expect(a.ok && b.ok && c.ok).toBe(true);
    if (!a.ok || !b.ok || !c.ok) return;
    expect(a.tree.version).toBe(b.tree.version);
    expect(c.tree.version).not.toBe(a.tree.version);
  });

  it('accepts a shop tree with hand-given likelihoods and rows that do not sum to one, with a warning', () => {
    const doc = base();
    doc.id = 'shop-pedal';
    doc.tests[0]!.likelihoods['reference_open'] = { none: 0.5, low: 0.1 };
    const result = loadTree(doc);
    expect(result.ok).toBe(true);
    expect(result.findings.some((f) => f.code === 'tree.likelihood_row_not_normalised' && f.severity === 'warning')).toBe(true);
  });

  it('refuses something that is not a tree at all', () => {
    const result = loadTree('three-wire');
    expect(result.ok).toBe(false);
    expect(result.findings[0]!.path).toBe('$');
  });
});
