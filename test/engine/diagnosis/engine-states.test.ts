/**
 * The three-wire tree's tests that move the sensor's input or crank the engine: where they decide between causes,
 * and that a throttle test is not proposed on a sensor the throttle does not move.
 */
import { describe, expect, it } from 'vitest';
import { builtInTrees, diagnose, type Reading } from '../../../src/engine/diagnosis';
import { pedalMovesInput } from '../../../src/engine/sensors';

const tree = builtInTrees()['three-wire-5v']!;
const at = (m: number) => new Date(Date.parse('2026-03-02T08:00:00Z') + m * 60_000).toISOString();
const read = (readings: Array<[string, number]>): Reading[] =>
  readings.map(([testId, value], i) => ({ id: `r${i}`, request: tree.tests.find((t) => t.id === testId)!.request, value, takenAt: at(i + 1), phase: 'diagnosis' }));
const share = async (readings: Array<[string, number]>, cause: string) => (await diagnose(tree, read(readings))).ranked.find((h) => h.id === cause)!.probability;

// Healthy key-on readings of a closed throttle (computed from the circuit model's divider: 5 V × 0.15 plus the bias).
const restingHealthy: Array<[string, number]> = [
  ['reference_backprobed', 5.0],
  ['signal_backprobed', 0.76],
  ['ground_drop_backprobed', 0.01],
  ['scan_signal_plugged', 0.76],
];

describe('the tests that move the input or crank the engine decide between causes', () => {
  it.each<[string, Array<[string, number]>, string, string]>([
    // Computed: a sound wiper pressed fully sits at 0.76–0.96 of the track, 3.8–4.8 V; one stuck where it rests stays at 0.76 V.
    ['a signal that stays at its rest value with the throttle pressed points at the sensor, not at no fault', [...restingHealthy, ['signal_full_travel', 0.76]], 'sensor_internal', 'no_fault_now'],
    ['a signal that follows the throttle to 4.3 V points away from a stuck sensor', [...restingHealthy, ['signal_full_travel', 4.3]], 'no_fault_now', 'sensor_internal'],
    // Computed: a supply needing 11.5 V on a battery cranking at 10 V gives 3.5 V; common practice, no source: a sound one holds about 5 V.
    ['a reference that falls to 3.5 V while cranking points at the supply, not at no fault', [...restingHealthy, ['reference_while_cranking', 3.5]], 'reference_supply_failed', 'no_fault_now'],
    ['a reference that holds 4.95 V while cranking points away from the supply', [...restingHealthy, ['reference_while_cranking', 4.95]], 'no_fault_now', 'reference_supply_failed'],
  ])('%s', async (_name, readings, up, down) => {
    const before = await diagnose(tree, read(restingHealthy));
    const after = await diagnose(tree, read(readings));
    const p = (d: typeof after, id: string) => d.ranked.find((h) => h.id === id)!.probability;
    expect(p(after, up) / p(after, down)).toBeGreaterThan(p(before, up) / p(before, down));
    expect(await share(readings, up)).toBeGreaterThan(await share(readings, down));
  });
});

describe('a throttle test only where the throttle moves the input', () => {
  it.each<[string, string | undefined, boolean | undefined]>([
    ['a throttle position sensor', 'TP A', true],
    ['an accelerator pedal sensor', 'APP D', true],
    ['a manifold pressure sensor', 'MAP', false],
    ['a fuel-tank pressure sensor', 'FTP', false],
    ['a name that is not an SAE J1930 term', 'throttle sensor 1', undefined],
    ['no name', undefined, undefined],
  ])('%s: %s', (_name, sensor, moves) => {
    expect(pedalMovesInput(sensor)).toBe(moves);
  });

  it('never proposes pressing the throttle on a MAP circuit, and says why', async () => {
    const d = await diagnose(tree, read(restingHealthy), [], { codes: { codes: [], sensor: 'MAP' } });
    const test = tree.tests.find((t) => t.id === 'signal_full_travel')!;
    expect(d.nextTest?.ranking.map((r) => r.testId) ?? []).not.toContain('signal_full_travel');
    expect(d.findings.find((f) => f.code === 'diagnosis.input_not_moved_by_pedal')).toMatchObject({ path: `tests[${test.index}]` });
    const tp = await diagnose(tree, read(restingHealthy), [], { codes: { codes: [], sensor: 'TP A' } });
    expect(tp.findings.map((f) => f.code)).not.toContain('diagnosis.input_not_moved_by_pedal');
  });
});
