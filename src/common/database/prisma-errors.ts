/** True when a Prisma error is a unique-constraint violation, optionally on a given field. */
export function isUniqueViolation(error: unknown, field?: string): boolean {
  const e = error as { code?: string; meta?: { target?: unknown; driverAdapterError?: { cause?: { constraint?: { fields?: string[] } } } }; message?: string };
  if (e?.code !== 'P2002') return false;
  if (!field) return true;
  const target = JSON.stringify(e.meta ?? {}) + (e.message ?? '');
  return target.includes(field);
}
