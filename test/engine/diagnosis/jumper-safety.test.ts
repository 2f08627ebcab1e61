import { describe, expect, it } from 'vitest';
import { causeAlternatives, faultsFor, HYPOTHESIS_IDS, mulberry32, validateFaults, type FaultSpec } from '../../../src/engine/circuit';
import { builtInDocuments, builtInTrees, loadTree, requestKey, type Reading, type Tree, type TreeDocument } from '../../../src/engine/diagnosis';
import { driveToEnd } from '../../../src/engine/diagnosis/drive';
import { jumperViolations } from '../../../src/engine/diagnosis/safety-rules';
import { drawCase, type SimulatedCase } from '../../../src/engine/diagnosis/simulate';
import { diagnoseFully } from '../../support/diagnose-fully';

// The rule (common practice, no source): no jumper before every wire it joins has read at most 5.5 V, key on; never a
// fused jumper between the 5 V reference and ground (a load resistor of 1 kΩ or more may join them).
const trees = builtInTrees();
const threeWire = trees['three-wire-5v']!;
const doc = (id: string): TreeDocument => structuredClone(builtInDocuments().find((d) => d.id === id)!);
const indexOf = (d: TreeDocument, id: string) => d.tests.findIndex((t) => t.id === id);
const at = (minute: number) => new Date(Date.parse('2026-03-02T08:00:00Z') + minute * 60_000).toISOString();
const reading = (tree: Tree, testId: string, value: number, minute: number): Reading => ({
  id: `r${minute}`,
  request: tree.tests.find((t) => t.id === testId)!.request,
  value,
  takenAt: at(minute),
  phase: 'diagnosis',
});

describe('no jumper before its wires were measured at or below 5.5 V key on', () => {
  it('with the reference shorted to battery voltage, no test joins the reference before the reference was measured', async () => {
    const c = drawCase(threeWire, mulberry32(8), { hypothesisId: 'reference_short_voltage', variantId: 'bias_pull_up' });
    const result = await driveToEnd(threeWire, c);
    expect(jumperViolations(result.readings)).toEqual([]);
    // Proven, or leading by far: on this case the first reading is an ohms check of a circuit the short keeps
    // powered (a meaningless number), which, once enough readings stand against it, holds a conclusion back.
    expect(result.conclusion ?? result.last.ranked[0]!.id).toBe('reference_short_voltage');
    // The reference was measured, read battery voltage, and the reference-to-signal jumper was never taken.
    const asked = result.readings.map((r) => threeWire.testByRequest.get(requestKey(r.request))?.id);
    expect(asked).not.toContain('jumper_reference_to_signal');
  });

  it('holds the reference-to-signal jumper back until the reference and signal have both read 5.5 V or less', async () => {
    const signalOnly = [reading(threeWire, 'signal_backprobed', 0.96, 1), reading(threeWire, 'scan_signal_plugged', 0.955, 2)];
    const held = await diagnoseFully(threeWire, signalOnly);
    expect(held.nextTest!.id).not.toBe('jumper_reference_to_signal');
    expect(held.nextTest!.ranking.map((r) => r.testId)).not.toContain('jumper_reference_to_signal');
    const cleared = await diagnoseFully(threeWire, [...signalOnly, reading(threeWire, 'reference_backprobed', 5.01, 3)]);
    expect(cleared.nextTest!.ranking.map((r) => r.testId)).toContain('jumper_reference_to_signal');
  });

  it('never proposes a jumper on a wire that read battery voltage, and says why with the reading path', async () => {
    const readings = [reading(threeWire, 'signal_backprobed', 1.9, 1), reading(threeWire, 'reference_backprobed', 11.87, 2)];
    const d = await diagnoseFully(threeWire, readings);
    const unsafe = d.findings.find((f) => f.code === 'diagnosis.jumper_unsafe');
    expect(unsafe?.path).toBe('readings[1]');
    expect(unsafe?.message).toContain('11.87 V');
    expect(d.nextTest?.ranking.map((r) => r.testId) ?? []).not.toContain('jumper_reference_to_signal');
  });

  it('shows the technician the precondition on every jumper test', () => {
    for (const tree of Object.values(trees))
      for (const t of tree.tests.filter((x) => x.request.jumpers.length > 0)) {
        expect(t.requires.every((r) => r.atMostVolts <= 5.5)).toBe(true);
        expect(t.preconditions[0]).toMatch(/read 5\.5 V or less, key on/);
      }
  });
});

// Every cause the circuit model knows that fits the circuit (tree causes and faults no tree names), each variant, two
// seeds: the engine drives the diagnosis on the simulated circuit and no jumper may come before its wires were measured.
// Named by id: a whole tree object in the title is as long as its document.
describe.each(Object.values(trees).filter((t) => t.circuitKind !== 'shared_5v_reference').map((t) => [t.id, t] as const))('the jumper rule over every cause of the %s tree', (_id, tree) => {
  const variants = tree.document.derivation?.variants?.map((v) => v.id) ?? ['default'];
  const sample = drawCase(tree, mulberry32(1));
  const causes = HYPOTHESIS_IDS.filter((id) => validateFaults(faultsFor(id), sample.circuit).length === 0);
  const cases = causes.flatMap((id, i) => variants.flatMap((v, j) => [11, 12].map((s) => [id, v, 100 * s + 10 * i + j] as const)));

  it.each(cases)('%s on %s (seed %i)', async (cause, variant, seed) => {
    const drawn = drawCase(tree, mulberry32(seed), { variantId: variant });
    const c: SimulatedCase = { ...drawn, hypothesisId: cause, faults: faultsFor(cause) };
    const result = await driveToEnd(tree, c);
    expect(jumperViolations(result.readings)).toEqual([]);
  });
});

// Every form of every cause of the tree (a dead or a weak supply, hard and partial shorts, each ground resistance) and
// the faults no cause names (a corroded terminal at either connector on each wire, a stuck or skewed sensor), one seed
// each: still no jumper before its wires were measured.
const EXTRA_FAULTS: FaultSpec[][] = [
  ...(['reference', 'signal', 'ground'] as const).flatMap((wire) =>
    (['sensor_connector', 'module_connector'] as const).map((connector): FaultSpec[] => [{ kind: 'poor_terminal', connector, wire, ohms: 500 }]),
  ),
  [{ kind: 'sensor_internal', variant: 'stuck' }],
  [{ kind: 'sensor_internal', variant: 'skewed' }],
];
describe.each(Object.values(trees).filter((t) => t.circuitKind !== 'shared_5v_reference').map((t) => [t.id, t] as const))('the jumper rule over every form of every cause of the %s tree', (_id, tree) => {
  const sample = drawCase(tree, mulberry32(2));
  const forms = tree.hypotheses
    .filter((h) => !h.unknown)
    .flatMap((h) => (causeAlternatives(h.id) ?? []).map((alt, k) => [`${h.id} form ${k + 1}`, alt.faults] as const));
  const extras = EXTRA_FAULTS.filter((f) => validateFaults(f, sample.circuit).length === 0).map((f) => [JSON.stringify(f[0]), f] as const);
  it.each([...forms, ...extras].map(([name, faults], i) => [`${name} (seed ${500 + i})`, faults, 500 + i] as const))('%s', async (name, faults, seed) => {
    const drawn = drawCase(tree, mulberry32(seed));
    const result = await driveToEnd(tree, { ...drawn, hypothesisId: name, faults: structuredClone(faults) as FaultSpec[] });
    expect(jumperViolations(result.readings)).toEqual([]);
  });
});

describe('the shared-reference tree', () => {
  it('has no jumper test, so the rule holds there by construction', () => {
    expect(trees['shared-reference']!.tests.filter((t) => t.request.jumpers.length > 0)).toEqual([]);
  });
});

describe('tree validation refuses a jumper test without the safety precondition', () => {
  type Mutation = (d: TreeDocument) => void;
  const jumperTest = (d: TreeDocument, id: string) => d.tests[indexOf(d, id)]!;
  it.each<[string, Mutation, string, (d: TreeDocument) => string]>([
    ['a jumper test that does not require its wires measured', (d) => (jumperTest(d, 'jumper_reference_to_signal').requires = []), 'tree.jumper_precondition_missing', (d) => `tests[${indexOf(d, 'jumper_reference_to_signal')}].requires`],
    [
      'a precondition above 5.5 V',
      (d) => (jumperTest(d, 'jumper_reference_to_signal').requires![0]!.atMostVolts = 14),
      'tree.jumper_precondition_too_high',
      (d) => `tests[${indexOf(d, 'jumper_reference_to_signal')}].requires[0].atMostVolts`,
    ],
    [
      'a fused jumper between the reference and sensor ground',
      (d) => (jumperTest(d, 'jumper_reference_to_signal').request.jumpers = [{ from: 'reference', to: 'ground', via: { kind: 'fused_jumper' } }]),
      'tree.jumper_reference_to_ground',
      (d) => `tests[${indexOf(d, 'jumper_reference_to_signal')}].request.jumpers[0]`,
    ],
    [
      'a 470 Ω resistor between the reference and battery negative',
      (d) => (jumperTest(d, 'jumper_reference_to_signal').request.jumpers = [{ from: 'reference', to: 'battery_negative', via: { kind: 'resistor', ohms: 470 } }]),
      'tree.jumper_reference_to_ground',
      (d) => `tests[${indexOf(d, 'jumper_reference_to_signal')}].request.jumpers[0]`,
    ],
    [
      'a jumper from battery positive',
      (d) => (jumperTest(d, 'jumper_reference_to_signal').request.jumpers = [{ from: 'battery_positive', to: 'signal', via: { kind: 'fused_jumper' } }]),
      'tree.jumper_battery_positive',
      (d) => `tests[${indexOf(d, 'jumper_reference_to_signal')}].request.jumpers[0]`,
    ],
    [
      'a precondition no test of the tree can meet',
      (d) => {
        d.tests = d.tests.filter((t) => !(t.request.at === 'reference' && t.request.quantity === 'dc_volts'));
      },
      'tree.precondition_unmeasurable',
      (d) => `tests[${indexOf(d, 'jumper_reference_to_signal')}].requires[0]`,
    ],
  ])('refuses %s with a coded finding at its JSON path', (_name, mutate, code, path) => {
    const d = doc('three-wire-5v');
    mutate(d);
    const result = loadTree(d);
    expect(result.ok).toBe(false);
    const hit = result.findings.find((f) => f.code === code);
    expect(hit, JSON.stringify(result.findings.slice(0, 3))).toBeDefined();
    expect(hit!.path).toBe(path(d));
  });

  it('accepts a load resistor of 1 kΩ between the reference and ground once the reference was measured', () => {
    const d = doc('three-wire-5v');
    const t = d.tests[indexOf(d, 'jumper_reference_to_signal')]!;
    t.request.jumpers = [{ from: 'reference', to: 'ground', via: { kind: 'resistor', ohms: 1000 } }];
    t.requires = [
      { measured: 'reference', atMostVolts: 5.5 },
      { measured: 'ground', atMostVolts: 5.5 },
    ];
    const result = loadTree(d);
    expect(result.ok ? [] : result.findings).toEqual([]);
  });

  it('loads a tree stored before the rule with warnings, and the engine still holds its jumper back', async () => {
    const d = doc('three-wire-5v');
    d.tests[indexOf(d, 'jumper_reference_to_signal')]!.requires = [];
    const result = loadTree(d, { stored: true });
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.findings.find((f) => f.code === 'tree.jumper_precondition_missing')?.severity).toBe('warning');
    const jumper = result.tree.tests.find((t) => t.id === 'jumper_reference_to_signal')!;
    expect(jumper.requires.map((r) => r.measured).sort()).toEqual(['reference', 'signal']);
    const d2 = await diagnoseFully(result.tree, [reading(result.tree, 'signal_backprobed', 0.96, 1), reading(result.tree, 'scan_signal_plugged', 0.955, 2)]);
    expect(d2.nextTest!.ranking.map((r) => r.testId)).not.toContain('jumper_reference_to_signal');
  });
});
