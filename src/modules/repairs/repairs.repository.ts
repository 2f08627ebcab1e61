import { Inject, Injectable } from '@nestjs/common';
import { DATABASE, type Db, type OpenDatabase } from '../../common/database/database.tokens';
import type { Prisma } from '../../generated/prisma/client';

const include = { by: { select: { id: true, name: true } } } satisfies Prisma.RepairInclude;
export type RepairRow = Prisma.RepairGetPayload<{ include: typeof include }>;

@Injectable()
export class RepairsRepository {
  readonly prisma;

  constructor(@Inject(DATABASE) database: OpenDatabase) {
    this.prisma = database.prisma;
  }

  transaction<T>(work: (tx: Prisma.TransactionClient) => Promise<T>): Promise<T> {
    return this.prisma.$transaction(work);
  }

  create(db: Db, data: Prisma.RepairUncheckedCreateInput): Promise<RepairRow> {
    return db.repair.create({ data, include });
  }

  listForOrder(repairOrderId: string, db: Db = this.prisma): Promise<RepairRow[]> {
    return db.repair.findMany({ where: { repairOrderId }, include, orderBy: [{ at: 'asc' }, { seq: 'asc' }] });
  }
}
