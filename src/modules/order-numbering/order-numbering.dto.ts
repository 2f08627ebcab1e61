import { z } from 'zod';
import { LIMITS } from '../../common/limits';

/** Longest repair-order number, typed or automatic (prefix + digits). */
export const ORDER_NUMBER_MAX = LIMITS.text.orderNumber;
/** Characters a repair-order number may use (stored upper-case). */
export const ORDER_NUMBER_CHARACTERS = /^[A-Z0-9][A-Z0-9/-]*$/;
export const ORDER_NUMBER_RULE = `at most ${ORDER_NUMBER_MAX} characters: letters, digits, "-" and "/", starting with a letter or digit`;

/** A number typed for a new order: same characters as automatic ones, a sane length. */
export const TypedOrderNumber = z
  .string()
  .trim()
  .toUpperCase()
  .min(1, 'must not be empty')
  .max(ORDER_NUMBER_MAX, `at most ${ORDER_NUMBER_MAX} characters`)
  .regex(ORDER_NUMBER_CHARACTERS, ORDER_NUMBER_RULE);

export const PREFIX_MAX = 10;
export const WIDTH_MAX = 9;

export const SetOrderNumbering = z
  .strictObject({
    prefix: z
      .string()
      .trim()
      .toUpperCase()
      .max(PREFIX_MAX, `at most ${PREFIX_MAX} characters`)
      .regex(/^([A-Z0-9][A-Z0-9/-]*)?$/, 'letters, digits, "-" and "/", starting with a letter or digit (or empty for digits only)')
      .describe('put before the digits, e.g. "RO-" or "KR-"; stored upper-case'),
    width: z.number().int('a whole number').min(1, 'at least 1 digit').max(WIDTH_MAX, `at most ${WIDTH_MAX} digits`).describe('digits, zero-padded: 5 gives RO-00042'),
    next: z
      .number()
      .int('a whole number')
      .min(1, 'at least 1')
      .max(10 ** WIDTH_MAX - 1, `at most ${10 ** WIDTH_MAX - 1}`)
      .optional()
      .describe('the number the next automatic order gets (default: unchanged)'),
  })
  .describe('how the shop numbers new repair orders automatically; numbers typed by hand do not change it');
export type SetOrderNumbering = z.output<typeof SetOrderNumbering>;
