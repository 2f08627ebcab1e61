/**
 * How large a fault tree may be: the one definition of each limit, checked on every document before any other
 * work (uploads, stored trees, built-in ones) and shown in the API documentation and the README.
 *
 * The next-test search (Q2, see policy.ts) costs about causes × (outcomes summed over tests)² steps per
 * diagnosis, so that product is bounded as well as each count. Depth is measured without recursion, so a document
 * nested 50 000 levels deep is refused with a finding instead of overflowing the stack.
 */
import { finding, joinPath, type Finding } from './findings';

export interface TreeLimit {
  max: number;
  /** What is counted, in plain words (for messages and documentation). */
  what: string;
}

export const TREE_LIMITS = {
  documentBytes: { max: 786_432, what: 'size of the tree document (UTF-8 JSON bytes)' },
  documentDepth: { max: 48, what: 'nesting depth of the tree document (objects and arrays)' },
  causes: { max: 40, what: 'causes (hypotheses, the unknown one included)' },
  tests: { max: 48, what: 'tests' },
  outcomesPerTest: { max: 8, what: 'outcomes of one test' },
  setups: { max: 30, what: 'set-ups' },
  conditionDepth: { max: 12, what: 'nesting depth of one outcome condition (all / any / not)' },
  searchCost: { max: 400_000, what: 'next-test search cost: causes × (outcomes summed over all tests)²' },
} as const satisfies Record<string, TreeLimit>;

/** Sensors on one shared 5 V reference: a generated tree, and a reference group on a repair order, has this many. */
export const SHARED_REFERENCE_SENSORS = { min: 2, max: 8 } as const;

export type TreeLimitName = keyof typeof TREE_LIMITS;

const over = (name: TreeLimitName, path: string, actual: number): Finding =>
  finding(`tree.limit.${name}`, path, `at most ${TREE_LIMITS[name].max} ${TREE_LIMITS[name].what} (limit "${name}"); this tree has ${actual}`);

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
const arrayAt = (v: unknown, key: string): unknown[] => (isRecord(v) && Array.isArray(v[key]) ? (v[key] as unknown[]) : []);

/** Nesting depth of a JSON value (a scalar is 0), without recursion; stops counting once past `stopAt`. */
export function jsonDepth(value: unknown, stopAt = Infinity): number {
  let deepest = 0;
  const stack: Array<[unknown, number]> = [[value, 0]];
  while (stack.length > 0) {
    const [v, depth] = stack.pop()!;
    if (typeof v !== 'object' || v === null) continue;
    const here = depth + 1;
    if (here > deepest) deepest = here;
    if (deepest > stopAt) return deepest;
    for (const child of Array.isArray(v) ? v : Object.values(v)) if (typeof child === 'object' && child !== null) stack.push([child, here]);
  }
  return deepest;
}

/** Depth of all / any / not nodes in a condition, without recursion; stops once past `stopAt`. */
function conditionDepth(condition: unknown, stopAt: number): number {
  let deepest = 0;
  const stack: Array<[unknown, number]> = [[condition, 0]];
  while (stack.length > 0) {
    const [c, depth] = stack.pop()!;
    if (!isRecord(c)) continue;
    const children = Array.isArray(c.all) ? c.all : Array.isArray(c.any) ? c.any : 'not' in c ? [c.not] : null;
    if (!children) continue;
    const here = depth + 1;
    if (here > deepest) deepest = here;
    if (deepest > stopAt) return deepest;
    for (const child of children) stack.push([child, here]);
  }
  return deepest;
}

/** The limits a document breaks (empty when within all of them). Safe on any input, however deep or large. */
export function checkTreeLimits(json: unknown): Finding[] {
  const depth = jsonDepth(json, TREE_LIMITS.documentDepth.max);
  if (depth > TREE_LIMITS.documentDepth.max) {
    return [finding('tree.limit.documentDepth', '$', `at most ${TREE_LIMITS.documentDepth.max} ${TREE_LIMITS.documentDepth.what} (limit "documentDepth"); this tree is deeper`)];
  }
  const bytes = new TextEncoder().encode(JSON.stringify(json) ?? '').length;
  const found: Finding[] = [];
  if (bytes > TREE_LIMITS.documentBytes.max) found.push(over('documentBytes', '$', bytes));
  const hypotheses = arrayAt(json, 'hypotheses');
  const tests = arrayAt(json, 'tests');
  const setups = arrayAt(json, 'setups');
  if (hypotheses.length > TREE_LIMITS.causes.max) found.push(over('causes', 'hypotheses', hypotheses.length));
  if (tests.length > TREE_LIMITS.tests.max) found.push(over('tests', 'tests', tests.length));
  if (setups.length > TREE_LIMITS.setups.max) found.push(over('setups', 'setups', setups.length));
  let outcomeSum = 0;
  tests.forEach((test, ti) => {
    const outcomes = arrayAt(test, 'outcomes');
    outcomeSum += outcomes.length;
    if (outcomes.length > TREE_LIMITS.outcomesPerTest.max) found.push(over('outcomesPerTest', joinPath('tests', ti, 'outcomes'), outcomes.length));
    outcomes.forEach((outcome, oi) => {
      const d = isRecord(outcome) ? conditionDepth(outcome.condition, TREE_LIMITS.conditionDepth.max) : 0;
      if (d > TREE_LIMITS.conditionDepth.max) found.push(over('conditionDepth', joinPath('tests', ti, 'outcomes', oi, 'condition'), d));
    });
  });
  const cost = searchCost(hypotheses.length, outcomeSum);
  if (cost > TREE_LIMITS.searchCost.max) found.push(over('searchCost', 'tests', cost));
  return found;
}

/** The next-test search cost the `searchCost` limit bounds. */
export function searchCost(causes: number, outcomesOverAllTests: number): number {
  return causes * outcomesOverAllTests * outcomesOverAllTests;
}

/** The limits as a table (limit, maximum, what), for the API documentation. */
export function treeLimitsTable(): string {
  return Object.entries(TREE_LIMITS)
    .map(([name, l]) => `${name} ≤ ${l.max} (${l.what})`)
    .join('; ');
}
