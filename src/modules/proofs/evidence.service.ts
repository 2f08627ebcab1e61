/**
 * The evidence behind a proof of repair, as of now: the proof's view, its evidence digest, where the foreman's
 * approval stands against it, and which deciding readings a repair still has to show healthy.
 */
import { Injectable } from '@nestjs/common';
import { ConflictException, NotFoundException } from '../../common/errors/domain.exception';
import { codeMayConcern, codeRow } from '../../engine/codes';
import { retestsStillNeeded, type Retest } from '../../engine/diagnosis';
import { evidenceDigest, type ProofView } from '../../proof-render';
import { DiagnosisService, engineReading } from '../diagnosis/diagnosis.service';
import { orderScope, type Actor } from '../identity/actor';
import { RepairOrdersRepository } from '../repair-orders/repair-orders.repository';
import { RepairsRepository } from '../repairs/repairs.repository';
import { ReviewsRepository } from '../reviews/reviews.repository';
import { ShopSettingsService } from '../shop-settings/shop-settings.service';
import { buildProofView } from './proof-view.builder';
import type { RecordCodesAfter } from './evidence.dto';
import { toDetailView } from '../repair-orders/repair-orders.view';

/** A proof exists once the repair is done: before that there is nothing to prove. */
const PROVABLE = new Set(['repaired', 'verified', 'closed']);

export type ApprovalState = 'none' | 'approved' | 'stale' | 'returned' | 'withdrawn';

/** A code read after the repair that may concern a repaired circuit: the fault may not be fixed. */
export interface ReturnedCode {
  code: string;
  meaning: string;
  circuitId: string;
  circuit: string;
}

export interface RetestOfCircuit extends Retest {
  circuitId: string;
  circuit: string;
}

@Injectable()
export class EvidenceService {
  constructor(
    private readonly orders: RepairOrdersRepository,
    private readonly repairs: RepairsRepository,
    private readonly reviews: ReviewsRepository,
    private readonly diagnosis: DiagnosisService,
    private readonly shops: ShopSettingsService,
  ) {}

  /** Everything the proof of a repair order states, as of now. */
  async view(actor: Actor, repairOrderId: string): Promise<ProofView> {
    const order = await this.orders.find(orderScope(actor), repairOrderId);
    if (!order) throw new NotFoundException('repair_order', repairOrderId);
    if (!PROVABLE.has(order.status)) {
      throw new ConflictException('proof.not_yet', `Repair order ${order.number} is ${order.status}: the proof of repair exists once the repair is recorded (status repaired or later).`, {
        status: order.status,
      });
    }
    const [shop, repairs, reviews, circuits] = await Promise.all([
      this.shops.of(actor.shopId),
      this.repairs.listForOrder(repairOrderId),
      this.reviews.listForOrder(repairOrderId),
      Promise.all(
        order.circuits.map(async (c) => {
          const { tree, diagnosis, readings } = await this.diagnosis.ofCircuit(actor, repairOrderId, c, { asDiagnosed: true });
          return { id: c.id, label: c.label, kind: c.kind, tree, diagnosis, readings };
        }),
      ),
    ]);
    return buildProofView({ shop, order, circuits, repairs, reviews });
  }

  /** The evidence digest now, or null while the order has no proof (before the repair). */
  async currentDigest(actor: Actor, repairOrderId: string): Promise<string | null> {
    try {
      return evidenceDigest(await this.view(actor, repairOrderId));
    } catch (error) {
      if (error instanceof ConflictException && error.code === 'proof.not_yet') return null;
      throw error;
    }
  }

  /** Where the foreman's decision stands: an approval is current only while the evidence is what it approved. */
  async approval(actor: Actor, repairOrderId: string) {
    const order = await this.orders.findHeader(orderScope(actor), repairOrderId);
    if (!order) throw new NotFoundException('repair_order', repairOrderId);
    const latest = (await this.reviews.listForOrder(repairOrderId)).at(-1);
    const current = await this.currentDigest(actor, repairOrderId);
    const state: ApprovalState = !latest
      ? 'none'
      : latest.decision !== 'approved'
        ? latest.decision
        : latest.evidenceDigest !== '' && latest.evidenceDigest === current
          ? 'approved'
          : 'stale';
    return {
      state,
      decision: latest ? { id: latest.id, decision: latest.decision, by: latest.by, at: latest.at.toISOString(), comment: latest.comment } : null,
      evidenceDigest: latest?.evidenceDigest || null,
      currentEvidenceDigest: current,
    };
  }

  /** The codes after the repair and how they were read; only once the repair is recorded, never on a closed order. */
  async recordCodesAfter(actor: Actor, repairOrderId: string, input: RecordCodesAfter) {
    await this.orders.transaction(async (tx) => {
      const order = await this.orders.findHeader(orderScope(actor), repairOrderId, tx);
      if (!order) throw new NotFoundException('repair_order', repairOrderId);
      if (order.status !== 'repaired' && order.status !== 'verified') {
        throw new ConflictException('codes_after.wrong_status', `Repair order ${order.number} is ${order.status}: codes after the repair are recorded once it is repaired, before it closes.`, { status: order.status });
      }
      const changed = await this.orders.updateAtVersion(tx, repairOrderId, input.version, {
        codesAfter: input.codes,
        codesAfterMethod: input.method,
        codesAfterKeyCycles: input.keyCycles ?? null,
        codesAfterNote: input.note,
        codesAfterCheckedAt: input.checkedAt ? new Date(input.checkedAt) : new Date(),
      });
      if (changed !== 1) {
        throw new ConflictException('repair_order.stale_version', `This repair order changed since you read it (you sent version ${input.version}, it is now at ${order.version}); reload and record again.`, { currentVersion: order.version });
      }
    });
    const order = await this.orders.find(orderScope(actor), repairOrderId);
    return toDetailView(order!);
  }

  /** Codes read after the repair that may concern a circuit a repair was on (a repair on no circuit is on them all). */
  async codesReturned(actor: Actor, repairOrderId: string): Promise<ReturnedCode[]> {
    const order = await this.orders.find(orderScope(actor), repairOrderId);
    if (!order) throw new NotFoundException('repair_order', repairOrderId);
    if (order.codesAfter.length === 0) return [];
    const repairs = await this.repairs.listForOrder(repairOrderId);
    const repaired = order.circuits.filter((c) => repairs.some((r) => r.circuitId === null || r.circuitId === c.id));
    return order.codesAfter.flatMap((code) => {
      const row = codeRow(code);
      if (!row) return [];
      return repaired.filter((c) => codeMayConcern(row, c.sensor, c.kind)).map((c) => ({ code, meaning: row.meaning, circuitId: c.id, circuit: c.label }));
    });
  }

  /** Per repaired circuit, the deciding readings still to take again (or still reading the fault) since its repair. */
  async retests(actor: Actor, repairOrderId: string): Promise<RetestOfCircuit[]> {
    const order = await this.orders.find(orderScope(actor), repairOrderId);
    if (!order) throw new NotFoundException('repair_order', repairOrderId);
    const repairs = await this.repairs.listForOrder(repairOrderId);
    const out: RetestOfCircuit[] = [];
    for (const circuit of order.circuits) {
      // A repair not on one circuit concerns them all.
      const last = repairs.filter((r) => r.circuitId === null || r.circuitId === circuit.id).at(-1);
      if (!last) continue;
      const { tree, diagnosis, readings } = await this.diagnosis.ofCircuit(actor, repairOrderId, circuit, { asDiagnosed: true });
      for (const r of retestsStillNeeded(tree, diagnosis, readings.map(engineReading), last.at.toISOString())) out.push({ ...r, circuitId: circuit.id, circuit: circuit.label });
    }
    return out;
  }
}
