import { Injectable } from '@nestjs/common';
import type { Db } from '../../common/database/database.tokens';
import { PrismaRepository } from '../../common/database/prisma-repository';
import type { Prisma } from '../../generated/prisma/client';

@Injectable()
export class CircuitsRepository extends PrismaRepository {
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
