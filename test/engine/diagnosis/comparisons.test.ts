/**
 * Comparison tests: two ordinary readings, one outcome on their difference. The tree validation refuses malformed
 * comparisons with coded findings at their JSON path; the diagnosis pairs the latest valid reading of each half,
 * counts the pair once and keeps a lone half with the reason it waits.
 */
import { describe, expect, it } from 'vitest';
import { builtInDocuments, builtInTrees, diagnose, loadTree, requestKey, type Reading, type TreeDocument, type TreeRequest } from '../../../src/engine/diagnosis';

const threeWire = builtInTrees()['three-wire-5v']!;
const thermistor = builtInTrees()['two-wire-thermistor']!;
const GAP = 'scan_against_meter_at_sensor';
const COLD_SOAK = 'coolant_against_intake_cold_soak';
const halvesOf = (tree: typeof threeWire, id: string): [TreeRequest, TreeRequest] => {
  const t = tree.tests.find((x) => x.id === id)!;
  return [structuredClone(t.request), structuredClone(t.compare!.request)];
};

let clock = Date.parse('2026-02-02T07:00:00Z');
const at = () => new Date((clock += 60_000)).toISOString();
const read = (id: string, request: TreeRequest, value: number, extra: Partial<Reading> = {}): Reading => ({ id, request, value, takenAt: at(), phase: 'diagnosis', ...extra });

describe('tree validation of comparison tests', () => {
  const docWith = (change: (test: TreeDocument['tests'][number]) => void): unknown => {
    const doc = structuredClone(builtInDocuments().find((d) => d.id === 'two-wire-thermistor')!);
    change(doc.tests.find((t) => t.id === COLD_SOAK)!);
    return doc;
  };
  const index = builtInDocuments().find((d) => d.id === 'two-wire-thermistor')!.tests.findIndex((t) => t.id === COLD_SOAK);
  const ohms: TreeRequest = { quantity: 'ohms', at: 'signal', against: 'ground', location: 'sensor_connector', connector: 'unplugged', key: 'off', engine: 'off', jumpers: [] };

  it.each<[string, (t: TreeDocument['tests'][number]) => void, string, string]>([
    ['a comparison of a reading with itself', (t) => (t.compare!.request = structuredClone(t.request)), 'tree.compare.same_request', 'compare.request'],
    ['an ohms reading as a half (an overload has no difference)', (t) => (t.compare!.request = { ...ohms, jumpers: [] }), 'tree.compare.not_subtractable', 'compare.request.quantity'],
    ['a scan value in °C against a meter reading in volts', (t) => (t.compare!.request = { ...ohms, quantity: 'dc_volts', key: 'on', connector: 'backprobed', jumpers: [] }), 'tree.compare.unit_mismatch', 'unit'],
    ['halves read with the engine in different states', (t) => (t.compare!.request.engine = 'running'), 'tree.compare.conditions_differ', 'compare.request.key'],
    ['earlier forms of a request on a comparison', (t) => (t.alsoAnswers = [structuredClone(t.request)]), 'tree.compare.also_answers', 'alsoAnswers'],
  ])('refuses %s with a coded finding at its path', (_name, change, code, path) => {
    const result = loadTree(docWith(change));
    expect(result.ok).toBe(false);
    expect(result.findings).toContainEqual(expect.objectContaining({ code, path: `tests[${index}].${path}`, severity: 'error' }));
  });

  it('refuses the same comparison twice, even with its halves swapped', () => {
    const doc = structuredClone(builtInDocuments().find((d) => d.id === 'two-wire-thermistor')!);
    const original = doc.tests.find((t) => t.id === COLD_SOAK)!;
    const swapped = { ...structuredClone(original), id: 'intake_against_coolant', request: structuredClone(original.compare!.request), compare: { label: 'Coolant', request: structuredClone(original.request) } };
    doc.tests.push(swapped);
    const result = loadTree(doc);
    expect(result.findings).toContainEqual(expect.objectContaining({ code: 'tree.compare.duplicate', path: `tests[${doc.tests.length - 1}].compare` }));
  });

  it('accepts a comparison whose half is also a test of its own (the scan value against the meter at the sensor)', () => {
    const t = threeWire.tests.find((x) => x.id === GAP)!;
    expect(t.weighAs).toBe('difference_V');
    const [scan, meter] = halvesOf(threeWire, GAP);
    expect(threeWire.halvesByRequest.get(requestKey(scan))!.map((h) => [h.test.id, h.half])).toEqual([[GAP, 'first']]);
    expect(threeWire.halvesByRequest.get(requestKey(meter))!.map((h) => [h.test.id, h.half])).toEqual([[GAP, 'second']]);
    // Each half still answers its own test.
    expect(threeWire.testByRequest.get(requestKey(scan))!.id).toBe('scan_signal_plugged');
    expect(threeWire.testByRequest.get(requestKey(meter))!.id).toBe('signal_backprobed');
  });
});

describe('pairing the two readings of a comparison', () => {
  const [scan, meter] = halvesOf(threeWire, GAP);
  const [ect, iat] = halvesOf(thermistor, COLD_SOAK);

  it('counts the scan value against the meter once, as their difference, on the later reading', async () => {
    // 10 kΩ in a pulled-up signal wire: about 0.16 V between the module and the sensor pin (ngspice, see
    // test/engine/circuit/spice-cross-check.test.ts).
    const d = await diagnose(threeWire, [read('s1', scan, 1.012), read('m1', meter, 0.85)]);
    const c = d.comparisons.find((x) => x.testId === GAP)!;
    expect(c).toMatchObject({ verdict: 'counted', outcomeId: 'scan_high', first: { readingId: 's1', value: 1.012 }, second: { readingId: 'm1', value: 0.85 } });
    expect(c.difference).toBeCloseTo(0.162, 6);
    // Each reading keeps its own test's line in the path; the comparison is not a third reading.
    expect(d.path.map((p) => [p.readingId, p.testId, p.verdict])).toEqual([
      ['s1', 'scan_signal_plugged', 'counted'],
      ['m1', 'signal_backprobed', 'counted'],
    ]);
  });

  it('keeps a lone coolant reading with the reason it waits, and asks for the intake-air reading next when it is the test chosen', async () => {
    const d = await diagnose(thermistor, [read('e1', ect, 41, { unit: '°C' })]);
    expect(d.path).toEqual([expect.objectContaining({ readingId: 'e1', verdict: 'unpaired', testId: COLD_SOAK })]);
    expect(d.path[0]!.note).toMatch(/Intake air temperature/);
    const c = d.comparisons.find((x) => x.testId === COLD_SOAK)!;
    expect(c).toMatchObject({ verdict: 'unpaired', difference: null, first: { readingId: 'e1' }, second: { readingId: null } });
    expect(d.ranked).toEqual((await diagnose(thermistor, [])).ranked);
  });

  it('pairs a coolant reading 20 °C above intake air after a cold soak, counts it once, and makes a skewed sensor the leading cause', async () => {
    const d = await diagnose(thermistor, [read('e1', ect, 41, { unit: '°C' }), read('i1', iat, 21, { unit: '°C' })]);
    const c = d.comparisons.find((x) => x.testId === COLD_SOAK)!;
    expect(c).toMatchObject({ verdict: 'counted', outcomeId: 'coolant_high', difference: 20, unit: '°C' });
    expect(d.path.map((p) => [p.readingId, p.verdict])).toEqual([
      ['e1', 'paired'],
      ['i1', 'counted'],
    ]);
    expect(d.ranked[0]!.id).toBe('sensor_internal');
  });

  it.each<[string, (r: Reading[]) => Reading[], number | null, string]>([
    ['a corrected half: the correction is paired', (r) => [{ ...r[0]!, supersededBy: 'e2' }, r[1]!, read('e2', ect, 23, { unit: '°C' })], 2, 'e2'],
    ['a half taken again: the latest is paired', (r) => [...r, read('e3', ect, 22, { unit: '°C' })], 1, 'e3'],
    ['a verification reading: not paired', (r) => [r[0]!, { ...r[1]!, phase: 'verification' }], null, 'e1'],
  ])('pairs the latest valid reading of each half: %s', async (_name, change, difference, firstId) => {
    const d = await diagnose(thermistor, change([read('e1', ect, 41, { unit: '°C' }), read('i1', iat, 21, { unit: '°C' })]));
    const c = d.comparisons.find((x) => x.testId === COLD_SOAK)!;
    expect(c.difference).toBe(difference);
    expect(c.first.readingId).toBe(firstId);
  });

  it('does not pair a half taken before a repair: the comparison waits for the half taken after it', async () => {
    const readings = [read('e1', ect, 41, { unit: '°C' }), read('i1', iat, 21, { unit: '°C' })];
    const repair = { id: 'fix', part: 'sensor', at: at() };
    const d = await diagnose(thermistor, [...readings, read('e2', ect, 21, { unit: '°C' })], [repair]);
    const c = d.comparisons.find((x) => x.testId === COLD_SOAK)!;
    expect(c).toMatchObject({ verdict: 'unpaired', first: { readingId: 'e2' }, second: { readingId: null } });
    expect(d.path.find((p) => p.readingId === 'i1')!.verdict).toBe('before_repair');
  });

  it('refuses a temperature half given in volts, naming the unit the comparison expects', async () => {
    const d = await diagnose(thermistor, [read('i1', iat, 2.5, { unit: 'V' })]);
    expect(d.path[0]!.verdict).toBe('invalid');
    expect(d.findings).toContainEqual(expect.objectContaining({ code: 'reading.scan_unit_unexpected', path: 'readings[0].unit' }));
    expect(d.findings.find((f) => f.code === 'reading.scan_unit_unexpected')!.message).toMatch(/°C/);
  });
});
