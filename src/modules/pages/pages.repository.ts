import { Inject, Injectable } from '@nestjs/common';
import { DATABASE, type OpenDatabase } from '../../common/database/database.tokens';
import type { Prisma } from '../../generated/prisma/client';

const OPEN_STATUSES = ['open', 'diagnosing', 'repaired', 'verified'] as const;

const boardSelect = {
  id: true,
  number: true,
  status: true,
  complaint: true,
  codes: true,
  createdAt: true,
  updatedAt: true,
  vehicle: { select: { year: true, make: true, model: true, vin: true } },
  technician: { select: { id: true, name: true } },
  circuits: { select: { id: true, label: true, sensor: true, kind: true, faultTreeId: true }, orderBy: [{ createdAt: 'asc' }, { id: 'asc' }] },
} satisfies Prisma.RepairOrderSelect;

export type BoardOrderRow = Prisma.RepairOrderGetPayload<{ select: typeof boardSelect }>;

/** Read-only queries the pages need beyond what the feature services answer (the picker and the board). */
@Injectable()
export class PagesRepository {
  private readonly db;

  constructor(@Inject(DATABASE) database: OpenDatabase) {
    this.db = database.prisma;
  }

  /** The shop's vehicle with this VIN, if it has one (the new-order page points out a different model year). */
  vehicleByVin(shopId: string, vin: string) {
    return this.db.vehicle.findUnique({ where: { shopId_vin: { shopId, vin } }, select: { year: true, make: true, model: true } });
  }

  technicians(shopId: string) {
    return this.db.user.findMany({ where: { shopId, active: true, role: 'technician' }, orderBy: { name: 'asc' }, select: { id: true, name: true } });
  }

  /** Repair orders not yet closed, oldest first, optionally for one technician and opened before a date. */
  openOrders(shopId: string, filter: { technicianId?: string; openedBefore?: Date; id?: string }): Promise<BoardOrderRow[]> {
    return this.db.repairOrder.findMany({
      where: {
        shopId,
        status: { in: [...OPEN_STATUSES] },
        ...(filter.id ? { id: filter.id } : {}),
        ...(filter.technicianId ? { technicianId: filter.technicianId } : {}),
        ...(filter.openedBefore ? { createdAt: { lt: filter.openedBefore } } : {}),
      },
      select: boardSelect,
      orderBy: [{ createdAt: 'asc' }, { id: 'asc' }],
      take: 200,
    });
  }

  /** Time of the newest reading per repair order. */
  async lastReadingAt(orderIds: string[]): Promise<Map<string, Date>> {
    if (orderIds.length === 0) return new Map();
    const rows = await this.db.measurement.groupBy({ by: ['repairOrderId'], where: { repairOrderId: { in: orderIds } }, _max: { takenAt: true } });
    return new Map(rows.flatMap((r) => (r._max.takenAt ? [[r.repairOrderId, r._max.takenAt] as const] : [])));
  }

  /** The latest foreman decision per repair order. */
  async latestReviews(orderIds: string[]): Promise<Map<string, { decision: string; comment: string; at: Date; by: string }>> {
    if (orderIds.length === 0) return new Map();
    const rows = await this.db.review.findMany({
      where: { repairOrderId: { in: orderIds } },
      orderBy: [{ at: 'asc' }, { seq: 'asc' }],
      select: { repairOrderId: true, decision: true, comment: true, at: true, by: { select: { name: true } } },
    });
    return new Map(rows.map((r) => [r.repairOrderId, { decision: r.decision, comment: r.comment, at: r.at, by: r.by.name }]));
  }
}
