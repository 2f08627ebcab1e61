import { Inject, Injectable } from '@nestjs/common';
import { DATABASE, type Db, type OpenDatabase } from '../../common/database/database.tokens';
import type { Prisma } from '../../generated/prisma/client';

@Injectable()
export class CircuitsRepository {
  private readonly prisma;

  constructor(@Inject(DATABASE) database: OpenDatabase) {
    this.prisma = database.prisma;
  }

  create(data: Prisma.CircuitUncheckedCreateInput) {
    return this.prisma.circuit.create({ data });
  }

  listForOrder(repairOrderId: string) {
    return this.prisma.circuit.findMany({ where: { repairOrderId }, orderBy: [{ createdAt: 'asc' }, { id: 'asc' }] });
  }

  findInOrder(repairOrderId: string, id: string, db: Db = this.prisma) {
    return db.circuit.findFirst({ where: { id, repairOrderId } });
  }
}
