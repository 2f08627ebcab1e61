import type { PrismaClient, Prisma } from '../../generated/prisma/client';

/** The opened database, handed to Nest by `main.ts` (or by a test) after migrations ran. */
export interface OpenDatabase {
  readonly prisma: PrismaClient;
  readonly kind: 'postgresql' | 'embedded';
  migrationState(): Promise<{ applied: string[]; pending: string[] }>;
  close(): Promise<void>;
}

export const DATABASE = Symbol('DATABASE');

/** Either the root client or the client of a running transaction: repositories accept both. */
export type Db = PrismaClient | Prisma.TransactionClient;
