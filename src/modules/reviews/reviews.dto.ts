import { z } from 'zod';
import { LIMITS } from '../../common/limits';
import { optionalText } from '../../common/validation/domain-schemas';
import { parseDigest } from '../../proof-render/digest';

export const RecordReview = z
  .strictObject({
    decision: z.enum(['approved', 'returned', 'withdrawn']).describe('approve the repair, return it to the technician with a comment, or withdraw an earlier approval'),
    comment: optionalText(LIMITS.text.reviewComment).default(''),
    evidenceDigest: z
      .string()
      .max(120)
      .transform((text, ctx) => parseDigest(text) ?? (ctx.addIssue({ code: 'custom', message: 'the evidence digest: 64 hexadecimal characters, with or without "sha256:" before them' }), z.NEVER))
      .optional()
      .describe('the evidence digest the foreman looked at (GET …/approval answers it): refused with 409 when the evidence has changed since'),
  })
  .superRefine((r, ctx) => {
    if (r.decision !== 'approved' && r.comment.length === 0) {
      ctx.addIssue({ code: 'custom', path: ['comment'], message: `a ${r.decision === 'returned' ? 'return' : 'withdrawal'} needs a comment saying why` });
    }
  });
export type RecordReview = z.output<typeof RecordReview>;
