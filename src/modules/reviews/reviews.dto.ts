import { z } from 'zod';
import { optionalText } from '../../common/validation/domain-schemas';

export const RecordReview = z
  .strictObject({
    decision: z.enum(['approved', 'returned', 'withdrawn']).describe('approve the repair, return it to the technician with a comment, or withdraw an earlier approval'),
    comment: optionalText(2000).default(''),
  })
  .superRefine((r, ctx) => {
    if (r.decision !== 'approved' && r.comment.length === 0) {
      ctx.addIssue({ code: 'custom', path: ['comment'], message: `a ${r.decision === 'returned' ? 'return' : 'withdrawal'} needs a comment saying why` });
    }
  });
export type RecordReview = z.output<typeof RecordReview>;
