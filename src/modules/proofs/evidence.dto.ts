import { z } from 'zod';
import { LIMITS } from '../../common/limits';
import { IsoTime, optionalText, TroubleCodes } from '../../common/validation/domain-schemas';
import { CODE_CHECK_METHODS } from '../../proof-render/view';

export const RecordCodesAfter = z
  .strictObject({
    version: z.number().int().min(1, 'the version you last read'),
    codes: TroubleCodes.describe('the codes read after the repair; [] when none came back'),
    method: z
      .enum(CODE_CHECK_METHODS, { error: `how the codes were read: one of ${CODE_CHECK_METHODS.join(', ')}` })
      .describe('cleared_then_key_cycles, road_test (cleared, then a drive) or rescanned (read again without clearing)'),
    keyCycles: z.number().int().min(0).max(LIMITS.number.keyCycles).optional().describe('key cycles before reading again (cleared_then_key_cycles)'),
    note: optionalText(LIMITS.text.codesAfterNote).default(''),
    checkedAt: IsoTime.optional().describe('when they were read; now by default'),
  })
  .superRefine((v, ctx) => {
    if (v.method === 'cleared_then_key_cycles' && v.keyCycles === undefined) {
      ctx.addIssue({ code: 'custom', path: ['keyCycles'], message: 'how many key cycles passed before the codes were read again' });
    }
    if (v.checkedAt && Date.parse(v.checkedAt) > Date.now() + 5 * 60_000) ctx.addIssue({ code: 'custom', path: ['checkedAt'], message: 'not in the future' });
  });
export type RecordCodesAfter = z.output<typeof RecordCodesAfter>;
