import { describe, expect, it } from 'vitest';
import { defaultCircuit, faultsFor, predictReading } from '../../../src/engine/circuit';
import { builtInTrees, type Reading } from '../../../src/engine/diagnosis';
import { backprobed, isOpenCause } from '../../../src/engine/diagnosis/backprobe-confirmation';
import { diagnoseFully } from '../../support/diagnose-fully';

// A back-probe pin that misses its terminal reads like an open (common practice, no source): an open is concluded
// only once a reading that does not hang on a back-probe, or a repeat of the back-probed one, agrees.
const tree = builtInTrees()['three-wire-5v']!;
const circuit = defaultCircuit('three_wire_5v', { bias: { kind: 'pull_up', ohms: 250_000 }, position: 0.15 });
let minute = 0;
const reading = (testId: string, cause: string): Reading => {
  const request = structuredClone(tree.tests.find((t) => t.id === testId)!.request);
  const predicted = predictReading(circuit, faultsFor(cause)!, request);
  if (!predicted.ok) throw new Error(JSON.stringify(predicted.findings));
  const value = predicted.overload ? 'overload' : Number(predicted.value.toPrecision(4));
  return { id: `${testId}#${++minute}`, request, value, takenAt: new Date(Date.parse('2026-03-02T08:00:00Z') + minute * 60_000).toISOString(), phase: 'diagnosis' };
};

describe('an open concluded from back-probed readings alone waits for a confirming reading', () => {
  it('knows which causes are opens and which tests hang on a back-probe', () => {
    expect(['reference_open', 'signal_open', 'ground_open', 'sensor_internal'].every(isOpenCause)).toBe(true);
    expect(['signal_short_ground', 'ground_high_resistance', 'no_fault_now'].some(isOpenCause)).toBe(false);
    const ids = tree.tests.filter(backprobed).map((t) => t.id).sort();
    expect(ids).toEqual(['ground_drop_along_wire', 'ground_drop_backprobed', 'reference_backprobed', 'reference_drop_along_wire', 'reference_while_cranking', 'signal_backprobed', 'signal_full_travel']);
  });

  it('holds back a broken sensor ground read only through back-probes, proposes a test without one, then concludes', async () => {
    const probed = ['ground_drop_backprobed', 'ground_drop_along_wire', 'reference_backprobed', 'signal_backprobed'].map((t) => reading(t, 'ground_open'));
    const held = await diagnoseFully(tree, probed);
    expect(held.ranked[0]!.id).toBe('ground_open');
    expect(held.ranked[0]!.probability).toBeGreaterThanOrEqual(0.95);
    expect(held.status).toBe('testing');
    expect(held.findings.map((f) => f.code)).toContain('diagnosis.backprobe_unconfirmed');
    const next = tree.tests.find((t) => t.id === held.nextTest!.id)!;
    expect(backprobed(next)).toBe(false);
    const done = await diagnoseFully(tree, [...probed, reading(next.id, 'ground_open')]);
    expect(done.status).toBe('concluded');
    expect(done.conclusion!.hypothesisId).toBe('ground_open');
  });

  it('does not hold back a cause that is not an open', async () => {
    const d = await diagnoseFully(tree, [reading('reference_backprobed', 'reference_short_voltage'), reading('signal_backprobed', 'reference_short_voltage')]);
    expect(d.findings.map((f) => f.code)).not.toContain('diagnosis.backprobe_unconfirmed');
  });
});
