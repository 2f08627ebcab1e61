import { Injectable } from '@nestjs/common';
import { isUniqueViolation } from '../../common/database/prisma-errors';
import { ConflictException, DomainException, NotFoundException } from '../../common/errors/domain.exception';
import { orderScope, type Actor } from '../identity/actor';
import { EvidenceService } from '../proofs/evidence.service';
import { RepairOrdersRepository } from '../repair-orders/repair-orders.repository';
import type { RecordReview } from './reviews.dto';
import { ReviewsRepository, type ReviewRow } from './reviews.repository';

export function reviewView(r: ReviewRow) {
  return { id: r.id, decision: r.decision, comment: r.comment, evidenceDigest: r.evidenceDigest || null, by: r.by, at: r.at.toISOString() };
}

/** Statuses in which a foreman's decision makes sense: the repair is done, verified or not. */
const REVIEWABLE = new Set(['repaired', 'verified']);

@Injectable()
export class ReviewsService {
  constructor(
    private readonly reviews: ReviewsRepository,
    private readonly orders: RepairOrdersRepository,
    private readonly evidence: EvidenceService,
  ) {}

  /**
   * Records a decision on the evidence as it is now (its digest is stored with it). Decisions follow one another:
   * each takes the next position on the order, so of two taken at the same moment on the same state, the database
   * keeps the first and the second is answered 409.
   */
  async record(actor: Actor, repairOrderId: string, input: RecordReview) {
    const order = await this.orders.findHeader(orderScope(actor), repairOrderId);
    // Existence before role: someone of another shop gets a 404, never a 403 that confirms the order exists.
    if (!order) throw new NotFoundException('repair_order', repairOrderId);
    if (actor.role === 'technician') {
      throw new DomainException('forbidden', 'review.foreman_only', 'Only a foreman (or an admin) approves or returns a repair.');
    }
    if (!REVIEWABLE.has(order.status)) {
      throw new ConflictException('review.wrong_status', `Repair order ${order.number} is ${order.status}: a foreman reviews it once it is repaired or verified.`, { status: order.status });
    }
    const digest = (await this.evidence.currentDigest(actor, repairOrderId))!;
    if (input.evidenceDigest !== undefined && input.evidenceDigest !== digest) {
      throw new ConflictException(
        'review.evidence_changed',
        `The evidence of ${order.number} changed since you looked at it (a reading, repair or status move): look at it again before deciding.`,
        { evidenceDigest: input.evidenceDigest, currentEvidenceDigest: digest },
      );
    }
    try {
      const row = await this.reviews.transaction(async (tx) => {
        const earlier = await this.reviews.listForOrder(repairOrderId, tx);
        const latest = earlier.at(-1);
        if (input.decision === 'withdrawn' && latest?.decision !== 'approved') {
          throw new ConflictException('review.nothing_to_withdraw', 'There is no standing approval to withdraw.', { latest: latest?.decision ?? null });
        }
        if (input.decision === 'approved' && latest?.decision === 'approved' && latest.evidenceDigest === digest) {
          throw new ConflictException('review.already_approved', `Already approved, on this evidence, by ${latest.by.name} at ${latest.at.toISOString()}.`);
        }
        await this.orders.touch(tx, repairOrderId);
        return this.reviews.create(tx, {
          repairOrderId,
          decision: input.decision,
          comment: input.comment,
          byId: actor.userId,
          position: earlier.length + 1,
          evidenceDigest: digest,
        });
      });
      return reviewView(row);
    } catch (error) {
      if (isUniqueViolation(error, 'position')) {
        throw new ConflictException('review.decided_meanwhile', `Another decision on ${order.number} was recorded at the same moment; reload and decide again if it is still needed.`);
      }
      throw error;
    }
  }

  async list(actor: Actor, repairOrderId: string) {
    const order = await this.orders.findHeader(orderScope(actor), repairOrderId);
    if (!order) throw new NotFoundException('repair_order', repairOrderId);
    const items = (await this.reviews.listForOrder(repairOrderId)).map(reviewView);
    return { items, latest: items.at(-1) ?? null };
  }
}
