import { z } from 'zod';

export const ListAuditEvents = z.strictObject({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});
export type ListAuditEvents = z.infer<typeof ListAuditEvents>;
