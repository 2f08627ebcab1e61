/**
 * Whole numbers as people type them: "148220", "148,220", "148 220", "148'220" or "148.220" (groups of three
 * digits), as well as a JSON number. One rule for the API; the pages' own parser (public/js/numbers.js) follows it.
 */
import { z } from 'zod';

const GROUPED = /^\d{1,3}(?:([,.' _\u00a0\u202f\u2009])\d{3})(?:\1\d{3})*$/;

/** The integer a person typed, or null when the text is not a whole number with optional digit grouping. */
export function parseTypedInteger(text: string): number | null {
  const t = text.trim();
  if (/^\d+$/.test(t)) return Number(t);
  if (GROUPED.test(t)) return Number(t.replace(/\D/g, ''));
  return null;
}

/** A whole number in [min, max] given as a number or as typed text with digit grouping. */
export function typedInteger(min: number, max: number, example: string) {
  const expected = `a whole number from ${min} to ${max.toLocaleString('en-US')}, digits grouped or not (e.g. ${example})`;
  return z.preprocess(
    (v) => (typeof v === 'string' ? (parseTypedInteger(v) ?? v) : v),
    z
      .number({ error: (issue) => (issue.input === undefined ? `missing; expected ${expected}` : `expected ${expected}; got ${JSON.stringify(issue.input)}`) })
      .int(`expected ${expected}`)
      .min(min, `expected ${expected}`)
      .max(max, `expected ${expected}`),
  );
}
