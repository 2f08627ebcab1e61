import { Injectable } from '@nestjs/common';
import type { Db } from '../../common/database/database.tokens';
import { PrismaRepository } from '../../common/database/prisma-repository';
import type { Prisma } from '../../generated/prisma/client';

const SHOWN = { id: true, repairOrderId: true, circuitIds: true, source: true, note: true, createdAt: true, createdBy: { select: { id: true, name: true } } } satisfies Prisma.ReferenceGroupSelect;
export type ReferenceGroupRow = Prisma.ReferenceGroupGetPayload<{ select: typeof SHOWN }>;

@Injectable()
export class ReferenceGroupsRepository extends PrismaRepository {
  /** The groups of an order not cleared, oldest first. */
  listActive(repairOrderId: string, db: Db = this.prisma): Promise<ReferenceGroupRow[]> {
    return db.referenceGroup.findMany({ where: { repairOrderId, clearedAt: null }, orderBy: [{ createdAt: 'asc' }, { id: 'asc' }], select: SHOWN });
  }

  create(db: Db, data: Prisma.ReferenceGroupUncheckedCreateInput): Promise<ReferenceGroupRow> {
    return db.referenceGroup.create({ data, select: SHOWN });
  }

  /** What the order-wide diagnosis reads besides readings and repairs: the order's codes, circuits and groups. */
  orderContext(repairOrderId: string, db: Db = this.prisma) {
    return db.repairOrder.findUnique({
      where: { id: repairOrderId },
      select: {
        codes: true,
        vehicle: { select: { highVoltageSystem: true } },
        circuits: { select: { id: true, label: true, sensor: true, kind: true, faultTreeId: true }, orderBy: [{ createdAt: 'asc' }, { id: 'asc' }] },
        referenceGroups: { where: { clearedAt: null }, orderBy: [{ createdAt: 'asc' }, { id: 'asc' }], select: SHOWN },
      },
    });
  }

  /** Clears a group still active on the order; false when there is none by that id. */
  async clear(db: Db, repairOrderId: string, id: string, byId: string): Promise<boolean> {
    const { count } = await db.referenceGroup.updateMany({ where: { id, repairOrderId, clearedAt: null }, data: { clearedAt: new Date(), clearedById: byId } });
    return count === 1;
  }
}
