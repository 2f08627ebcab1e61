/**
 * Checks on comparison tests (two readings, one outcome on their difference): each half must be a reading the
 * engine can subtract from the other, in the test's unit, under the same key and engine state, and no half may be
 * a test that already weighs it in another unit.
 */
import { finding, joinPath, type Finding } from './findings';
import { requestKey, type TreeRequest } from './request-key';
import type { TestDocument, TreeDocument } from './tree-schema';

/** The unit a half is read in: volts for the meter, the test's unit for a scan value; undefined = cannot subtract. */
function halfUnit(request: TreeRequest, test: TestDocument): string | undefined {
  if (request.quantity === 'dc_volts') return 'V';
  if (request.quantity === 'scan_value') return test.unit ?? 'V';
  return undefined;
}

interface ComparisonCheck {
  code: string;
  /** The offending path (under `tests[i]`) and message, or undefined when the comparison passes. */
  check(test: TestDocument, doc: TreeDocument): { at: Array<string | number>; message: string } | undefined;
}

const CHECKS: readonly ComparisonCheck[] = [
  {
    code: 'tree.compare.same_request',
    check: (t) => (requestKey(t.request) === requestKey(t.compare!.request) ? { at: ['compare', 'request'], message: 'a comparison needs two different readings: compare.request repeats the test\'s own request' } : undefined),
  },
  {
    code: 'tree.compare.not_subtractable',
    check: (t) => {
      const bad = ([['request'], ['compare', 'request']] as const).find((at) => halfUnit(at.length === 1 ? t.request : t.compare!.request, t) === undefined);
      return bad ? { at: [...bad, 'quantity'], message: 'a comparison subtracts DC volts or scan values; an ohms or amps reading (an overload has no difference) cannot be a half' } : undefined;
    },
  },
  {
    code: 'tree.compare.unit_mismatch',
    check: (t) => {
      const [a, b] = [halfUnit(t.request, t), halfUnit(t.compare!.request, t)];
      if (!a || !b || a === b) return undefined;
      return { at: ['unit'], message: `the halves are read in ${a} and ${b}: a difference needs one unit (a meter reading pairs with a scan value in V; two temperature PIDs with "unit": "°C")` };
    },
  },
  {
    code: 'tree.compare.conditions_differ',
    check: (t) =>
      t.request.key !== t.compare!.request.key || t.request.engine !== t.compare!.request.engine
        ? { at: ['compare', 'request', 'key'], message: 'both halves must be read with the same key and engine state, or the difference is the state change, not the circuit' }
        : undefined,
  },
  {
    code: 'tree.compare.half_in_other_unit',
    check: (t, doc) => {
      for (const request of [t.request, t.compare!.request]) {
        const single = doc.tests.find((s) => !s.compare && requestKey(s.request) === requestKey(request));
        if (single && request.quantity === 'scan_value' && (single.unit ?? 'V') !== (t.unit ?? 'V'))
          return { at: ['unit'], message: `test "${single.id}" reads the same scan value in ${single.unit ?? 'V'}: a comparison of it must use that unit` };
      }
      return undefined;
    },
  },
  {
    code: 'tree.compare.also_answers',
    check: (t) => (t.alsoAnswers?.length ? { at: ['alsoAnswers'], message: 'a comparison pairs exactly its two requests; earlier forms of a request are not accepted for it' } : undefined),
  },
];

export function checkComparisons(doc: TreeDocument): Finding[] {
  const pairs = new Map<string, string>();
  return doc.tests.flatMap((t, i) => {
    if (!t.compare) return [];
    const found = CHECKS.flatMap((c) => {
      const r = c.check(t, doc);
      return r ? [finding(c.code, joinPath('tests', i, ...r.at), r.message)] : [];
    });
    // The same pair the other way round is the same comparison with its sign flipped.
    const key = [requestKey(t.request), requestKey(t.compare.request)].sort().join('|');
    const other = pairs.get(key);
    if (other) found.push(finding('tree.compare.duplicate', joinPath('tests', i, 'compare'), `test "${other}" already compares these two readings`));
    pairs.set(key, t.id);
    return found;
  });
}
