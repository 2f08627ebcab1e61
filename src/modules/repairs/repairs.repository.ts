import { Injectable } from '@nestjs/common';
import type { Db } from '../../common/database/database.tokens';
import { PrismaRepository } from '../../common/database/prisma-repository';
import type { Prisma } from '../../generated/prisma/client';

const include = { by: { select: { id: true, name: true } } } satisfies Prisma.RepairInclude;
export type RepairRow = Prisma.RepairGetPayload<{ include: typeof include }>;

@Injectable()
export class RepairsRepository extends PrismaRepository {
  create(db: Db, data: Prisma.RepairUncheckedCreateInput): Promise<RepairRow> {
    return db.repair.create({ data, include });
  }

  listForOrder(repairOrderId: string, db: Db = this.prisma): Promise<RepairRow[]> {
    return db.repair.findMany({ where: { repairOrderId }, include, orderBy: [{ at: 'asc' }, { seq: 'asc' }] });
  }
}
