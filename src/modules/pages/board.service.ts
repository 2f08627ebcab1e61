import { Injectable } from '@nestjs/common';
import type { Diagnosis } from '../../engine/diagnosis';
import { DiagnosisService } from '../diagnosis/diagnosis.service';
import { EvidenceService } from '../proofs/evidence.service';
import type { Actor } from '../identity/actor';
import { PagesRepository, type BoardOrderRow } from './pages.repository';

/**
 * Shop policy for the board, not published figures: how long without a reading counts as stalled, and how many
 * counted tests without a cause above the bar count as "still unsure".
 */
export const BOARD_POLICY = { silentHours: 4, unsureAfterTests: 4, unsureBelow: 0.6 } as const;

export type FlagCode = 'approval' | 'stale' | 'close' | 'unassigned' | 'contradiction' | 'silent' | 'unsure' | 'between' | 'returned';

export interface Flag {
  code: FlagCode;
  text: string;
  /** Higher first on the board. */
  weight: number;
}

export interface BoardCircuit {
  id: string;
  label: string;
  status: Diagnosis['status'];
  leading: { label: string; probability: number } | null;
  counted: number;
}

export interface BoardItem {
  order: BoardOrderRow;
  lastReadingAt: Date | null;
  review: { decision: string; comment: string; at: Date; by: string } | null;
  /** For an approval: whether it still covers the evidence as it is now. */
  approvalState?: 'approved' | 'stale';
  circuits: BoardCircuit[];
  flags: Flag[];
  weight: number;
}

export interface BoardFilter {
  /** One repair order only (its review page). */
  orderId?: string;
  technicianId?: string;
  minAgeDays?: number;
}

export const AGE_CHOICES = [
  { days: 0, label: 'Any age' },
  { days: 1, label: 'Open more than a day' },
  { days: 3, label: 'Open more than 3 days' },
  { days: 7, label: 'Open more than a week' },
] as const;

/** What needs the foreman's attention, from each order's state, readings, reviews and diagnosis. */
export function flagsFor(item: Omit<BoardItem, 'flags' | 'weight'>, diagnoses: Diagnosis[], now: number): Flag[] {
  const flags: Flag[] = [];
  const { order, review } = item;
  const stale = review?.decision === 'approved' && item.approvalState === 'stale';
  if (stale) flags.push({ code: 'stale', text: 'Approval stale: the evidence changed since; approve again', weight: 32 });
  else if (order.status === 'verified' && review?.decision !== 'approved') flags.push({ code: 'approval', text: 'Waiting for your approval', weight: 30 });
  if (order.status === 'verified' && review?.decision === 'approved' && !stale) flags.push({ code: 'close', text: 'Approved: ready to close', weight: 22 });
  if (!order.technician && order.status !== 'closed') flags.push({ code: 'unassigned', text: 'No technician assigned: give it to someone', weight: 28 });
  if (diagnoses.some((d) => d.findings.some((f) => f.code.startsWith('diagnosis.contradiction')))) {
    flags.push({ code: 'contradiction', text: 'Readings contradict each other', weight: 25 });
  }
  if (order.status === 'open' || order.status === 'diagnosing') {
    const since = item.lastReadingAt ?? order.createdAt;
    const hours = (now - since.getTime()) / 3_600_000;
    if (hours >= BOARD_POLICY.silentHours) {
      const span = hours >= 48 ? `${Math.round(hours / 24)} days` : `${Math.round(hours)} h`;
      flags.push({ code: 'silent', text: item.lastReadingAt ? `No reading for ${span}` : `No reading yet, opened ${span} ago`, weight: 20 });
    }
  }
  const unsure = item.circuits.find((c) => c.counted >= BOARD_POLICY.unsureAfterTests && c.status !== 'concluded' && (c.leading?.probability ?? 0) < BOARD_POLICY.unsureBelow);
  if (unsure) flags.push({ code: 'unsure', text: `Still unsure after ${unsure.counted} tests`, weight: 15 });
  if (diagnoses.some((d) => d.findings.some((f) => f.code === 'diagnosis.reading_indeterminate'))) {
    flags.push({ code: 'between', text: 'A reading fell between outcomes', weight: 10 });
  }
  if (review?.decision === 'returned' && order.status !== 'verified') flags.push({ code: 'returned', text: 'Returned, with the technician', weight: 5 });
  return flags.sort((a, b) => b.weight - a.weight);
}

@Injectable()
export class BoardService {
  constructor(
    private readonly pages: PagesRepository,
    private readonly diagnoses: DiagnosisService,
    private readonly evidence: EvidenceService,
  ) {}

  technicians(actor: Actor) {
    return this.pages.technicians(actor.shopId);
  }

  async list(actor: Actor, filter: BoardFilter, now = Date.now()): Promise<BoardItem[]> {
    const openedBefore = filter.minAgeDays ? new Date(now - filter.minAgeDays * 86_400_000) : undefined;
    const orders = await this.pages.openOrders(actor.shopId, { technicianId: filter.technicianId, openedBefore, id: filter.orderId });
    const ids = orders.map((o) => o.id);
    const [last, reviews] = await Promise.all([this.pages.lastReadingAt(ids), this.pages.latestReviews(ids)]);
    const items: BoardItem[] = [];
    // One at a time: a circuit seeded without a stored tree binds one on first diagnosis, and two binds at once collide.
    for (const order of orders) {
      const diagnoses: Diagnosis[] = [];
      // Once repaired, the cause found before the repair is what the board shows (the live one restarts for the part).
      const asDiagnosed = order.status === 'repaired' || order.status === 'verified';
      for (const c of order.circuits) diagnoses.push((await this.diagnoses.ofCircuit(actor, order.id, c, { asDiagnosed })).diagnosis);
      const circuits = order.circuits.map((c, i) => {
        const d = diagnoses[i]!;
        return {
          id: c.id,
          label: c.label,
          status: d.status,
          leading: d.ranked[0] ? { label: d.ranked[0].label, probability: d.ranked[0].probability } : null,
          counted: d.path.filter((p) => p.verdict === 'counted').length,
        };
      });
      const review = reviews.get(order.id) ?? null;
      const approvalState = review?.decision === 'approved' ? ((await this.evidence.approval(actor, order.id)).state === 'approved' ? ('approved' as const) : ('stale' as const)) : undefined;
      const base = { order, lastReadingAt: last.get(order.id) ?? null, review, ...(approvalState ? { approvalState } : {}), circuits };
      const flags = flagsFor(base, diagnoses, now);
      items.push({ ...base, flags, weight: flags.reduce((sum, f) => sum + f.weight, 0) });
    }
    // Most attention first; among equals, the longest open first.
    return items.sort((a, b) => b.weight - a.weight || a.order.createdAt.getTime() - b.order.createdAt.getTime());
  }
}
