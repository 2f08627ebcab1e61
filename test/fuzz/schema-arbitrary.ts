/**
 * fast-check arbitraries from the service's own OpenAPI request schemas: values that follow the schema, values that
 * break it one field at a time (wrong type, out of range, dropped, unknown field), and hostile text in every string.
 */
import fc from 'fast-check';

export interface JsonSchema {
  type?: string | string[];
  enum?: unknown[];
  const?: unknown;
  anyOf?: JsonSchema[];
  oneOf?: JsonSchema[];
  allOf?: JsonSchema[];
  properties?: Record<string, JsonSchema>;
  required?: string[];
  additionalProperties?: boolean | JsonSchema;
  items?: JsonSchema;
  minItems?: number;
  maxItems?: number;
  minLength?: number;
  maxLength?: number;
  minimum?: number;
  maximum?: number;
  exclusiveMinimum?: boolean | number;
  pattern?: string;
  format?: string;
  nullable?: boolean;
  default?: unknown;
}

/**
 * Text that has broken other programs: SQL and script injection, format strings, path tricks, and unicode that
 * trips naive handling (astral planes, right-to-left and bidi overrides, zero-width and NUL-like characters,
 * combining marks, a lone surrogate's replacement, an overlong line).
 */
export const HOSTILE_TEXT: readonly string[] = [
  "'; DROP TABLE \"Measurement\"; --",
  "' OR '1'='1",
  "1; SELECT pg_sleep(10); --",
  '$$; DELETE FROM "RepairOrder"; $$',
  "Robert'); UPDATE \"User\" SET role='admin' WHERE ('1'='1",
  '<script>alert(document.cookie)</script>',
  '"><img src=x onerror=alert(1)>',
  "javascript:alert('x')",
  '</textarea><svg onload=alert(1)>',
  '{{constructor.constructor("return process")()}}',
  '${process.exit(1)}',
  '%s%s%s%n%x',
  '../../../../etc/passwd',
  '__proto__',
  'Ω 𝄞 😀 🇨🇦 𐍈',
  'עברית العربية mixed ltr',
  '\u202Egnirts desrever\u202C',
  'zero\u200Bwidth\u200Djoiner\uFEFF',
  'e\u0301\u0302\u0303\u0304 combining',
  '\uFFFD\uFFFE replacement',
  'tab\there\r\nnew line',
  '\u0000 NUL',
  '\u0007 bell \u001B[31m escape',
  'NaN',
  '-0',
  '1e309',
  'null',
  ' '.repeat(3),
];

/** Hostile text, or random text over all of unicode (including astral planes). */
export const hostileString: fc.Arbitrary<string> = fc.oneof(
  { weight: 3, arbitrary: fc.constantFrom(...HOSTILE_TEXT) },
  { weight: 2, arbitrary: fc.string({ unit: 'grapheme', maxLength: 40 }) },
  { weight: 1, arbitrary: fc.string({ unit: 'binary', maxLength: 40 }) },
  { weight: 1, arbitrary: fc.tuple(fc.constantFrom(...HOSTILE_TEXT), fc.string({ unit: 'grapheme', maxLength: 10 })).map(([a, b]) => a + b) },
);

export interface Known {
  /** Ids that exist (repair order, circuit, readings …): a uuid field sometimes names one of them. */
  uuids: string[];
  /** Upper bounds tighter than the schema's for fields that set the amount of work (e.g. Monte Carlo samples). */
  caps?: Record<string, number>;
}

const anyJson = fc.jsonValue({ maxDepth: 2 });

function numberIn(s: JsonSchema, integer: boolean): fc.Arbitrary<number> {
  const min = typeof s.minimum === 'number' ? s.minimum : -1e6;
  const max = typeof s.maximum === 'number' ? s.maximum : 1e6;
  const inRange = integer
    ? fc.integer({ min: Math.ceil(Math.max(min, -(2 ** 31))), max: Math.floor(Math.min(max, 2 ** 31)) })
    : fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
  const edges = fc.constantFrom(min, max, 0, -1, 1e308, -1e308, 2 ** 53 + 1, 0.1, -0);
  return fc.oneof({ weight: 4, arbitrary: inRange }, { weight: 1, arbitrary: edges });
}

function stringFor(s: JsonSchema, known: Known): fc.Arbitrary<string> {
  if (s.format === 'uuid') return fc.oneof(fc.constantFrom(...known.uuids), fc.uuid());
  if (s.format === 'date-time') return fc.date({ min: new Date('2020-01-01'), max: new Date(Date.now() + 60_000), noInvalidDate: true }).map((d) => d.toISOString());
  if (s.format === 'email') return fc.emailAddress();
  const valid = s.pattern
    ? safeMatching(s.pattern, s.maxLength)
    : fc.string({ unit: 'grapheme', minLength: s.minLength ?? 0, maxLength: Math.min(s.maxLength ?? 60, 60) });
  return fc.oneof({ weight: 3, arbitrary: valid }, { weight: 2, arbitrary: hostileString });
}

function safeMatching(pattern: string, maxLength?: number): fc.Arbitrary<string> {
  try {
    const matching = fc.stringMatching(new RegExp(pattern));
    return maxLength ? matching.filter((v) => v.length <= maxLength) : matching;
  } catch {
    return fc.string({ maxLength: maxLength ?? 20 });
  }
}

/** Values meant to satisfy the schema (with hostile text wherever text goes, which the schema may still refuse). */
export function validish(s: JsonSchema, known: Known, depth = 0): fc.Arbitrary<unknown> {
  if (depth > 6) return fc.constant(null);
  if (s.const !== undefined) return fc.constant(s.const);
  if (s.enum) return fc.constantFrom(...s.enum);
  const choices = s.anyOf ?? s.oneOf;
  if (choices) return fc.oneof(...choices.map((c) => validish(c, known, depth + 1)));
  if (s.allOf?.length) return validish(Object.assign({}, ...s.allOf), known, depth + 1);
  const type = Array.isArray(s.type) ? s.type[0] : s.type;
  switch (type) {
    case 'string':
      return stringFor(s, known);
    case 'integer':
      return numberIn(s, true);
    case 'number':
      return numberIn(s, false);
    case 'boolean':
      return fc.boolean();
    case 'array': {
      const item = s.items ? validish(s.items, known, depth + 1) : anyJson;
      return fc.array(item, { minLength: s.minItems ?? 0, maxLength: Math.min(s.maxItems ?? 4, 4) });
    }
    case 'object':
    case undefined: {
      if (!s.properties) return type === 'object' ? fc.dictionary(hostileString, anyJson, { maxKeys: 4 }) : anyJson;
      const required = new Set(s.required ?? []);
      const record: Record<string, fc.Arbitrary<unknown>> = {};
      for (const [key, prop] of Object.entries(s.properties)) {
        const cap = known.caps?.[key];
        const capped = cap !== undefined && typeof prop.maximum === 'number' ? { ...prop, maximum: Math.min(prop.maximum, cap) } : prop;
        record[key] = validish(capped, known, depth + 1);
      }
      const optional = Object.keys(s.properties).filter((k) => !required.has(k));
      return fc.record(record, { requiredKeys: [...required].filter((k) => k in record) }).chain((value) =>
        // Optional fields are left out now and then, as clients do.
        fc.subarray(optional).map((drop) => {
          const copy = { ...(value as Record<string, unknown>) };
          for (const k of drop) delete copy[k];
          return copy;
        }),
      );
    }
    default:
      return anyJson;
  }
}

/** A schema value broken in one place: a field of the wrong type, a hostile string, dropped, or an unknown one added. */
export function broken(s: JsonSchema, known: Known): fc.Arbitrary<unknown> {
  return validish(s, known).chain((value) => {
    if (!value || typeof value !== 'object' || Array.isArray(value)) return fc.oneof(fc.constant(value), anyJson, hostileString);
    const keys = Object.keys(value as object);
    if (keys.length === 0) return fc.constant({ ...(value as object), unexpected: 1 });
    return fc.tuple(fc.constantFrom(...keys), fc.integer({ min: 0, max: 4 }), anyJson, hostileString).map(([key, how, junk, text]) => {
      const copy: Record<string, unknown> = { ...(value as Record<string, unknown>) };
      if (how === 0) delete copy[key];
      else if (how === 1) copy[key] = junk;
      else if (how === 2) copy[key] = text;
      else if (how === 3) copy[text] = junk;
      else copy[key] = [copy[key], copy[key]];
      return copy;
    });
  });
}

/** Text that is not JSON, or JSON cut short. */
export const malformedJson: fc.Arbitrary<string> = fc.oneof(
  fc.constantFrom('{', '{"a":', '[1,2', '{"a" 1}', "{'single': 'quotes'}", '{"a":1,}', 'undefined', 'NaN', '\u0000', '{"a":"\\u12"}', '{"__proto__":{"x":1}}x'),
  fc.jsonValue().map((v) => JSON.stringify(v)).filter((t) => t.length > 2).map((t) => t.slice(0, Math.max(1, t.length - 1))),
  fc.string({ unit: 'binary', minLength: 1, maxLength: 50 }),
);
