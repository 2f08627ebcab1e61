import { describe, expect, it } from 'vitest';
import { builtInDocuments, builtInTrees, diagnose, loadTree, type Reading, type TreeRequest } from '../../../src/engine/diagnosis';
import { diagnoseFully } from '../../support/diagnose-fully';

const tree = builtInTrees()['three-wire-5v']!;
const requestOf = (testId: string): TreeRequest => structuredClone(tree.tests.find((t) => t.id === testId)!.request);
let clock = Date.parse('2025-03-03T09:00:00Z');
const reading = (id: string, testId: string, value: Reading['value'], extra: Partial<Reading> = {}): Reading => ({
  id,
  request: requestOf(testId),
  value,
  takenAt: new Date((clock += 60_000)).toISOString(),
  phase: 'diagnosis',
  ...extra,
});
const probabilityOf = (d: Awaited<ReturnType<typeof diagnose>>, id: string) => d.ranked.find((h) => h.id === id)!.probability;

describe('diagnosing the three-wire 5 V tree', () => {
  it('proposes a first test with its request, cautions, set-up minutes and predicted readings', async () => {
    const d = await diagnoseFully(tree, []);
    expect(d.status).toBe('testing');
    const next = d.nextTest!;
    expect(tree.testByRequest.get(JSON.stringify(null))).toBeUndefined();
    expect(next.request).toEqual(tree.tests.find((t) => t.id === next.id)!.request);
    expect(next.totalMinutes).toBe(next.minutes + next.setups.reduce((a, s) => a + s.minutes, 0));
    expect(next.cautions.map((c) => c.id)).toContain('service_information');
    expect(next.predictions.length).toBeGreaterThan(0);
    expect(next.predictions[0]!.band).not.toBeNull();
    expect(d.ranked.reduce((a, h) => a + h.probability, 0)).toBeCloseTo(1, 12);
  });

  it('is a pure function: the same input gives the same diagnosis', async () => {
    const readings = [reading('a', 'reference_backprobed', 0.02), reading('b', 'signal_backprobed', 0.01)];
    expect(await diagnoseFully(tree, readings)).toEqual(await diagnoseFully(tree, structuredClone(readings)));
  });

  it('concludes a reference short to ground from 0 V on the reference and 0 Ω to ground, naming the deciding readings', async () => {
    const d = await diagnoseFully(tree, [
      reading('r1', 'reference_backprobed', 0.06),
      reading('r2', 'reference_unplugged', 0.07),
      reading('r3', 'reference_ohms_to_ground', 0.2),
    ]);
    expect(d.status).toBe('concluded');
    expect(d.conclusion!.hypothesisId).toBe('reference_short_ground');
    expect(d.conclusion!.probability).toBeGreaterThanOrEqual(0.95);
    expect(d.conclusion!.decidedBy).toContain('r3');
    expect(d.path.map((p) => p.outcomeId)).toEqual(['none', 'none', 'short']);
  });

  it('counts set-ups once: after one unplugged test, another unplugged test costs only its own minutes', async () => {
    const d = await diagnoseFully(tree, [reading('r1', 'signal_unplugged', 4.88)], { strategy: 'lookahead' });
    const ranking = d.nextTest!.ranking;
    const unpluggedOhms = ranking.find((r) => r.testId === 'signal_ohms_to_ground')!;
    expect(unpluggedOhms.minutes).toBe(tree.tests.find((t) => t.id === 'signal_ohms_to_ground')!.minutes);
    const scan = ranking.find((r) => r.testId === 'scan_signal_plugged')!;
    expect(scan.minutes).toBe(1 + 2); // its minute plus connecting the scan tool
  });

  it('keeps a reading that matches no test in the path as "not in this tree" without moving the posterior', async () => {
    const odd = { ...reading('x', 'reference_backprobed', 4.99), request: { ...requestOf('reference_backprobed'), location: 'module_connector' as const } };
    const d = await diagnoseFully(tree, [odd]);
    const prior = await diagnoseFully(tree, []);
    expect(d.path[0]!.verdict).toBe('not_in_tree');
    expect(d.ranked).toEqual(prior.ranked);
  });

  it.each<[string, unknown, string]>([
    ['a value with its unit in the text', '5.01 V', 'readings[0].value'],
    ['a missing value', undefined, 'readings[0].value'],
    ['NaN', Number.NaN, 'readings[0].value'],
  ])('refuses %s with a finding at its path and does not count it', async (_name, value, path) => {
    const d = await diagnoseFully(tree, [reading('v', 'reference_backprobed', value as number)]);
    expect(d.findings.find((f) => f.code === 'reading.value_not_number')!.path).toBe(path);
    expect(d.path[0]!.verdict).toBe('invalid');
  });

  it('refuses a reading whose request has an unknown connector state, naming the field', async () => {
    const bad = { ...reading('q', 'reference_backprobed', 5), request: { ...requestOf('reference_backprobed'), connector: 'half_plugged' } } as unknown as Reading;
    const d = await diagnoseFully(tree, [bad]);
    expect(d.findings.some((f) => f.path === 'readings[0].request.connector')).toBe(true);
  });

  it('weighs a reading between two outcome ranges by its value: the bands are labels, not the arithmetic', async () => {
    const d = await diagnoseFully(tree, [reading('g1', 'reference_backprobed', 4.82)]);
    expect(d.path[0]!.verdict).toBe('counted');
    expect(d.path[0]!.note).toMatch(/between outcome ranges/);
    const nudged = await diagnoseFully(tree, [reading('g2', 'reference_backprobed', 4.83)]);
    for (const h of d.ranked) expect(Math.abs(probabilityOf(nudged, h.id) - h.probability), h.id).toBeLessThan(0.05);
  });

  it('drops a superseded reading and counts its replacement', async () => {
    const d = await diagnoseFully(tree, [
      reading('old', 'reference_backprobed', 0.01, { supersededBy: 'new' }),
      reading('new', 'reference_backprobed', 5.0),
    ]);
    expect(d.path.map((p) => p.verdict)).toEqual(['superseded', 'counted']);
    expect(probabilityOf(d, 'reference_open')).toBeLessThan(0.01);
  });

  it('stops counting readings taken before a repair of the part they concern (Breese & Heckerman 1996)', async () => {
    const before = [reading('b1', 'reference_unplugged', 0.01), reading('b2', 'reference_ohms_to_ground', 0.1)];
    const repairAt = new Date((clock += 60_000)).toISOString();
    const after = reading('a1', 'signal_backprobed', 0.75);
    const d = await diagnoseFully(tree, [...before, after], [{ id: 'fix1', part: 'reference', at: repairAt }]);
    expect(d.path.filter((p) => p.verdict === 'before_repair').map((p) => p.readingId)).toEqual(['b1', 'b2']);
    expect(d.path.find((p) => p.readingId === 'a1')!.verdict).toBe('counted');
    const unrelated = await diagnoseFully(tree, [...before, after], [{ id: 'fix2', part: 'ground', at: repairAt }]);
    expect(unrelated.path.filter((p) => p.verdict === 'counted')).toHaveLength(3);
  });

  it('keeps verification readings out of the diagnosis', async () => {
    const d = await diagnoseFully(tree, [reading('v1', 'reference_backprobed', 0.01, { phase: 'verification' })]);
    expect(d.path[0]!.verdict).toBe('verification');
    expect(d.ranked).toEqual((await diagnoseFully(tree, [])).ranked);
  });

  it('flags a contradiction and asks to repeat the reading most likely to be wrong, once per reading', async () => {
    // Each reading points at a different single cause: 12 V on the reference, 0 V on the signal, a floating ground
    // and signal shorted to reference. No one cause explains more than one of them.
    const readings = [
      reading('c1', 'reference_backprobed', 12.1),
      reading('c2', 'signal_backprobed', 0.0),
      reading('c3', 'ground_drop_backprobed', 4.9),
      reading('c4', 'signal_ohms_to_reference', 0.2),
    ];
    const d = await diagnoseFully(tree, readings);
    expect(d.logEvidenceVsChance).toBeLessThan(-4);
    expect(d.status).toBe('recheck');
    expect(d.nextTest!.reason).toBe('recheck_contradiction');
    expect(readings.map((r) => r.id)).toContain(d.nextTest!.recheckOf);
    expect(d.findings.find((f) => f.code === 'diagnosis.contradiction')!.path).toMatch(/^readings\[[0-3]\]$/);
    const doubtful = d.nextTest!.recheckOf!;
    const repeated = [...readings.map((r) => (r.id === doubtful ? { ...r, supersededBy: 'again' } : r)), { ...readings.find((r) => r.id === doubtful)!, id: 'again', takenAt: new Date((clock += 60_000)).toISOString() }];
    const after = await diagnoseFully(tree, repeated);
    expect(after.nextTest?.recheckOf).not.toBe('again');
    expect(after.nextTest?.recheckOf).not.toBe(doubtful);
  });
});

describe('scan values that do not refresh with the engine stopped (common practice, no source)', () => {
  const baseline = () => reading('s1', 'scan_signal_unplugged', 4.98);
  it('asks to crank and read again when a key-on scan value stays put after a jumper changed the signal', async () => {
    // The jumper's wires read safe first (the jumper safety rule): signal 0.76 V unplugged, ground drop 0.01 V; a
    // signal pulled to 0.76 V must fall to about 0 V with the signal jumpered to ground, so 0.761 V again is frozen.
    const safe = [reading('v1', 'signal_unplugged', 0.76), reading('v2', 'ground_drop_backprobed', 0.01)];
    const first = reading('s1', 'scan_signal_unplugged', 0.76);
    const frozen = reading('s2', 'jumper_signal_to_ground', 0.761);
    const d = await diagnoseFully(tree, [...safe, first, frozen]);
    expect(d.status).toBe('crank_and_reread');
    expect(d.nextTest!.id).toBe('jumper_signal_to_ground');
    expect(d.nextTest!.request.engine).toBe('cranking');
    expect(d.nextTest!.cautions.map((c) => c.id)).toContain('engine_turning');
    expect(d.path[3]!.verdict).toBe('frozen_scan');
  });

  it('does not ask to crank with a jumper fitted before the wires it joins were measured', async () => {
    const d = await diagnoseFully(tree, [baseline(), reading('s2', 'jumper_signal_to_ground', 4.98)]);
    expect(d.status).not.toBe('crank_and_reread');
    expect(d.nextTest?.id).not.toBe('jumper_signal_to_ground');
  });

  it('does not blame the circuit for the frozen value: the posterior ignores it', async () => {
    const first = baseline();
    const withFrozen = await diagnoseFully(tree, [first, reading('s2', 'jumper_signal_to_ground', 4.98)]);
    const without = await diagnoseFully(tree, [first]);
    expect(withFrozen.ranked).toEqual(without.ranked);
  });

  it('counts the re-read taken while cranking as the answer to the jumper test', async () => {
    const first = baseline();
    const frozen = reading('s2', 'jumper_signal_to_ground', 4.98);
    const cranked = { ...reading('s3', 'jumper_signal_to_ground', 0.002), request: { ...requestOf('jumper_signal_to_ground'), engine: 'cranking' as const } };
    const d = await diagnoseFully(tree, [first, frozen, cranked]);
    expect(d.status).not.toBe('crank_and_reread');
    expect(d.path[2]!.verdict).toBe('counted');
    expect(d.path[2]!.testId).toBe('jumper_signal_to_ground');
  });

  it('counts a key-on scan value that did change with the jumper', async () => {
    const first = baseline();
    const d = await diagnoseFully(tree, [first, reading('s2', 'jumper_signal_to_ground', 0.001)]);
    expect(d.path[1]!.verdict).toBe('counted');
    expect(d.status).not.toBe('crank_and_reread');
  });
});

describe('the shared 5 V reference tree', () => {
  const shared = builtInTrees()['shared-reference']!;
  const at = (testId: string, value: number, id: string): Reading => ({ id, request: structuredClone(shared.tests.find((t) => t.id === testId)!.request), value, takenAt: new Date((clock += 60_000)).toISOString(), phase: 'diagnosis' });

  // The tank sensor pulls the reference down: any test with it unplugged reads about 5 V, the others about 1.2 V.
  const answer = (testId: string) =>
    testId === 'reference_ohms_all_unplugged' ? 1000 : ['reference_tank_unplugged', 'reference_all_unplugged'].includes(testId) ? 5.0 : 1.2;

  // The same tree with its tables as a shop would give them by hand (no predictive densities).
  const handDoc = structuredClone(builtInDocuments().find((d) => d.id === 'shared-reference')!);
  const loadedHand = loadTree({ ...handDoc, tests: handDoc.tests.map((t) => ({ ...t, predictive: undefined })), derivation: { method: 'hand' } });
  if (!loadedHand.ok) throw new Error(JSON.stringify(loadedHand.findings));
  const hand = loadedHand.tree;

  it('asks for a re-check when a reading lands in a guard band of a hand-given tree, and sets the test aside after two tries', async () => {
    const once = await diagnoseFully(hand, [at('reference_plugged', 4.7, 'g1')]);
    expect(once.status).toBe('recheck');
    expect(once.nextTest!.recheckOf).toBe('g1');
    expect(once.path[0]!.verdict).toBe('indeterminate');
    const twice = await diagnoseFully(hand, [at('reference_plugged', 4.7, 'g1'), at('reference_plugged', 4.72, 'g2')]);
    expect(twice.nextTest!.id).not.toBe('reference_plugged');
    expect(twice.findings.some((f) => f.code === 'diagnosis.test_unresolved')).toBe(true);
  });

  it('counts a guard-band reading that the re-check superseded as an attempt, so the re-check is not asked for again and again', async () => {
    // The model-derived tree weighs a guard-band value by its density; the hand-given copy sets it aside.
    const first = { ...at('reference_plugged', 4.7, 'g1'), supersededBy: 'g2' };
    const d = await diagnoseFully(hand, [first, at('reference_plugged', 4.72, 'g2')]);
    expect(d.path.map((p) => p.verdict)).toEqual(['superseded', 'indeterminate']);
    expect(d.status).not.toBe('recheck');
    expect(d.nextTest?.id).not.toBe('reference_plugged');
    expect(d.findings.some((f) => f.code === 'diagnosis.test_unresolved')).toBe(true);
  });

  it('proposes unplugging the sensors one at a time and finds the one pulling the reference down', async () => {
    const proposed: string[] = [];
    const readings: Reading[] = [at('reference_plugged', 1.2, 'p0')];
    let d = await diagnoseFully(shared, readings);
    for (let i = 0; i < 8 && d.status !== 'concluded'; i++) {
      proposed.push(d.nextTest!.id);
      readings.push(at(d.nextTest!.id, answer(d.nextTest!.id), `p${i + 1}`));
      d = await diagnoseFully(shared, readings);
    }
    expect(d.status).toBe('concluded');
    expect(d.conclusion!.hypothesisId).toBe('tank_sensor_loading_reference');
    const single = proposed.filter((id) => /^reference_(throttle|manifold|tank)_unplugged$/.test(id));
    expect(single.length).toBeGreaterThanOrEqual(1);
    expect(single.at(-1)).toBe('reference_tank_unplugged');
    for (const id of single) expect(shared.tests.find((t) => t.id === id)!.request.sensor).not.toBe('all');
  });
});
