/**
 * A shorted 5 V reference and a failed module supply read alike from the sensor connector; the harness ohmed on its
 * own, key off, tells them apart (common practice, no source: "prove the harness before the module"). Neither is
 * concluded before an ohms reading argues for it against the other.
 */
import { describe, expect, it } from 'vitest';
import { mulberry32 } from '../../../src/engine/circuit';
import { builtInTrees, type Reading } from '../../../src/engine/diagnosis';
import { driveToEnd } from '../../../src/engine/diagnosis/drive';
import { drawCase } from '../../../src/engine/diagnosis/simulate';
import { diagnoseFully } from '../../support/diagnose-fully';
import { drawOomCase } from '../../support/out-of-model/cases';
import { runOomCase } from '../../support/out-of-model/drive';

const tree = builtInTrees()['three-wire-5v']!;
let clock = Date.parse('2025-03-03T09:00:00Z');
const reading = (id: string, testId: string, value: Reading['value']): Reading => ({
  id,
  request: structuredClone(tree.tests.find((t) => t.id === testId)!.request),
  value,
  takenAt: new Date((clock += 60_000)).toISOString(),
  phase: 'diagnosis',
});
const isOhms = (r: Reading) => r.request.quantity === 'ohms';

describe('the harness proven before a shorted reference or a failed supply', () => {
  // No reference, plugged or unplugged (the circuit model: a hard short and a dead supply both read about 0 V).
  const noReference = [reading('a', 'reference_backprobed', 0.03), reading('b', 'reference_unplugged', 0.03)];

  it('asks for the reference ohmed to ground while only voltages point at either', async () => {
    const d = await diagnoseFully(tree, noReference);
    expect(d.status).toBe('testing');
    expect(d.ranked.slice(0, 3).map((h) => h.id)).toEqual(expect.arrayContaining(['reference_short_ground', 'reference_supply_failed']));
    expect(tree.tests.find((t) => t.id === d.nextTest!.id)!.request.quantity).toBe('ohms');
  });

  // Circuit model: a hard short reads tenths of an ohm; a switched-off supply and the module's loads, 300 Ω to 100 kΩ.
  it.each<[string, number, string]>([
    ['0.4 Ω to ground: the wire is shorted', 0.4, 'reference_short_ground'],
    ['2 kΩ to ground: the harness is sound, the supply has failed', 2000, 'reference_supply_failed'],
  ])('concludes on the ohms reading: %s', async (_what, ohms, cause) => {
    const d = await diagnoseFully(tree, [...noReference, reading('c', 'reference_ohms_to_ground', ohms)]);
    expect(d.status).toBe('concluded');
    expect(d.conclusion!.hypothesisId).toBe(cause);
  });

  // Over simulated circuits of both causes (the circuit model's forms and part spreads), every conclusion on either
  // rests on at least one ohms reading.
  it.each(['reference_short_ground', 'reference_supply_failed'].flatMap((cause) => [0, 1, 2, 3, 4, 5].map((k) => [cause, 4100 + k] as const)))(
    'concludes %s (seed %i) only with an ohms reading among its readings',
    async (cause, seed) => {
      const result = await driveToEnd(tree, drawCase(tree, mulberry32(seed), { hypothesisId: cause }));
      if (result.conclusion === 'reference_short_ground' || result.conclusion === 'reference_supply_failed') expect(result.readings.some(isOhms)).toBe(true);
    },
  );

  // Partial shorts of 17–29 Ω drawn from the independent out-of-model circuits (their own part values) were proven a
  // failed supply on voltages alone before this rule; over 40 cases of each cause, a conclusion on either now rests
  // on an ohms reading, and the 21 Ω short of case 26 is no longer proven a failed supply.
  it.each(['reference_short_ground', 'reference_supply_failed'])('proves %s or its twin only with an ohms reading, over out-of-model cases', async (cause) => {
    for (let i = 0; i < 40; i++) {
      const run = await runOomCase(tree, drawOomCase('three-wire-5v', cause, i, 31));
      if (run.proven === 'reference_short_ground' || run.proven === 'reference_supply_failed') expect(run.taken.some(isOhms), `case ${i}`).toBe(true);
    }
  });

  it('no longer proves the 21 Ω partial short of out-of-model case 26 a failed supply', async () => {
    const run = await runOomCase(tree, drawOomCase('three-wire-5v', 'reference_short_ground', 26, 31));
    expect(run.proven).not.toBe('reference_supply_failed');
  });
});
