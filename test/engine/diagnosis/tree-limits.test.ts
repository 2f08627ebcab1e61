// Fault-tree size limits and the planning budget: a tree too large for the next-test search is refused on load
// with a finding naming the limit, however it is malformed (even nested 50 000 levels deep), and a diagnosis that
// runs out of planning time still answers, with a cheaper choice that says so.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { builtInDocuments, builtInTrees, diagnose, loadTree, TREE_LIMITS, type Tree } from '../../../src/engine/diagnosis';
import { searchCost } from '../../../src/engine/diagnosis/tree-limits';
import { lookaheadQ } from '../../../src/engine/diagnosis/policy';
import { syntheticTree, type SyntheticSize } from '../../support/synthetic-tree';

/** A condition nested `depth` levels deep: arrays inside arrays, or `not` inside `not`. */
const nestedArrays = (depth: number) => {
  let c: unknown = { fact: 'value', operator: 'lessThan', value: 1 };
  for (let i = 0; i < depth; i++) c = [c];
  return c;
};
const nestedNots = (depth: number) => {
  let c: unknown = { fact: 'value', operator: 'lessThan', value: 1 };
  for (let i = 0; i < depth; i++) c = { not: c };
  return c;
};
const withCondition = (condition: unknown) => {
  const doc = syntheticTree({ tests: 2, outcomes: 2, causes: 2 }) as { tests: Array<{ outcomes: Array<{ condition: unknown }> }> };
  doc.tests[1]!.outcomes[0]!.condition = condition;
  return doc;
};

describe('fault-tree size limits', () => {
  it.each(builtInDocuments().map((d) => [d.id, d] as const))('leaves room for the built-in tree %s within every limit', (_id, doc) => {
    const outcomes = doc.tests.reduce((n, t) => n + t.outcomes.length, 0);
    // The three-wire tree's search is about 118 000 steps (18 causes × 81 outcomes²): under a third of the limit.
    expect(searchCost(doc.hypotheses.length, outcomes)).toBeLessThanOrEqual(TREE_LIMITS.searchCost.max / 3);
    expect(doc.hypotheses.length).toBeLessThanOrEqual(TREE_LIMITS.causes.max / 2);
    expect(doc.tests.length).toBeLessThanOrEqual(TREE_LIMITS.tests.max / 2);
  });

  it.each<[string, SyntheticSize]>([
    ['as many causes as allowed', { tests: 2, outcomes: 2, causes: TREE_LIMITS.causes.max - 1 }],
    ['as many tests as allowed', { tests: TREE_LIMITS.tests.max, outcomes: 2, causes: 3 }],
    ['as many outcomes per test as allowed', { tests: 3, outcomes: TREE_LIMITS.outcomesPerTest.max, causes: 3 }],
    ['as many set-ups as allowed', { tests: TREE_LIMITS.setups.max, outcomes: 2, causes: 3, setups: TREE_LIMITS.setups.max }],
    // 40 causes × (25 tests × 4 outcomes)² = 400 000: exactly the search-cost limit (computed).
    ['the largest next-test search allowed', { tests: 25, outcomes: 4, causes: 39 }],
  ])('loads a tree with %s', (_what, size) => {
    const result = loadTree(syntheticTree(size));
    expect(result.findings.filter((f) => f.severity === 'error')).toEqual([]);
    expect(result.ok).toBe(true);
  });

  it.each<[string, () => unknown, string, string]>([
    ['one cause too many', () => syntheticTree({ tests: 2, outcomes: 2, causes: TREE_LIMITS.causes.max }), 'tree.limit.causes', 'hypotheses'],
    ['one test too many', () => syntheticTree({ tests: TREE_LIMITS.tests.max + 1, outcomes: 2, causes: 3 }), 'tree.limit.tests', 'tests'],
    ['one outcome too many on a test', () => syntheticTree({ tests: 3, outcomes: TREE_LIMITS.outcomesPerTest.max + 1, causes: 3 }), 'tree.limit.outcomesPerTest', 'tests[0].outcomes'],
    ['one set-up too many', () => syntheticTree({ tests: 31, outcomes: 2, causes: 3, setups: TREE_LIMITS.setups.max + 1 }), 'tree.limit.setups', 'setups'],
    // 40 × (26 × 4)² = 432 640 > 400 000 (computed).
    ['a next-test search over its cost limit', () => syntheticTree({ tests: 26, outcomes: 4, causes: 39 }), 'tree.limit.searchCost', 'tests'],
    // The shape that froze the service: 2 tests × 1 000 outcomes × 1 000 causes, likelihood rows given sparsely.
    ['2 tests × 1 000 outcomes × 1 000 causes', () => syntheticTree({ tests: 2, outcomes: 1000, causes: 999, sparse: true }), 'tree.limit.causes', 'hypotheses'],
    ['the same with every likelihood written out', () => syntheticTree({ tests: 2, outcomes: 1000, causes: 999 }), 'tree.limit.documentBytes', '$'],
    ['a document over the size limit', () => ({ ...syntheticTree({ tests: 2, outcomes: 2, causes: 2 }), title: 'x'.repeat(TREE_LIMITS.documentBytes.max) }), 'tree.limit.documentBytes', '$'],
    ['a condition nested 50 000 arrays deep', () => withCondition(nestedArrays(50_000)), 'tree.limit.documentDepth', '$'],
    ['a condition of 20 000 nested "not"', () => withCondition(nestedNots(20_000)), 'tree.limit.documentDepth', '$'],
    ['a condition nested deeper than a condition may be', () => withCondition(nestedNots(TREE_LIMITS.conditionDepth.max + 1)), 'tree.limit.conditionDepth', 'tests[1].outcomes[0].condition'],
  ])('refuses %s with a finding naming the limit', (_what, make, code, path) => {
    const result = loadTree(make());
    expect(result.ok).toBe(false);
    const hit = result.findings.find((f) => f.code === code);
    expect(hit, JSON.stringify(result.findings.slice(0, 3))).toMatchObject({ path, severity: 'error' });
    const name = code.replace('tree.limit.', '') as keyof typeof TREE_LIMITS;
    expect(hit!.message).toContain(`at most ${TREE_LIMITS[name].max}`);
    expect(hit!.message).toContain(`"${name}"`);
  });
});

describe('the planning budget of a diagnosis', () => {
  const tree: Tree = builtInTrees()['three-wire-5v']!;

  it('chooses by one-step lookahead, and says so, when the budget is spent', async () => {
    const d = await diagnose(tree, [], { planningBudgetMs: 0 });
    expect(d.status).toBe('testing');
    expect(d.findings.map((f) => f.code)).toContain('diagnosis.planning_budget_spent');
    expect(d.nextTest!.strategy).toBe('lookahead');
    const best = d.nextTest!.ranking[0]!;
    expect(d.nextTest!.ranking.every((r) => r.expectedMinutes >= best.expectedMinutes)).toBe(true);
  });

  it('plans in full, with no such finding, within the default budget on a built-in tree', async () => {
    const d = await diagnose(tree, []);
    expect(d.findings.map((f) => f.code)).not.toContain('diagnosis.planning_budget_spent');
  });

  it('ranks with the same numbers as one-step lookahead when it falls back', async () => {
    const { policyModel, resolve } = await import('../../../src/engine/diagnosis/diagnose');
    const model = policyModel(tree, resolve(tree, {}).resolved);
    const state = { p: Float64Array.from(tree.hypotheses, (h) => h.prior), done: new Int16Array(tree.tests.length).fill(-1), paid: 0 };
    const d = await diagnose(tree, [], { planningBudgetMs: 0 });
    for (const r of d.nextTest!.ranking) {
      const t = tree.tests.findIndex((x) => x.id === r.testId);
      expect(r.expectedMinutes).toBeCloseTo(lookaheadQ(model, state, t, 1), 9);
    }
  });
});

describe('the limits as documented', () => {
  it('are the numbers the README’s limits table gives', () => {
    const readme = readFileSync(join(__dirname, '..', '..', '..', 'README.md'), 'utf8');
    const rows = Object.fromEntries([...readme.matchAll(/^\| `(\w+)` \| (\d+) \| [^|]+ \|$/gm)].map((m) => [m[1], Number(m[2])]));
    for (const [name, limit] of Object.entries(TREE_LIMITS)) expect(rows[name], name).toBe(limit.max);
  });
});
