import { Injectable } from '@nestjs/common';
import type { Db } from '../../common/database/database.tokens';
import { PrismaRepository } from '../../common/database/prisma-repository';
import type { Prisma } from '../../generated/prisma/client';

/** The tree version a circuit follows, with each circuit read. */
const withTree = { faultTree: { select: { id: true, treeId: true, version: true } } } satisfies Prisma.CircuitInclude;

@Injectable()
export class CircuitsRepository extends PrismaRepository {
  create(db: Db, data: Prisma.CircuitUncheckedCreateInput) {
    return db.circuit.create({ data, include: withTree });
  }

  listForOrder(repairOrderId: string) {
    return this.prisma.circuit.findMany({
      where: { repairOrderId },
      orderBy: [{ createdAt: 'asc' }, { id: 'asc' }],
      include: withTree,
    });
  }

  findInOrder(repairOrderId: string, id: string, db: Db = this.prisma) {
    return db.circuit.findFirst({ where: { id, repairOrderId }, include: withTree });
  }
}
