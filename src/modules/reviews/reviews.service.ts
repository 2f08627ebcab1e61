import { Injectable } from '@nestjs/common';
import { ConflictException, DomainException, NotFoundException } from '../../common/errors/domain.exception';
import { orderScope, type Actor } from '../identity/actor';
import { RepairOrdersRepository } from '../repair-orders/repair-orders.repository';
import type { RecordReview } from './reviews.dto';
import { ReviewsRepository, type ReviewRow } from './reviews.repository';

export function reviewView(r: ReviewRow) {
  return { id: r.id, decision: r.decision, comment: r.comment, by: r.by, at: r.at.toISOString() };
}

/** Statuses in which a foreman's decision makes sense: the repair is done, verified or not. */
const REVIEWABLE = new Set(['repaired', 'verified']);

@Injectable()
export class ReviewsService {
  constructor(
    private readonly reviews: ReviewsRepository,
    private readonly orders: RepairOrdersRepository,
  ) {}

  async record(actor: Actor, repairOrderId: string, input: RecordReview) {
    const row = await this.reviews.transaction(async (tx) => {
      const order = await this.orders.findHeader(orderScope(actor), repairOrderId, tx);
      // Existence before role: someone of another shop gets a 404, never a 403 that confirms the order exists.
      if (!order) throw new NotFoundException('repair_order', repairOrderId);
      if (actor.role === 'technician') {
        throw new DomainException('forbidden', 'review.foreman_only', 'Only a foreman (or an admin) approves or returns a repair.');
      }
      if (!REVIEWABLE.has(order.status)) {
        throw new ConflictException(
          'review.wrong_status',
          `Repair order ${order.number} is ${order.status}: a foreman reviews it once it is repaired or verified.`,
          { status: order.status },
        );
      }
      const latest = (await this.reviews.listForOrder(repairOrderId, tx)).at(-1);
      if (input.decision === 'withdrawn' && latest?.decision !== 'approved') {
        throw new ConflictException('review.nothing_to_withdraw', 'There is no standing approval to withdraw.', { latest: latest?.decision ?? null });
      }
      if (input.decision === 'approved' && latest?.decision === 'approved') {
        throw new ConflictException('review.already_approved', `Already approved by ${latest.by.name} at ${latest.at.toISOString()}.`);
      }
      await this.orders.touch(tx, repairOrderId);
      return this.reviews.create(tx, { repairOrderId, decision: input.decision, comment: input.comment, byId: actor.userId });
    });
    return reviewView(row);
  }

  async list(actor: Actor, repairOrderId: string) {
    const order = await this.orders.findHeader(orderScope(actor), repairOrderId);
    if (!order) throw new NotFoundException('repair_order', repairOrderId);
    const items = (await this.reviews.listForOrder(repairOrderId)).map(reviewView);
    return { items, latest: items.at(-1) ?? null };
  }
}
