/**
 * The safety-critical figures of diagnosis on cases it was not derived from, on a fixed seed: a few hundred cases
 * from the independent out-of-model circuits (test/support/out-of-model), every cause of the three built-in trees
 * equally, healthy circuits and dead or weak supplies included. The targets are that a healthy circuit is never
 * proven as a wire or part fault and that at most 1 % of all cases are proven on a wrong cause. The three-wire tree
 * meets the first; the others do not yet, so for them this file holds the line at what the engine reaches today
 * (a regression fails it) and the README states the gap. The full figures are the benchmark's:
 * `npm run bench -- out-of-model`.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { builtInTrees } from '../../../src/engine/diagnosis';
import { OOM_CAUSES, oomCases, type OomTreeId } from '../../support/out-of-model/cases';
import { runOomCase, type OomRun } from '../../support/out-of-model/drive';

const SEED = 31;
const PER_CAUSE = 12;
/** The target. */
const CONFIDENTLY_WRONG_TARGET = 0.01;
/** Cases proven on a wrong cause today on this seed, of 432 (1.2 %: the target is not met; see the README). */
const CONFIDENTLY_WRONG_TODAY = 5;
/** Healthy circuits proven as a wire or part fault today, per tree (target: none). */
const HEALTHY_BLAMED_TODAY: Record<OomTreeId, number> = { 'three-wire-5v': 0, 'two-wire-thermistor': 0, 'shared-reference': 1 };
const TREES = Object.keys(OOM_CAUSES) as OomTreeId[];

const runs = new Map<OomTreeId, Array<{ cause: string; variant: string; run: OomRun }>>();

beforeAll(async () => {
  const trees = builtInTrees();
  for (const treeId of TREES) {
    const out: Array<{ cause: string; variant: string; run: OomRun }> = [];
    for (const c of oomCases(treeId, PER_CAUSE, SEED)) out.push({ cause: c.cause, variant: c.variant, run: await runOomCase(trees[treeId]!, c) });
    runs.set(treeId, out);
  }
}, 120_000);

const describeRun = (r: { cause: string; variant: string; run: OomRun }) => `${r.cause} (${r.variant}) proven as ${r.run.proven} after ${r.run.readings} readings`;

describe.each(TREES)('out-of-model cases on the %s tree', (treeId) => {
  it(`proves no more healthy circuits to be a wire or part fault than it does today (target: none)`, () => {
    const blamed = runs.get(treeId)!.filter((r) => r.run.healthyBlamed);
    expect(runs.get(treeId)!.filter((r) => r.cause === 'no_fault_now')).toHaveLength(PER_CAUSE);
    expect(blamed.length, blamed.map(describeRun).join('\n')).toBeLessThanOrEqual(HEALTHY_BLAMED_TODAY[treeId]);
  });
});

describe('out-of-model cases on all built-in trees together', () => {
  it(`proves a wrong cause no more often than today (target: at most ${CONFIDENTLY_WRONG_TARGET * 100} % of the cases)`, () => {
    const all = TREES.flatMap((treeId) => runs.get(treeId)!);
    const wrong = all.filter((r) => r.run.verdict === 'confidently_wrong');
    expect(all.length).toBe(TREES.reduce((n, t) => n + OOM_CAUSES[t].length * PER_CAUSE, 0));
    expect(wrong.length, wrong.map(describeRun).join('\n')).toBeLessThanOrEqual(CONFIDENTLY_WRONG_TODAY);
  });
});
