import { Inject } from '@nestjs/common';
import type { Prisma, PrismaClient } from '../../generated/prisma/client';
import { currentWriteContext } from '../logging/request-context';
import { DATABASE, type OpenDatabase, type RawSql } from './database.tokens';

/**
 * Base of every repository: the client of the opened database, and transactions whose client the service passes
 * back down (the embedded database has a single connection, so work inside a transaction must use its client).
 */
export abstract class PrismaRepository {
  readonly prisma: PrismaClient;
  /** One statement through the driver itself, for the hot paths (see RawSql). */
  readonly sql: RawSql;

  constructor(@Inject(DATABASE) database: OpenDatabase) {
    this.prisma = database.prisma;
    const prisma = database.prisma;
    this.sql = database.sql ?? (<T>(text: string, params: readonly unknown[]) => prisma.$queryRawUnsafe<T[]>(text, ...params));
  }

  /**
   * Every write goes through here: the transaction first tells the database who writes and from where
   * (transaction-local, read by the audit triggers), and marks the request's idempotency record as committed
   * together with the write itself.
   */
  transaction<T>(work: (tx: Prisma.TransactionClient) => Promise<T>): Promise<T> {
    return this.prisma.$transaction(async (tx) => {
      await stampTransaction(tx);
      return work(tx);
    });
  }
}

/** Who writes and from where, as the audit triggers read it; undefined outside a request (CLI, seeding). */
export function writeStamp(): { context: string; idempotencyId?: string } | undefined {
  const context = currentWriteContext();
  if (!context) return undefined;
  return {
    context: JSON.stringify({
      userId: context.actor?.userId ?? null,
      shopId: context.actor?.shopId ?? null,
      ip: context.client?.ip ?? null,
      userAgent: context.client?.userAgent ?? null,
      requestId: context.requestId,
      clientId: context.client?.clientId ?? null,
    }),
    ...(context.idempotencyId ? { idempotencyId: context.idempotencyId } : {}),
  };
}

async function stampTransaction(tx: Prisma.TransactionClient): Promise<void> {
  const stamp = writeStamp();
  if (!stamp) return;
  await tx.$queryRaw`SELECT set_config('tracebay.context', ${stamp.context}, true)`;
  if (stamp.idempotencyId) {
    await tx.$executeRaw`UPDATE "IdempotencyKey" SET "committedAt" = CURRENT_TIMESTAMP WHERE "id" = ${stamp.idempotencyId}::uuid AND "committedAt" IS NULL`;
  }
}
