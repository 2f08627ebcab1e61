/**
 * How the out-of-model benchmark scores a diagnosis: only a proven conclusion counts (status "concluded" and the
 * threshold reached), and a cause "blames a part" when its repair names a wire or a part (not "none", not
 * "unknown").
 */
import { describe, expect, it } from 'vitest';
import { builtInTrees, type Diagnosis } from '../../../src/engine/diagnosis';
import { blamesAPart, isProven } from '../../support/out-of-model/drive';

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
