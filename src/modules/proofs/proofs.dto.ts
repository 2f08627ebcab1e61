import { z } from 'zod';

export const VerifyProof = z
  .strictObject({
    digest: z.string().trim().max(120).optional().describe('the 64-hex SHA-256 printed on the proof, or the text of its QR code'),
    pdfBase64: z.string().max(28_000_000).optional().describe('the proof PDF itself, base64-encoded (or POST the PDF as application/pdf)'),
  })
  .superRefine((v, ctx) => {
    if (!v.digest === !v.pdfBase64) ctx.addIssue({ code: 'custom', path: ['digest'], message: 'give either digest or pdfBase64' });
  });
export type VerifyProofInput = z.output<typeof VerifyProof>;
