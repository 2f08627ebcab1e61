/**
 * The fault-tree document format (JSON), checked with zod. Shape errors become coded findings with the JSON
 * path; cross-references (ids, guard bands, likelihood rows) are checked afterwards in `load-tree.ts`.
 */
import { z } from 'zod';
import { issueCode, MeasurementRequestSchema, PointSchema } from '../request-schema';
import type { TreeRequest } from './request-key';
import { finding, type Finding } from './findings';
import { TREE_LIMITS } from './tree-limits';

export const TREE_FORMAT = 'tracebay.fault-tree/1';

const id = z.string().regex(/^[a-z][a-z0-9_]*$/, 'expected a lower-case id: letters, digits, underscores');
const text = z.string().trim().min(1, 'expected non-empty text');
const probability = z.number().min(0).max(1);

export const requestSchema = MeasurementRequestSchema;

/** Units a test may declare for its value (scan tests and comparisons). */
export const TEST_UNITS = ['V', '°C'] as const;
export type TestUnit = (typeof TEST_UNITS)[number];

/** A json-rules-engine condition: `all` / `any` / `not` nodes over fact comparisons. */
export type RuleCondition =
  | { all: RuleCondition[] }
  | { any: RuleCondition[] }
  | { not: RuleCondition }
  | { fact: string; operator: string; value: unknown; path?: string };

const conditionSchema: z.ZodType<RuleCondition> = z.lazy(() =>
  z.union([
    z.strictObject({ all: z.array(conditionSchema).min(1) }),
    z.strictObject({ any: z.array(conditionSchema).min(1) }),
    z.strictObject({ not: conditionSchema }),
    z.strictObject({ fact: z.string().min(1), operator: z.string().min(1), value: z.unknown(), path: z.string().optional() }),
  ]),
);

/** A percentile of predicted readings; "overload" is an ohms reading beyond the meter's range. */
const bandValue = z.union([z.number(), z.literal('overload')]);
const bandsSchema = z.strictObject({ p5: bandValue, p25: bandValue, p50: bandValue, p75: bandValue, p95: bandValue });

/** A circuit variant the likelihoods are averaged over (options for the circuit model's defaultCircuit). */
const variantSchema = z.strictObject({ id, weight: z.number().positive(), circuit: z.record(z.string(), z.unknown()) });

/** A latent class of circuit (e.g. bias pulled up through 47–180 kΩ, sensor near closed): circuits sampled alike. */
const classSchema = z.strictObject({ id, weight: z.number().positive(), circuits: z.array(z.record(z.string(), z.unknown())).min(1) });

/** Predicted readings per cause and class: quantile cells (stored once each) and, per cause, one cell per class. */
const predictiveSchema = z.strictObject({
  cells: z.array(z.strictObject({ q: z.array(z.number()), overload: z.number().min(0).max(1).optional() })),
  /**
   * Per cause id, the cell index of each (alternative, class), alternative-major in `derivation.classes` order;
   * -1 = the model cannot predict it.
   */
  index: z.record(z.string(), z.array(z.number().int().min(-1))),
});

const outcomeSchema = z.strictObject({ id, label: text, condition: conditionSchema });

/**
 * A comparison: the test's value is the reading of `request` minus the reading of `compare.request` (both stored as
 * ordinary readings, paired by the diagnosis), in the test's unit; its outcomes are ranges on that difference.
 */
const compareSchema = z.strictObject({ request: requestSchema, label: text });

const testSchema = z.strictObject({
  id,
  label: text,
  procedure: z.array(text).min(1),
  request: requestSchema,
  /** A second reading: the test weighs value(request) − value(compare.request). */
  compare: compareSchema.optional(),
  /** Earlier forms of the request (e.g. a fused jumper where a resistor jumper is asked for now) whose readings still answer the test. */
  alsoAnswers: z.array(requestSchema).max(4).optional(),
  setups: z.array(id).default([]),
  preconditions: z.array(text).default([]),
  /** Wires that must have read at most `atMostVolts` (DC volts, key on) before the test is proposed (safety-rules.ts). */
  requires: z.array(z.strictObject({ measured: PointSchema, atMostVolts: z.number().positive().max(60) })).max(6).optional(),
  cautions: z.array(id).default([]),
  minutes: z.number().nonnegative(),
  /** Circuit parts whose repair makes an earlier reading of this test stale; absent = every part. */
  parts: z.array(id).min(1).optional(),
  outcomes: z.array(outcomeSchema).min(2),
  /** P(outcome | hypothesis), one row per hypothesis id; rows are floored and renormalised on load. */
  likelihoods: z.record(z.string(), z.record(z.string(), probability)),
  /** Predicted reading percentiles per hypothesis (recorded by the derive script). */
  bands: z.record(z.string(), bandsSchema).optional(),
  /** Predictive densities from the circuit model: when present they, not the outcome bands, weigh a reading. */
  predictive: predictiveSchema.optional(),
  /**
   * Scan tests: the unit the value is compared in; other units are converted where a published conversion exists.
   * A comparison of two scan values in °C (a temperature PID against another) declares °C.
   */
  unit: z.enum(TEST_UNITS).optional(),
});

const hypothesisSchema = z.strictObject({
  id,
  label: text,
  prior: z.number().positive(),
  /** The "unknown / not modelled" leak: flat likelihood on every test unless rows are given. */
  unknown: z.boolean().optional(),
  repair: z.strictObject({ part: id, action: text }),
});

const setupSchema = z.strictObject({ id, label: text, minutes: z.number().nonnegative(), steps: z.array(text).min(1) });

export const treeDocumentSchema = z.strictObject({
  format: z.literal(TREE_FORMAT),
  id: z.string().regex(/^[a-z][a-z0-9-]*$/, 'expected a kebab-case tree id'),
  version: text,
  circuitKind: id,
  title: text,
  settings: z
    .strictObject({
      likelihoodFloor: z.number().min(0.001).max(0.1).optional(),
      concludeAt: z.number().gt(0.5).lt(1).optional(),
    })
    .default({}),
  hypotheses: z.array(hypothesisSchema).min(2),
  setups: z.array(setupSchema).max(TREE_LIMITS.setups.max).default([]),
  tests: z.array(testSchema).min(1),
  derivation: z
    .strictObject({
      method: z.enum(['circuit_model_monte_carlo', 'hand']),
      seed: z.number().int().optional(),
      samples: z.number().int().positive().optional(),
      variants: z.array(variantSchema).min(1).optional(),
      classes: z.array(classSchema).min(1).optional(),
      /**
       * Causes that stand for several faults (a dead or a weak supply): the weight of each. Which one it is, like the
       * class, is one property of the circuit: the predictive index holds one cell per (alternative, class).
       */
      alternatives: z.record(z.string(), z.array(z.number().positive()).min(2)).optional(),
      /** Part spreads for the Monte Carlo (the circuit model's Spreads), overriding its defaults. */
      spreads: z.record(z.string(), z.unknown()).optional(),
      note: text.optional(),
    })
    .optional(),
});

export type TreeDocument = z.output<typeof treeDocumentSchema>;
export type TestDocument = TreeDocument['tests'][number];
export type BandsDocument = z.output<typeof bandsSchema>;
export type VariantDocument = z.output<typeof variantSchema>;
export type ClassDocument = z.output<typeof classSchema>;
export type PredictiveDocument = z.output<typeof predictiveSchema>;
export type CompareDocument = z.output<typeof compareSchema>;

function pathOf(segments: ReadonlyArray<PropertyKey>): string {
  return segments.reduce<string>((p, s) => (typeof s === 'number' ? `${p}[${s}]` : p ? `${p}.${String(s)}` : String(s)), '');
}

/** Shape check: the parsed document, or findings with JSON paths. */
export function parseTreeDocument(input: unknown): { document?: TreeDocument; findings: Finding[] } {
  const result = treeDocumentSchema.safeParse(input);
  if (result.success) return { document: result.data, findings: [] };
  return {
    findings: result.error.issues.map((issue) =>
      finding(`tree.${issueCode(issue).replace(/^(?!request\.)/, 'schema.')}`, pathOf(issue.path) || '$', issue.message),
    ),
  };
}

/** Shape check of one measurement request (used for readings). */
export function parseRequest(input: unknown, path: string): { request?: TreeRequest; findings: Finding[] } {
  const result = requestSchema.safeParse(input);
  if (result.success) return { request: result.data, findings: [] };
  return {
    findings: result.error.issues.map((issue) =>
      finding(`reading.${issueCode(issue).replace(/^(?!request\.)/, 'request.')}`, [path, pathOf(issue.path)].filter(Boolean).join('.'), issue.message),
    ),
  };
}
