import { describe, expect, it } from 'vitest';
import { defaultCircuit, faultsFor, predictReading } from '../../../src/engine/circuit';
import { builtInDocuments, builtInTrees, loadTree, type Diagnosis, type Reading, type Tree, type TreeDocument } from '../../../src/engine/diagnosis';
import { diagnoseFully } from '../../support/diagnose-fully';

// Each case here is a defect that once gave a confident wrong answer; the readings are what a healthy or faulted
// circuit shows on the circuit model (src/engine/circuit) or on the bench, as each comment says.
const threeWire = builtInTrees()['three-wire-5v']!;
const thermistor = builtInTrees()['two-wire-thermistor']!;
let clock = Date.parse('2026-03-02T08:00:00Z');
const at = (tree: Tree, testId: string, value: Reading['value'], extra: Partial<Reading> = {}): Reading => ({
  id: `${testId}#${(clock += 60_000)}`,
  request: structuredClone(tree.tests.find((t) => t.id === testId)!.request),
  value,
  takenAt: new Date(clock).toISOString(),
  phase: 'diagnosis',
  ...extra,
});
const p = (d: Diagnosis, id: string) => d.ranked.find((h) => h.id === id)?.probability ?? 0;
const partFault = (d: Diagnosis) => d.status === 'concluded' && d.conclusion !== null && d.conclusion.repair.part !== 'none';

describe('a circuit that tests good is not blamed on a part', () => {
  it.each<[string, Tree, Array<[string, number]>, string]>([
    // Healthy throttle sensor near closed: about 0.76 V on the model; 0.82 V is within part spread.
    ['three healthy three-wire readings (signal 0.82 V, scan 0.82 V, jumper 5.04 V)', threeWire, [['signal_backprobed', 0.82], ['scan_signal_plugged', 0.82], ['jumper_reference_to_signal', 5.04]], 'ground_high_resistance'],
    // Healthy 10 kΩ thermistor at 20 °C behind a 10 kΩ pull-up: 2.775 V (model); ground 0.1 Ω and no drop.
    ['a thermistor circuit whose ground reads 0.1 Ω and 0.000 V drop', thermistor, [['signal_backprobed', 2.78], ['scan_signal_plugged', 2.78], ['ground_drop_backprobed', 0.0], ['ground_ohms_to_battery', 0.1]], 'ground_high_resistance'],
  ])('does not conclude a part fault from %s', async (_name, tree, values, blamed) => {
    const d = await diagnoseFully(tree, values.map(([id, v]) => at(tree, id, v)));
    expect(partFault(d)).toBe(false);
    // Readings that cannot tell the two apart leave the blamed part near its prior odds against "no fault now".
    expect(p(d, blamed)).toBeLessThan(0.5);
    expect(p(d, 'no_fault_now')).toBeGreaterThan(0.2);
  });

  it('keeps testing instead of blaming a part when the readings fit a healthy circuit', async () => {
    const d = await diagnoseFully(threeWire, [at(threeWire, 'signal_backprobed', 0.82), at(threeWire, 'scan_signal_plugged', 0.82), at(threeWire, 'jumper_reference_to_signal', 5.04)]);
    expect(d.status).toBe('testing');
    expect(d.conclusion).toBeNull();
    expect(['signal_backprobed', 'scan_signal_plugged', 'jumper_reference_to_signal']).not.toContain(d.nextTest!.id);
  });

  it('reads the reference on the working circuit before saying "no fault now" (a weak supply sags only under load)', async () => {
    // Healthy values on the model: reference unplugged 5.00 V, signal 0.76 V near closed and 4.3 V with the throttle
    // pressed fully, ground drop 0 V.
    const values: Array<[string, number]> = [['signal_backprobed', 0.76], ['scan_signal_plugged', 0.762], ['signal_full_travel', 4.3], ['ground_drop_backprobed', 0.0], ['reference_unplugged', 5.0], ['signal_unplugged', 4.88], ['jumper_signal_to_ground', 0.0], ['ground_ohms_to_battery', 0.2], ['scan_signal_unplugged', 5.0]];
    const d = await diagnoseFully(threeWire, values.map(([id, v]) => at(threeWire, id, v)));
    expect(p(d, 'reference_supply_failed')).toBeGreaterThan(0.05);
    expect(d.status).toBe('testing');
    // Each reads the reference on the working circuit: key on, its lowest while cranking (which also finds a supply
    // that drops out as the battery dips), or the drop along it with the sensor drawing current.
    expect(['reference_backprobed', 'reference_while_cranking', 'reference_drop_along_wire']).toContain(d.nextTest!.id);
    const done = await diagnoseFully(threeWire, [...values, ['reference_backprobed', 5.0], ['reference_while_cranking', 4.97]].map(([id, v]) => at(threeWire, id as string, v as number)));
    expect(p(done, 'reference_supply_failed')).toBeLessThan(0.05);
    // Sagging only under load: a weak supply, or resistance in the reference wire (the drop along it tells which).
    // A sagging supply would pull the pressed throttle down with it: that reading is left out here.
    const sagging = await diagnoseFully(threeWire, [...values.filter(([id]) => id !== 'signal_full_travel'), ['reference_backprobed', 3.9] as [string, number]].map(([id, v]) => at(threeWire, id, v)));
    expect(sagging.ranked.slice(0, 2).map((r) => r.id).sort()).toEqual(['reference_high_resistance', 'reference_supply_failed']);
  });

  it('gives every built-in tree the "no fault now" cause with no repair part', () => {
    for (const tree of Object.values(builtInTrees())) expect(tree.hypotheses.find((h) => h.id === 'no_fault_now')?.part, tree.id).toBe('none');
  });
});

describe('the scan tool reads through the module converter', () => {
  it('never predicts a scan value above the converter full scale of 5.00 V (signal shorted to battery voltage)', () => {
    const { sensor: _s, ...request } = threeWire.tests.find((t) => t.id === 'scan_signal_plugged')!.request;
    const scan = predictReading(defaultCircuit('three_wire_5v'), faultsFor('signal_short_voltage'), request);
    expect(scan.ok && scan.value).toBeLessThanOrEqual(5.0);
    expect(scan.ok && scan.value).toBeGreaterThan(4.9);
  });

  it('does not conclude a wrong cause when the meter reads 12.3 V and the scan tool 5.00 V on a signal shorted to battery voltage', async () => {
    const d = await diagnoseFully(threeWire, [at(threeWire, 'signal_backprobed', 12.3), at(threeWire, 'scan_signal_plugged', 5.0)]);
    expect(d.ranked[0]!.id).toBe('signal_short_voltage');
    if (d.status === 'concluded') expect(d.conclusion!.hypothesisId).toBe('signal_short_voltage');
  });

  it('converts a coolant scan value of 20 °C to volts through the thermistor curve and pull-up, not as 20 V', async () => {
    const d = await diagnoseFully(thermistor, [at(thermistor, 'scan_signal_plugged', 20, { unit: '°C' })]);
    expect(d.path[0]!.verdict).toBe('counted');
    expect(p(d, 'signal_short_voltage')).toBeLessThan(0.05);
  });

  it('refuses a scan value in a unit the test cannot convert, naming the expected unit', async () => {
    const d = await diagnoseFully(threeWire, [at(threeWire, 'scan_signal_plugged', 101, { unit: 'kPa' })]);
    expect(d.path[0]!.verdict).toBe('invalid');
    const f = d.findings.find((x) => x.code === 'reading.scan_unit_unexpected')!;
    expect(f.path).toBe('readings[0].unit');
    expect(f.message).toMatch(/V/);
  });
});

describe('a dead or weak 5 V supply', () => {
  it('is the module supply, not a reference short, when the reference reads 0 V plugged and unplugged with normal ohms to ground', async () => {
    // The model's healthy reference-to-ground resistance with the key off is the regulator's 1 kΩ off-state path.
    const d = await diagnoseFully(threeWire, [at(threeWire, 'reference_backprobed', 0.0), at(threeWire, 'reference_unplugged', 0.0), at(threeWire, 'reference_ohms_to_ground', 1002)]);
    expect(d.ranked[0]!.id).toBe('reference_supply_failed');
    expect(p(d, 'reference_short_ground')).toBeLessThan(0.05);
    expect(threeWire.hypotheses.find((h) => h.id === 'reference_supply_failed')!.part).toBe('module');
  });
});

describe('frozen scan values are judged against what the change should have done', () => {
  it('counts 0.000 V plugged then 0.000 V unplugged on a signal shorted to ground (it should not move)', async () => {
    const d = await diagnoseFully(threeWire, [at(threeWire, 'signal_backprobed', 0.0), at(threeWire, 'scan_signal_plugged', 0.0), at(threeWire, 'scan_signal_unplugged', 0.0)]);
    expect(d.path.map((e) => e.verdict)).toEqual(['counted', 'counted', 'counted']);
    expect(d.status).not.toBe('crank_and_reread');
  });

  it('calls 0.760 V then 0.761 V frozen when grounding the signal should have moved it', async () => {
    // The jumper's wires read safe first (the jumper safety rule): signal 0.76 V unplugged, ground drop 0.01 V.
    const safe = [at(threeWire, 'signal_unplugged', 0.76), at(threeWire, 'ground_drop_backprobed', 0.01)];
    const d = await diagnoseFully(threeWire, [...safe, at(threeWire, 'scan_signal_unplugged', 0.76), at(threeWire, 'jumper_signal_to_ground', 0.761)]);
    expect(d.path[3]!.verdict).toBe('frozen_scan');
    expect(d.status).toBe('crank_and_reread');
  });
});

describe('evidence is counted once', () => {
  it('counts three identical readings of one test like one', async () => {
    const once = await diagnoseFully(threeWire, [at(threeWire, 'signal_backprobed', 0.82)]);
    const thrice = await diagnoseFully(threeWire, [at(threeWire, 'signal_backprobed', 0.82), at(threeWire, 'signal_backprobed', 0.82), at(threeWire, 'signal_backprobed', 0.82)]);
    for (const h of once.ranked) expect(Math.abs(p(thrice, h.id) - h.probability), h.id).toBeLessThan(0.02);
    expect(Math.abs(thrice.logEvidenceVsChance - once.logEvidenceVsChance)).toBeLessThan(1);
  });

  it('takes 0.8 / 5.0 / 0.8 V on one test as a sign of an intermittent and proposes a wiggle test', async () => {
    const d = await diagnoseFully(threeWire, [at(threeWire, 'signal_backprobed', 0.8), at(threeWire, 'signal_backprobed', 5.0), at(threeWire, 'signal_backprobed', 0.8)]);
    expect(d.findings.some((f) => f.code === 'diagnosis.intermittent')).toBe(true);
    expect(d.nextTest?.reason).toBe('wiggle_test');
    expect(d.nextTest?.id).toBe('signal_backprobed');
    expect(d.ranked[0]!.id).toBe('no_fault_now');
    expect(d.status).not.toBe('concluded');
  });
});

describe('no test left is not a conclusion', () => {
  // Two causes no test separates: after the one test, nothing is left and neither reaches the threshold.
  const doc = (): TreeDocument => {
    const base = structuredClone(builtInDocuments().find((x) => x.id === 'shared-reference')!);
    const test = base.tests.find((t) => t.id === 'reference_plugged')!;
    const row = { low: 0.8, ok: 0.1, high: 0.1 };
    return {
      ...base,
      id: 'two-alike',
      hypotheses: [
        { id: 'a_cause', label: 'A cause', prior: 0.5, repair: { part: 'reference', action: 'Repair A.' } },
        { id: 'b_cause', label: 'B cause', prior: 0.45, repair: { part: 'module', action: 'Repair B.' } },
        { id: 'unknown', label: 'Not modelled', prior: 0.05, unknown: true, repair: { part: 'unknown', action: 'Consult service information.' } },
      ],
      tests: [{ ...test, bands: undefined, predictive: undefined, likelihoods: { a_cause: row, b_cause: row } }],
      derivation: { method: 'hand' },
    };
  };

  it('ends "exhausted" with no conclusion and no repair, naming the leading causes', async () => {
    const loaded = loadTree(doc());
    if (!loaded.ok) throw new Error(JSON.stringify(loaded.findings));
    const d = await diagnoseFully(loaded.tree, [at(loaded.tree, 'reference_plugged', 1.2)]);
    expect(d.status).toBe('exhausted');
    expect(d.conclusion).toBeNull();
    expect(d.undecided!.leading.map((h) => h.id).slice(0, 2)).toEqual(['a_cause', 'b_cause']);
    expect(d.undecided!.advice).toMatch(/service information/);
    expect(d.undecided!.advice).not.toMatch(/Repair A/);
  });
});
