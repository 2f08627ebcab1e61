/**
 * How the out-of-model benchmark scores a diagnosis: only a proven conclusion counts (status "concluded" and the
 * threshold reached), and a cause "blames a part" when its repair names a wire or a part (not "none", not
 * "unknown").
 */
import { describe, expect, it } from 'vitest';
import { builtInTrees, type Diagnosis } from '../../../src/engine/diagnosis';
import { blamesAPart, isProven } from '../../support/out-of-model/drive';
import { drawOomCase, faultShows, singleCircuit } from '../../support/out-of-model/cases';

const conclusion = (reachedThreshold: boolean) => ({ hypothesisId: 'ground_open', label: 'x', probability: 0.97, repair: { part: 'ground', action: 'x' }, decidedBy: [], reachedThreshold });
const diagnosis = (status: Diagnosis['status'], c: ReturnType<typeof conclusion> | null) => ({ status, conclusion: c }) as unknown as Diagnosis;

describe('a conclusion counts only when proven', () => {
  it.each([
    ['concluded at the threshold', diagnosis('concluded', conclusion(true)), true],
    ['concluded without reaching the threshold', diagnosis('concluded', conclusion(false)), false],
    ['no test left, with a leader', diagnosis('exhausted', conclusion(false)), false],
    ['still testing', diagnosis('testing', null), false],
  ] as const)('%s', (_name, d, proven) => {
    expect(isProven(d)).toBe(proven);
  });
});

describe('which causes blame a wire or part', () => {
  const tree = builtInTrees()['three-wire-5v']!;
  it.each([
    ['ground_high_resistance', true],
    ['reference_short_ground', true],
    ['module_internal', true],
    ['unknown', false],
    ['a cause the tree does not have', false],
  ] as const)('%s: %s', (id, blames) => {
    expect(blamesAPart(tree, id)).toBe(blames);
  });

  it('does not count "no fault now" (repair part "none") as blaming a part', () => {
    expect(tree.hypotheses.find((h) => h.id === 'no_fault_now')?.part).toBe('none');
    expect(blamesAPart(tree, 'no_fault_now')).toBe(false);
  });
});

describe('a wiring fault counts as hidden only when no test of the tree shows it', () => {
  const tree = builtInTrees()['three-wire-5v']!;
  const requests = tree.tests.map((t) => t.request);
  const withSeries = (ohms: number) => {
    const c = drawOomCase('three-wire-5v', 'reference_high_resistance', 0, 5);
    singleCircuit(c).faults = [{ kind: 'series', wire: 'reference', ohms }];
    return c;
  };
  // 1 mΩ is below every reading's resolution (the ohms display steps 0.1 Ω, common practice, no source); 100 Ω
  // reads end to end as 100 Ω against a fraction of an ohm.
  it.each([
    ['a milliohm in the reference', 0.001, false],
    ['a hundred ohms in the reference', 100, true],
    ['an open reference', 1e10, true],
  ] as const)('%s: shows %s', (_name, ohms, shows) => {
    expect(faultShows(withSeries(ohms), requests)).toBe(shows);
  });

  it('counts a healthy circuit and a case whose fault is not in the wiring as showing', () => {
    expect(faultShows(drawOomCase('three-wire-5v', 'no_fault_now', 0, 5), requests)).toBe(true);
    expect(faultShows(drawOomCase('three-wire-5v', 'module_internal', 0, 5), requests)).toBe(true);
  });
});
