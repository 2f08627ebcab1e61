/**
 * The one adapter onto json-rules-engine. Each test's outcomes become one rule each; a reading is classified by
 * running them and collecting the outcomes that fired (exactly one must fire, else the reading is indeterminate).
 *
 * Numeric operators are replaced by strict ones (finite numbers only): the library's defaults accept strings, so a
 * value like "5.01 V" would silently compare. Each operator kind validates its own condition value and knows the
 * interval of readings it accepts, which tree loading uses for guard-band checks and the derive script for bands.
 */
import { Engine } from 'json-rules-engine';
import type { MeasurementRequest } from '../vocabulary';
import { finding, joinPath, type Finding } from './findings';
import type { RuleCondition } from './tree-schema';

/** Half-open interval [lo, hi) of reading values. */
export interface Interval {
  lo: number;
  hi: number;
}

const isNumber = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);
/** Reading values: numbers only; +Infinity stands for an ohmmeter overload (open). */
const isReadingValue = (v: unknown): v is number => typeof v === 'number' && !Number.isNaN(v);

interface OperatorKind {
  name: string;
  /** Why the condition's `value` is unusable, or undefined when it is fine. */
  checkValue(value: unknown): string | undefined;
  evaluate(fact: number, value: never): boolean;
  /** Readings the comparison accepts, when the fact is `value`. */
  interval(value: never): Interval;
}

const numberValue = (v: unknown) => (isNumber(v) ? undefined : 'expected a finite number');

const OPERATOR_KINDS: readonly OperatorKind[] = [
  {
    name: 'inRange',
    checkValue: (v) =>
      Array.isArray(v) && v.length === 2 && isNumber(v[0]) && isNumber(v[1]) && v[0] < v[1]
        ? undefined
        : 'expected [low, high] with finite numbers, low < high (low included, high excluded)',
    evaluate: (fact, [lo, hi]: [number, number]) => fact >= lo && fact < hi,
    interval: ([lo, hi]: [number, number]) => ({ lo, hi }),
  },
  { name: 'lessThan', checkValue: numberValue, evaluate: (f, v: number) => f < v, interval: (v: number) => ({ lo: -Infinity, hi: v }) },
  {
    name: 'greaterThanInclusive',
    checkValue: numberValue,
    evaluate: (f, v: number) => f >= v,
    interval: (v: number) => ({ lo: v, hi: Infinity }),
  },
];
const NUMERIC_OPERATORS = new Map(OPERATOR_KINDS.map((k) => [k.name, k]));

/** Library operators that would coerce strings; trees must use the strict ones above instead. */
const COERCING_OPERATORS = new Set(['greaterThan', 'lessThanInclusive']);
const PLAIN_OPERATORS = new Set(['equal', 'notEqual', 'in', 'notIn']);

/** Facts a condition may use: the reading value and the conditions it was taken under. */
export const CONDITION_FACTS = ['value', 'quantity', 'at', 'against', 'location', 'connector', 'key', 'engine', 'pid', 'jumperCount'] as const;
const FACTS = new Set<string>(CONDITION_FACTS);

function factsOf(value: number, request: MeasurementRequest): Record<string, unknown> {
  return {
    value,
    quantity: request.quantity,
    at: request.at,
    against: request.against ?? null,
    location: request.location,
    connector: request.connector,
    key: request.key,
    engine: request.engine,
    pid: request.pid ?? null,
    jumperCount: request.jumpers.length,
  };
}

/** Static check of one outcome condition. */
export function checkCondition(condition: RuleCondition, path: string): Finding[] {
  if ('all' in condition) return condition.all.flatMap((c, i) => checkCondition(c, joinPath(path, 'all', i)));
  if ('any' in condition) return condition.any.flatMap((c, i) => checkCondition(c, joinPath(path, 'any', i)));
  if ('not' in condition) return checkCondition(condition.not, joinPath(path, 'not'));
  const found: Finding[] = [];
  if (!FACTS.has(condition.fact))
    found.push(finding('tree.condition.unknown_fact', joinPath(path, 'fact'), `unknown fact "${condition.fact}"; expected one of ${CONDITION_FACTS.join(', ')}`));
  if (condition.path !== undefined) found.push(finding('tree.condition.path_not_allowed', joinPath(path, 'path'), 'facts are plain values; remove "path"'));
  const numeric = NUMERIC_OPERATORS.get(condition.operator);
  if (numeric) {
    const problem = numeric.checkValue(condition.value);
    if (problem) found.push(finding('tree.condition.bad_value', joinPath(path, 'value'), `${condition.operator}: ${problem}`));
  } else if (COERCING_OPERATORS.has(condition.operator)) {
    found.push(
      finding('tree.condition.coercing_operator', joinPath(path, 'operator'), `"${condition.operator}" is not allowed; use inRange, lessThan or greaterThanInclusive`),
    );
  } else if (!PLAIN_OPERATORS.has(condition.operator)) {
    found.push(
      finding('tree.condition.unknown_operator', joinPath(path, 'operator'), `unknown operator "${condition.operator}"; expected inRange, lessThan, greaterThanInclusive, ${[...PLAIN_OPERATORS].join(', ')}`),
    );
  } else if (condition.fact === 'value') {
    found.push(finding('tree.condition.value_needs_numeric', joinPath(path, 'operator'), 'compare the reading value with inRange, lessThan or greaterThanInclusive'));
  }
  return found;
}

/** The interval of readings a condition accepts, when it is a plain range on `value` (or an `all` of them). */
export function conditionInterval(condition: RuleCondition): Interval | undefined {
  if ('all' in condition) {
    const parts = condition.all.map(conditionInterval);
    if (parts.some((p) => p === undefined)) return undefined;
    return (parts as Interval[]).reduce((a, b) => ({ lo: Math.max(a.lo, b.lo), hi: Math.min(a.hi, b.hi) }), { lo: -Infinity, hi: Infinity });
  }
  if ('any' in condition || 'not' in condition || condition.fact !== 'value') return undefined;
  const kind = NUMERIC_OPERATORS.get(condition.operator);
  return kind ? kind.interval(condition.value as never) : undefined;
}

/** Classifies readings of one test by running its outcome rules. */
export interface OutcomeClassifier {
  /** Ids of the outcomes whose condition holds for this value under these conditions. */
  classify(value: number, request: MeasurementRequest): Promise<string[]>;
}

export function compileOutcomes(outcomes: ReadonlyArray<{ id: string; condition: RuleCondition }>): OutcomeClassifier {
  const engine = new Engine([], { allowUndefinedFacts: true });
  for (const kind of OPERATOR_KINDS) engine.addOperator(kind.name, (fact: unknown, value: unknown) => isReadingValue(fact) && kind.evaluate(fact, value as never));
  for (const outcome of outcomes) {
    const top = 'all' in outcome.condition || 'any' in outcome.condition || 'not' in outcome.condition ? outcome.condition : { all: [outcome.condition] };
    engine.addRule({ name: outcome.id, conditions: top as never, event: { type: outcome.id } });
  }
  return {
    async classify(value, request) {
      if (!isReadingValue(value)) return [];
      const result = await engine.run(factsOf(value, request));
      return result.events.map((e) => e.type);
    },
  };
}
