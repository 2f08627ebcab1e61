/**
 * What "verified" and "closed" rest on: a repair counts as verified once no code read after it concerns a repaired
 * circuit and every reading that decided the cause has been taken again since the repair and reads where the healthy
 * circuit does; an order closes only with the
 * foreman's approval of the evidence as it is now.
 */
import { Injectable, type OnModuleInit } from '@nestjs/common';
import { ConflictException } from '../../common/errors/domain.exception';
import type { RepairOrderStatus } from '../../generated/prisma/client';
import type { Actor } from '../identity/actor';
import { StatusGates, type GatedOrder } from '../repair-orders/status-gates';
import { EvidenceService } from './evidence.service';

@Injectable()
export class ProofGates implements OnModuleInit {
  constructor(
    private readonly gates: StatusGates,
    private readonly evidence: EvidenceService,
  ) {}

  onModuleInit(): void {
    this.gates.register((actor, order, to) => this.check(actor, order, to));
  }

  private async check(actor: Actor, order: GatedOrder, to: RepairOrderStatus): Promise<void> {
    if (order.status === 'repaired' && to === 'verified') await this.requireRetests(actor, order);
    if (order.status === 'verified' && to === 'closed') await this.requireCurrentApproval(actor, order);
  }

  private async requireRetests(actor: Actor, order: GatedOrder): Promise<void> {
    const returned = await this.evidence.codesReturned(actor, order.id);
    if (returned.length > 0) {
      const words = returned.map((r) => `${r.code} (${r.circuit})`);
      throw new ConflictException(
        'status.codes_returned',
        `${order.number} cannot be verified: a code read after the repair concerns a repaired circuit: ${words.join(', ')}. Diagnose again, repair, then clear and read the codes again.`,
        { codesReturned: returned },
      );
    }
    const missing = await this.evidence.retests(actor, order.id);
    if (missing.length === 0) return;
    const words = missing.map((m) => `${m.circuit}: ${m.test} (${m.state === 'not_measured' ? 'not taken since the repair' : 'still outside the healthy range'})`);
    throw new ConflictException(
      'status.verification_incomplete',
      `${order.number} is verified once every reading that decided the cause is taken again and reads healthy; still to measure: ${words.join('; ')}.`,
      {
        toMeasure: missing.map((m) => ({
          circuitId: m.circuitId,
          readingId: m.readingId,
          testId: m.testId,
          test: m.test,
          request: m.request,
          state: m.state,
          healthy: m.healthy && { min: m.healthy.min, max: m.healthy.max, unit: m.healthy.unit, label: m.healthy.label },
        })),
      },
    );
  }

  private async requireCurrentApproval(actor: Actor, order: GatedOrder): Promise<void> {
    const approval = await this.evidence.approval(actor, order.id);
    if (approval.state === 'approved') return;
    if (approval.state === 'stale') {
      throw new ConflictException(
        'status.approval_stale',
        `${order.number} was approved on evidence that has changed since (a reading, repair or status move came after it): a foreman approves the evidence as it is now before it closes.`,
        { evidenceDigest: approval.evidenceDigest, currentEvidenceDigest: approval.currentEvidenceDigest },
      );
    }
    throw new ConflictException(
      'status.not_approved',
      `${order.number} can be closed once a foreman has approved the repair (latest decision: ${approval.decision?.decision ?? 'none'}).`,
      { latestDecision: approval.decision?.decision ?? null, currentEvidenceDigest: approval.currentEvidenceDigest },
    );
  }
}
