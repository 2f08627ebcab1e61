import { z } from 'zod';
import { isTimeZone } from './zoned-time';

export const PAPER_SIZES = ['A4', 'Letter'] as const;

export const UpdateShopSettings = z
  .strictObject({
    paperSize: z.enum(PAPER_SIZES, { error: 'paperSize is "A4" or "Letter"' }).optional().describe('paper the proof of repair is laid out on'),
    timeZone: z
      .string()
      .trim()
      .min(1)
      .max(64)
      .refine(isTimeZone, 'an IANA time zone name such as "Europe/Berlin", "America/Chicago" or "UTC"')
      .optional()
      .describe('IANA time zone the shop’s documents print times in (stored times stay UTC)'),
    publicProofCheck: z.boolean().optional().describe('whether anyone holding a proof may check it at /proofs/<digest> without signing in'),
  })
  .refine((v) => Object.keys(v).length > 0, { message: 'name at least one setting to change: paperSize, timeZone or publicProofCheck' });
export type UpdateShopSettings = z.output<typeof UpdateShopSettings>;
