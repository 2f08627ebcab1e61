import { sqlState } from '../../database/unavailable';

/** True when a Prisma error (of a model query or a raw one) is a unique-constraint violation, optionally on a given field. */
export function isUniqueViolation(error: unknown, field?: string): boolean {
  const e = error as { code?: string; constraint?: string; meta?: { target?: unknown; driverAdapterError?: { cause?: { constraint?: { fields?: string[] } } } }; message?: string };
  // A raw query reports PostgreSQL's own code (23505, unique_violation) and the constraint's name, through Prisma
  // (P2010) or straight from the driver.
  const raw = (e?.code === 'P2010' || e?.code === '23505') && sqlState(error) === '23505';
  if (e?.code !== 'P2002' && !raw) return false;
  const target = JSON.stringify(e?.meta ?? {}) + (e?.message ?? '') + (e?.constraint ?? '');
  if (!field) return true;
  return target.includes(field);
}
