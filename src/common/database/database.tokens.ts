import type { PrismaClient, Prisma } from '../../generated/prisma/client';

/**
 * One parameterised statement straight through the driver (the `pg` pool, or PGlite), without the ORM: for the few
 * hot statements where Prisma's own work per query costs more than the statement. Rows come as the driver parses
 * them (timestamptz as Date, json as objects); cast anything else to text or float8 in the SQL.
 */
export type RawSql = <T = Record<string, unknown>>(text: string, params: readonly unknown[]) => Promise<T[]>;

/** The opened database, handed to Nest by `main.ts` (or by a test) after migrations ran. */
export interface OpenDatabase {
  readonly prisma: PrismaClient;
  /** The driver itself; absent on a handle built without it (then repositories go through `prisma.$queryRawUnsafe`). */
  readonly sql?: RawSql;
  readonly kind: 'postgresql' | 'embedded';
  migrationState(): Promise<{ applied: string[]; pending: string[] }>;
  close(): Promise<void>;
}

export const DATABASE = Symbol('DATABASE');

/** Either the root client or the client of a running transaction: repositories accept both. */
export type Db = PrismaClient | Prisma.TransactionClient;
