import { Inject, Injectable } from '@nestjs/common';
import { DATABASE, type Db, type OpenDatabase } from '../../common/database/database.tokens';
import type { Prisma } from '../../generated/prisma/client';

@Injectable()
export class CircuitsRepository {
  private readonly prisma;

  constructor(@Inject(DATABASE) database: OpenDatabase) {
    this.prisma = database.prisma;
  }

  transaction<T>(work: (tx: Prisma.TransactionClient) => Promise<T>): Promise<T> {
    return this.prisma.$transaction(work);
  }

  create(db: Db, data: Prisma.CircuitUncheckedCreateInput) {
    return db.circuit.create({ data, include: { faultTree: { select: { id: true, treeId: true, version: true } } } });
  }

  listForOrder(repairOrderId: string) {
    return this.prisma.circuit.findMany({
      where: { repairOrderId },
      orderBy: [{ createdAt: 'asc' }, { id: 'asc' }],
      include: { faultTree: { select: { id: true, treeId: true, version: true } } },
    });
  }

  findInOrder(repairOrderId: string, id: string, db: Db = this.prisma) {
    return db.circuit.findFirst({ where: { id, repairOrderId }, include: { faultTree: { select: { id: true, treeId: true, version: true } } } });
  }
}
