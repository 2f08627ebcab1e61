/**
 * Validation messages in plain words: what the field should hold and what came instead, never the validation
 * library's own wording ("Invalid input: expected string, received undefined"). Messages a schema gives itself
 * ("at most 4000 characters") are kept as written.
 */
import type { z } from 'zod';

/** The library's default wording, which a person at the tablet should never read. */
const LIBRARY_WORDING = /^(Invalid (input|option|string|UUID|email|URL|key|element|ISO|date|number|type)|Too (small|big)|Unrecognized keys?)\b/;

const TYPE_WORDS: Record<string, string> = {
  string: 'text',
  number: 'a number',
  int: 'a whole number',
  bigint: 'a whole number',
  boolean: 'true or false',
  array: 'a list',
  object: 'an object with named fields',
  date: 'a date',
  null: 'nothing (null)',
  nan: 'a number',
};

const FORMAT_WORDS: Record<string, string> = {
  uuid: 'an id (a UUID such as 0a0a0a0a-0000-4000-8000-000000000001)',
  email: 'an email address',
  url: 'a web address',
  datetime: 'an ISO 8601 date-time with zone, e.g. 2026-03-04T09:15:00Z',
  date: 'a date, e.g. 2026-03-04',
};

function got(input: unknown): string {
  if (input === null) return 'null';
  if (Array.isArray(input)) return 'a list';
  if (typeof input === 'string') return input.length > 40 ? `the text "${input.slice(0, 40)}…"` : `the text ${JSON.stringify(input)}`;
  if (typeof input === 'number' || typeof input === 'boolean') return String(input);
  return typeof input === 'object' ? 'an object' : typeof input;
}

function withInput(expected: string, issue: z.core.$ZodIssue): string {
  const input = (issue as { input?: unknown }).input;
  return input === undefined ? `missing; expected ${expected}` : `expected ${expected}, not ${got(input)}`;
}

function bound(issue: { origin?: string; inclusive?: boolean }, value: unknown, least: boolean): string {
  const n = Number(value);
  switch (issue.origin) {
    case 'string':
      return `${least ? 'at least' : 'at most'} ${n} character${n === 1 ? '' : 's'}`;
    case 'array':
    case 'set':
      return `${least ? 'at least' : 'at most'} ${n} item${n === 1 ? '' : 's'}`;
    default:
      return issue.inclusive === false ? `a number ${least ? 'above' : 'below'} ${n}` : `a number ${least ? 'of at least' : 'of at most'} ${n}`;
  }
}

/** The issue's message in plain words (the library's default wording replaced; a schema's own message kept). */
export function plainMessage(issue: z.core.$ZodIssue): string {
  if (!LIBRARY_WORDING.test(issue.message)) return issue.message;
  switch (issue.code) {
    case 'invalid_type':
      return withInput(TYPE_WORDS[issue.expected] ?? issue.expected, issue);
    case 'invalid_value':
      return withInput(`one of ${issue.values.map((v) => JSON.stringify(v)).join(', ')}`, issue);
    case 'too_small':
      return `expected ${bound(issue, issue.minimum, true)}`;
    case 'too_big':
      return `expected ${bound(issue, issue.maximum, false)}`;
    case 'invalid_format':
      return withInput(FORMAT_WORDS[issue.format] ?? (issue.format === 'regex' ? `text of the form ${String((issue as { pattern?: unknown }).pattern)}` : `text in ${issue.format} format`), issue);
    case 'not_multiple_of':
      return `expected a multiple of ${String(issue.divisor)}`;
    case 'unrecognized_keys':
      return `${issue.keys.length === 1 ? 'field' : 'fields'} ${issue.keys.map((k) => JSON.stringify(k)).join(', ')} not accepted here; leave ${issue.keys.length === 1 ? 'it' : 'them'} out`;
    case 'invalid_union': {
      const expected = [
        ...new Set(
          issue.errors.flatMap((branch) =>
            branch.filter((i) => i.path.length === 0).map((i) => (i.code === 'invalid_type' ? (TYPE_WORDS[i.expected] ?? i.expected) : i.code === 'invalid_value' ? i.values.map((v) => JSON.stringify(v)).join(' or ') : null)),
          ),
        ),
      ].filter((x): x is string => Boolean(x));
      return withInput(expected.length ? expected.join(' or ') : 'a value of another form', issue);
    }
    case 'invalid_key':
      return 'a key of this record is not valid';
    case 'invalid_element':
      return 'an entry of this list is not valid';
    default:
      return issue.message;
  }
}
