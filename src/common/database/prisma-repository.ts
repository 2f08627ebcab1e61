import { Inject } from '@nestjs/common';
import type { Prisma, PrismaClient } from '../../generated/prisma/client';
import { DATABASE, type OpenDatabase } from './database.tokens';

/**
 * Base of every repository: the client of the opened database, and transactions whose client the service passes
 * back down (the embedded database has a single connection, so work inside a transaction must use its client).
 */
export abstract class PrismaRepository {
  readonly prisma: PrismaClient;

  constructor(@Inject(DATABASE) database: OpenDatabase) {
    this.prisma = database.prisma;
  }

  transaction<T>(work: (tx: Prisma.TransactionClient) => Promise<T>): Promise<T> {
    return this.prisma.$transaction(work);
  }
}
