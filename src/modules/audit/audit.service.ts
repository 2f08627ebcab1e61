import { Injectable } from '@nestjs/common';
import { NotFoundException } from '../../common/errors/domain.exception';
import { orderScope, type Actor } from '../identity/actor';
import type { ListAuditEvents } from './audit.dto';
import { RepairOrdersRepository } from '../repair-orders/repair-orders.repository';
import { AuditRepository } from './audit.repository';

@Injectable()
export class AuditService {
  constructor(
    private readonly audit: AuditRepository,
    private readonly orders: RepairOrdersRepository,
  ) {}

  /** The trail of one repair order of the caller's shop, oldest first; another shop's order is a 404. */
  async forRepairOrder(actor: Actor, repairOrderId: string, query: ListAuditEvents) {
    if (!(await this.orders.findHeader(orderScope(actor), repairOrderId))) throw new NotFoundException('repair_order', repairOrderId);
    const { rows, total } = await this.audit.forRepairOrder(actor.shopId, repairOrderId, query.page, query.pageSize);
    const userIds = [...new Set(rows.map((r) => r.userId).filter((id): id is string => id !== null))];
    const names = new Map((await this.audit.userNames(userIds)).map((u) => [u.id, u.name]));
    return {
      items: rows.map((r) => ({
        id: r.id.toString(),
        at: r.at.toISOString(),
        action: r.action,
        entity: { type: r.entityType, id: r.entityId },
        by: r.userId ? { id: r.userId, name: names.get(r.userId) ?? null } : null,
        client: { ip: r.ip, userAgent: r.userAgent, requestId: r.requestId, clientId: r.clientId },
        row: r.row,
        changes: r.changes ?? null,
      })),
      page: query.page,
      pageSize: query.pageSize,
      total,
    };
  }
}
