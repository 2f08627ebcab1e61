// Numbers as people type them on a tablet: digit grouping ("148,220", "148 220") and a decimal comma ("4,87").
// Whole numbers follow the service's own rule (src/common/validation/typed-number.ts).

const GROUPED = /^\d{1,3}(?:([,.' _\u00a0\u202f\u2009])\d{3})(?:\1\d{3})*$/;

/** A whole number, or null when the text is not one. */
export function typedInteger(text) {
  const t = String(text ?? '').trim();
  if (/^\d+$/.test(t)) return Number(t);
  if (GROUPED.test(t)) return Number(t.replace(/\D/g, ''));
  return null;
}

/**
 * A decimal number: spaces and apostrophes group digits; with both "," and "." the last one is the decimal mark;
 * a lone "," is a decimal comma ("4,87" is 4.87). Null when it is not a number.
 */
export function typedDecimal(text) {
  let t = String(text ?? '').trim().replace(/[\u2212]/g, '-').replace(/[\s'\u00a0\u202f\u2009_]/g, '');
  if (t.includes(',') && t.includes('.')) {
    t = t.lastIndexOf(',') > t.lastIndexOf('.') ? t.replace(/\./g, '').replace(',', '.') : t.replace(/,/g, '');
  } else if (t.includes(',')) {
    t = t.replace(',', '.');
  }
  if (!/^-?(\d+\.?\d*|\.\d+)$/.test(t)) return null;
  return Number(t);
}
