import { Injectable } from '@nestjs/common';
import { PrismaRepository } from '../../common/database/prisma-repository';

/** Reads the trail; nothing here writes it (database triggers do, on every table of evidence). */
@Injectable()
export class AuditRepository extends PrismaRepository {
  async forRepairOrder(shopId: string, repairOrderId: string, page: number, pageSize: number) {
    const where = { repairOrderId, shopId };
    const [rows, total] = await Promise.all([
      this.prisma.auditEvent.findMany({ where, orderBy: { id: 'asc' }, skip: (page - 1) * pageSize, take: pageSize }),
      this.prisma.auditEvent.count({ where }),
    ]);
    return { rows, total };
  }

  /** Names of the users that appear in a page of events (the trail keeps plain ids). */
  userNames(ids: string[]) {
    return this.prisma.user.findMany({ where: { id: { in: ids } }, select: { id: true, name: true } });
  }
}
