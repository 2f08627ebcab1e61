import { describe, expect, it } from 'vitest';
import { builtInDocuments, builtInTrees, codeLikelihoods, diagnose, loadTree, weighCodes, type CodeOptions, type Tree } from '../../../src/engine/diagnosis';

const trees = builtInTrees();
const threeWire = trees['three-wire-5v']!;
const shared = trees['shared-reference']!;

const likeOf = (tree: Tree, code: string) => {
  const r = codeLikelihoods(tree, code);
  if (!r.ok) throw new Error(r.reason);
  return (id: string) => r.like[tree.hypotheses.find((h) => h.id === id)!.index]!;
};
const probability = (d: { ranked: Array<{ id: string; probability: number }> }, id: string) => d.ranked.find((h) => h.id === id)!.probability;

describe('a code is read as the share of each cause’s predicted voltage in its window', () => {
  // Directions from circuit laws, not from our model: a wire shorted to ground holds the node at 0 V, to battery
  // voltage at ~12 V (clamped to 5 V by the converter); an open wire carries no current, so no voltage drops along it
  // (Ohm's law); a thermistor shorted inside reads 0 Ω, open inside infinite ohms (pull-up to 5 V).
  it.each([
    ['three-wire-5v', 'P0122', 'signal_short_ground', 'signal_short_voltage', 10, 'low signal: a short to ground over a short to voltage'],
    ['three-wire-5v', 'P0122', 'reference_short_ground', 'ground_open', 10, 'low signal: no reference over an open sensor ground (signal floats up to the reference)'],
    ['three-wire-5v', 'P0123', 'signal_short_voltage', 'signal_short_ground', 10, 'high signal: a short to voltage over a short to ground'],
    ['three-wire-5v', 'P0123', 'ground_open', 'signal_short_ground', 10, 'high signal: an open sensor ground (the signal floats up to the reference) over a signal held at ground'],
    ['two-wire-thermistor', 'P0117', 'sensor_internal_shorted', 'sensor_internal', 10, 'low ECT signal: a shorted thermistor over an open one'],
    ['two-wire-thermistor', 'P0118', 'signal_open', 'signal_short_ground', 10, 'high ECT signal: an open signal over a short to ground'],
    ['three-wire-5v', 'P0642', 'reference_short_ground', 'reference_open', 10, 'low reference at the module: a short to ground over an open (no current, no drop at the module pin)'],
    ['three-wire-5v', 'P0643', 'reference_short_voltage', 'reference_short_ground', 10, 'high reference: a short to voltage over a short to ground'],
    // The shared reference's densities below 4.5 V: a pulled-down reference most of its mass, a good one none; "no fault now" is half anything.
    ['shared-reference', 'P0642', 'reference_short_ground', 'no_fault_now', 3, 'low shared reference: a short to ground over no fault now'],
  ] as const)('on %s, %s makes %s likelier than %s at least %d times (%s)', (treeId, code, more, less, factor, _why) => {
    const like = likeOf(trees[treeId]!, code);
    expect(like(more)).toBeGreaterThan(factor * like(less));
  });

  it('gives the "not modelled" cause the leak’s share of the window: 0.3 V of the converter’s −0.1…5.1 V span (computed: 0.3 / 5.2)', () => {
    expect(likeOf(threeWire, 'P0122')('unknown')).toBeCloseTo(0.3 / 5.2, 4);
  });

  it('reads a "circuit" code as either side of the span: its likelihood is the low and the high code’s summed (computed from the two windows)', () => {
    const [circuit, low, high] = ['P0120', 'P0122', 'P0123'].map((c) => likeOf(threeWire, c));
    for (const h of threeWire.hypotheses) expect(circuit!(h.id)).toBeCloseTo(low!(h.id) + high!(h.id), 6);
  });

  it('weighs "no fault now" as an intermittent: half the healthy circuit, half anything, so a stored code does not rule it out', () => {
    const like = likeOf(threeWire, 'P0122');
    expect(like('no_fault_now')).toBeGreaterThan(0.5 * (0.3 / 5.2) - 1e-9); // at least half the leak's share (computed: 0.5 · 0.3 / 5.2)
  });
});

// Each case: the codes, and a pair of causes whose order the codes turn round (the prior has the first one lower).
// Expected numbers are computed from the table (prior × P(code | cause), normalised); which pair turns round follows
// from the circuit laws above and the window (common practice, no source): e.g. a high signal from an open sensor
// ground (the signal floats to the reference) over an open signal wire read through a 250 kΩ bias either way.
const RANKING_CASES: Array<[string, string, CodeOptions, string, string]> = [
  ['a low-input code on TP A', 'three-wire-5v', { codes: ['P0122'], sensor: 'TP A' }, 'reference_short_ground', 'ground_open'],
  ['a high-input code on TP B', 'three-wire-5v', { codes: ['P0223'], sensor: 'TP sensor 2' }, 'signal_short_voltage', 'signal_short_ground'],
  ['a low-input code on MAP', 'three-wire-5v', { codes: ['P0107'], sensor: 'MAP' }, 'reference_short_ground', 'ground_open'],
  ['a high-input code on APP E', 'three-wire-5v', { codes: ['P2128'], sensor: 'APP E' }, 'ground_open', 'signal_open'],
  ['a low-input code on fuel tank pressure', 'three-wire-5v', { codes: ['P0452'], sensor: 'FTP' }, 'reference_open', 'signal_open'],
  ['a low-input code on ECT', 'two-wire-thermistor', { codes: ['P0117'], sensor: 'ECT' }, 'sensor_internal_shorted', 'sensor_internal'],
  ['a high-input code on IAT', 'two-wire-thermistor', { codes: ['P0113'], sensor: 'IAT' }, 'signal_short_voltage', 'signal_short_ground'],
  ['a low reference A code on a sensor fed by reference A', 'three-wire-5v', { codes: ['P0642'], sensor: 'TP A', reference: 'A' }, 'reference_supply_failed', 'signal_open'],
];

describe('codes change the ranking as the table says', () => {
  it.each(RANKING_CASES)('%s on %s: the prior times the code likelihoods, normalised (%j); %s rises above %s', async (_name, treeId, codes, up, down) => {
    const tree = trees[treeId]!;
    const plain = await diagnose(tree, []);
    const coded = await diagnose(tree, [], { codes });
    const product = tree.hypotheses.map((h) => h.prior * codes.codes.reduce((a, c) => a * likeOf(tree, c)(h.id), 1));
    const z = product.reduce((a, b) => a + b, 0);
    for (const h of tree.hypotheses) expect(probability(coded, h.id)).toBeCloseTo(product[h.index]! / z, 10);
    expect(probability(plain, up)).toBeLessThan(probability(plain, down));
    expect(probability(coded, up)).toBeGreaterThan(probability(coded, down));
    expect(coded.codesWeighed).toEqual([expect.objectContaining({ code: codes.codes[0], weighed: true, window: expect.stringContaining('common practice, no source') })]);
    expect(coded.codesWeighed[0]!.effect).toMatch(/raises/);
  });

  it('combines several codes by multiplying their likelihoods (taken as independent)', async () => {
    const both = await diagnose(threeWire, [], { codes: { codes: ['P0122', 'P0642'], sensor: 'TP A', reference: 'A' } });
    const [a, b] = [likeOf(threeWire, 'P0122'), likeOf(threeWire, 'P0642')];
    const w = threeWire.hypotheses.map((h) => h.prior * a(h.id) * b(h.id));
    const z = w.reduce((x, y) => x + y, 0);
    for (const h of threeWire.hypotheses) expect(probability(both, h.id)).toBeCloseTo(w[h.index]! / z, 10);
    expect(both.codesWeighed.map((c) => [c.code, c.weighed])).toEqual([['P0122', true], ['P0642', true]]);
  });

  it('counts a code entered twice once', async () => {
    const once = await diagnose(threeWire, [], { codes: { codes: ['P0122'], sensor: 'TP A' } });
    const twice = await diagnose(threeWire, [], { codes: { codes: ['P0122', 'p0122'], sensor: 'TP A' } });
    expect(twice.ranked).toEqual(once.ranked);
  });

  it('leaves the prior alone with no codes, or only codes about other sensors, and lists the others as not weighed', async () => {
    const plain = await diagnose(threeWire, []);
    expect(plain.codesWeighed).toEqual([]);
    expect((await diagnose(threeWire, [], { codes: { codes: [], sensor: 'TP A' } })).ranked).toEqual(plain.ranked);
    const other = await diagnose(threeWire, [], { codes: { codes: ['P0107', 'P0117'], sensor: 'TP A' } });
    expect(other.ranked).toEqual(plain.ranked);
    expect(other.codesWeighed).toEqual([
      expect.objectContaining({ code: 'P0107', weighed: false, effect: expect.stringContaining('concerns MAP') }),
      expect.objectContaining({ code: 'P0117', weighed: false, effect: expect.stringContaining('concerns ECT') }),
    ]);
    expect(other.findings.filter((f) => f.code.startsWith('codes.') || f.code === 'options.unknown')).toEqual([]);
  });

  it('still lets the readings decide: a low-input code does not stop a short to voltage from being found', async () => {
    const at = (i: number) => new Date(Date.parse('2026-12-03T09:00:00Z') + i * 60_000).toISOString();
    const req = (id: string) => structuredClone(threeWire.tests.find((t) => t.id === id)!.request);
    // A signal shorted to a 12 V circuit reads battery voltage on the wire and a clamped 5.00 V scan (Ohm's law; converter full scale)
    const readings = [
      { id: 'a', request: req('signal_backprobed'), value: 12.4, takenAt: at(1), phase: 'diagnosis' as const },
      { id: 'b', request: req('signal_unplugged'), value: 12.3, takenAt: at(2), phase: 'diagnosis' as const },
      { id: 'c', request: req('reference_backprobed'), value: 5.0, takenAt: at(3), phase: 'diagnosis' as const },
    ];
    const d = await diagnose(threeWire, readings, { codes: { codes: ['P0122'], sensor: 'TP A' } });
    expect(d.ranked[0]!.id).toBe('signal_short_voltage');
  });
});

describe('codes that cannot be weighed are findings, not errors', () => {
  it.each([
    ['a manufacturer code', ['P1234'], 'TP A', undefined, 'codes.not_in_table', 'info'],
    ['a further sensor series inside P2120–P2135 in hex', ['P212C'], 'APP D', undefined, 'codes.not_in_table', 'info'],
    ['a malformed code', ['P01X2'], 'TP A', undefined, 'dtc.bad_format', 'warning'],
    ['a TP code on a circuit named only "TP"', ['P0122'], 'TP', undefined, 'codes.sensor_unknown', 'info'],
    ['a reference code with the feeding reference unknown', ['P0642'], 'TP A', undefined, 'codes.reference_unknown', 'info'],
  ] as const)('%s: %j on %s', async (_name, codes, sensor, reference, code, severity) => {
    const d = await diagnose(threeWire, [], { codes: { codes, sensor, ...(reference ? { reference } : {}) } });
    expect(d.findings).toContainEqual(expect.objectContaining({ code, path: expect.stringMatching(/^options\.codes/), severity }));
    expect(d.status).toBe('testing');
    expect(d.ranked).toEqual((await diagnose(threeWire, [])).ranked);
  });

  it.each([['P0121'], ['P0124'], ['P2135']])('lists %s (range/performance, intermittent or correlation: no voltage window) as not weighed, without a finding', async (code) => {
    const d = await diagnose(threeWire, [], { codes: { codes: [code], sensor: 'TP A' } });
    expect(d.codesWeighed).toEqual([expect.objectContaining({ code, weighed: false, effect: expect.stringContaining('no voltage window') })]);
    expect(d.findings.filter((f) => f.code.startsWith('codes.'))).toEqual([]);
  });

  it('reports codes given in the wrong shape as one finding and diagnoses on', async () => {
    const d = await diagnose(threeWire, [], { codes: { codes: 'P0122', sensor: 'TP A' } as unknown as CodeOptions });
    expect(d.findings).toContainEqual(expect.objectContaining({ code: 'codes.invalid', path: 'options.codes' }));
    expect(d.status).toBe('testing');
  });
});

describe('per-cause likelihoods for other callers', () => {
  it('gives a hand-given shared-reference tree the likelihoods of its own "below 4.5 V" outcome for a low reference code (hand rows)', () => {
    const doc = builtInDocuments().find((d) => d.id === 'shared-reference')!;
    const loaded = loadTree({ ...doc, tests: doc.tests.map((t) => ({ ...t, predictive: undefined })), derivation: { method: 'hand' } });
    if (!loaded.ok) throw new Error(JSON.stringify(loaded.findings));
    const hand = loaded.tree;
    const r = codeLikelihoods(hand, 'P0652');
    expect(r.ok).toBe(true);
    const test = hand.tests.find((t) => t.id === 'reference_plugged')!;
    const low = test.outcomes.find((o) => o.id === 'low')!.index;
    for (const h of hand.hypotheses.filter((x) => x.index !== hand.healthyIndex)) {
      expect(r.ok && r.like[h.index]).toBeCloseTo(test.like[h.index * test.outcomes.length + low]!, 10);
    }
  });

  it.each([['P1234', 'no row'], ['P0124', 'no voltage window']])('explains why %s has none', (code, reason) => {
    const r = codeLikelihoods(threeWire, code);
    expect(r.ok).toBe(false);
    expect(!r.ok && r.reason).toContain(reason);
  });

  it('gives the product of the weighed codes’ likelihoods per cause, for a reference shared by several sensors', () => {
    const w = weighCodes(shared, { codes: ['P0652', 'P0107'], sensor: 'MAP', reference: 'B' });
    const [ref, map] = [codeLikelihoods(shared, 'P0652'), codeLikelihoods(shared, 'P0107')];
    // P0107 has no key-on signal reading on the shared-reference tree: listed, not weighed
    expect(map.ok).toBe(false);
    for (const h of shared.hypotheses) expect(w.likelihood[h.id]).toBeCloseTo(ref.ok ? ref.like[h.index]! : NaN, 12);
    expect(w.codesWeighed.map((c) => [c.code, c.weighed])).toEqual([['P0652', true], ['P0107', false]]);
  });

  it('is deterministic: the same tree and code give the same numbers', () => {
    const weighed = (t: Tree) => weighCodes(t, { codes: ['P0641'], sensor: 'MAP', reference: 'A' }).codesWeighed;
    expect(weighed(threeWire)).toEqual(weighed(threeWire));
  });
});
