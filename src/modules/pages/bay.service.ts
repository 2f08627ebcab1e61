import { Injectable } from '@nestjs/common';
import { NotFoundException } from '../../common/errors/domain.exception';
import { requestKey, type Caution, type Diagnosis, type ScanConditions, type Tree, type WorkContext } from '../../engine/diagnosis';
import type { MeasurementRequest } from '../../engine/vocabulary';
import { DiagnosisService } from '../diagnosis/diagnosis.service';
import { OrderDiagnosisService } from '../diagnosis/order-diagnosis.service';
import { diagnosisView } from '../diagnosis/diagnosis.view';
import type { Actor } from '../identity/actor';
import type { MeasurementRow } from '../measurements/measurements.repository';
import { requestOf } from '../measurements/measurements.view';
import type { ListRepairOrders } from '../repair-orders/repair-orders.dto';
import { RepairOrdersService } from '../repair-orders/repair-orders.service';
import { RepairsService } from '../repairs/repairs.service';
import { ReviewsService } from '../reviews/reviews.service';
import { formatEntered, requestLine, when } from './words';

export type OrderDetail = Awaited<ReturnType<RepairOrdersService['get']>>;
export type OrderSummary = Awaited<ReturnType<RepairOrdersService['list']>>['items'][number];
export type RepairItem = Awaited<ReturnType<RepairsService['list']>>['items'][number];
export type ReviewList = Awaited<ReturnType<ReviewsService['list']>>;
export type CircuitItem = Omit<OrderDetail['circuits'][number], 'cavities'> & { cavities: Record<string, string> };

export interface CircuitDiagnosis {
  circuit: CircuitItem;
  diagnosis: Diagnosis & { tree: { id: string; version: string; title: string } };
  readings: MeasurementRow[];
  /**
   * The diagnosis as it stood before the repair (diagnosis readings only, no repairs), as the proof states it: after
   * a repair the live diagnosis sets the readings on the repaired part aside, but the review needs the cause that was
   * found. Null before any repair on this circuit.
   */
  atRepair: Diagnosis | null;
  /** Diagnosis readings to take again after the repair, each with its latest verification reading if any. */
  verification: VerificationItem[];
  /** How to take each reading the tree knows, by request key (for corrections and verification). */
  howTo: Map<string, HowTo>;
  /** The sensor and vehicle, for the cautions they add to every test (fuel vapour, high voltage). */
  context: WorkContext;
}

export interface HowTo {
  label: string;
  procedure: string[];
  preconditions: string[];
  cautions: Caution[];
}

export interface VerificationItem {
  index: number;
  key: string;
  label: string;
  request: MeasurementRequest;
  before: MeasurementRow;
  after: MeasurementRow | null;
}

/** What a reading entry on the test screen is for. */
export interface Entry {
  mode: 'next' | 'recheck' | 'correct' | 'verify';
  title: string;
  request: MeasurementRequest;
  phase: 'diagnosis' | 'verification';
  supersedes?: string;
  /** verify mode: which verification item. */
  index?: number;
  /** correct mode: the reading on record, as shown ("4.87 V, Tech One, 2026-12-03 09:12"). */
  was?: string;
}

const OPEN: NonNullable<ListRepairOrders['status']> = ['open', 'diagnosing', 'repaired', 'verified'];

export type OrderOverview = Awaited<ReturnType<OrderDiagnosisService['forOrder']>>;

/** Gathers what the technician's pages show, from the same services the API uses. */
@Injectable()
export class BayService {
  constructor(
    private readonly orders: RepairOrdersService,
    private readonly diagnoses: DiagnosisService,
    private readonly orderDiagnoses: OrderDiagnosisService,
    private readonly repairs: RepairsService,
    private readonly reviews: ReviewsService,
  ) {}

  async home(actor: Actor) {
    const query = (technicianId?: string): ListRepairOrders => ({ status: OPEN, technicianId, page: 1, pageSize: 100 });
    const [mine, all] = await Promise.all([this.orders.list(actor, query(actor.userId)), this.orders.list(actor, query())]);
    const mineIds = new Set(mine.items.map((o) => o.id));
    return { mine: mine.items as OrderSummary[], others: (all.items as OrderSummary[]).filter((o) => !mineIds.has(o.id)) };
  }

  /** The repair order alone (vehicle, status, circuits), without diagnosing its circuits. */
  header(actor: Actor, id: string): Promise<OrderDetail> {
    return this.orders.get(actor, id);
  }

  async order(actor: Actor, id: string) {
    const order = await this.orders.get(actor, id);
    const [repairs, reviews] = await Promise.all([this.repairs.list(actor, id), this.reviews.list(actor, id)]);
    const circuits: CircuitDiagnosis[] = [];
    for (const c of order.circuits) circuits.push(await this.circuit(actor, order, c.id, repairs.items));
    const overview = await this.orderDiagnoses.forOrder(actor, id);
    return { order, circuits, repairs: repairs.items, reviews, overview };
  }

  /** `repairs`: the order's repairs when the caller has them already. */
  async circuit(
    actor: Actor,
    order: OrderDetail,
    circuitId: string,
    repairs?: ReadonlyArray<{ circuitId: string | null }>,
    conditions?: ScanConditions,
  ): Promise<CircuitDiagnosis> {
    const found = order.circuits.find((c) => c.id === circuitId);
    if (!found) throw new NotFoundException('circuit', circuitId);
    const circuit: CircuitItem = { ...found, cavities: (found.cavities ?? {}) as Record<string, string> };
    const { tree, diagnosis, readings } = await this.diagnoses.forCircuit(actor, order.id, circuitId, conditions ? { conditions } : {});
    const repaired = (repairs ?? (await this.repairs.list(actor, order.id)).items).some((r) => r.circuitId === null || r.circuitId === circuitId);
    const atRepair = repaired ? (await this.diagnoses.forCircuit(actor, order.id, circuitId, { asDiagnosed: true })).diagnosis : null;
    return {
      circuit,
      diagnosis: diagnosisView(tree, diagnosis),
      readings,
      atRepair,
      verification: verificationItems(diagnosis, readings),
      howTo: howToByRequest(tree),
      context: { sensor: found.sensor, highVoltageSystem: order.vehicle.highVoltageSystem },
    };
  }

  /** The reading the pad takes now: a correction or a verification when asked for, else what the diagnosis wants. */
  entryFor(order: OrderDetail, c: CircuitDiagnosis, ask: { correct?: string; verify?: number }): Entry | null {
    if (order.status === 'verified' || order.status === 'closed') return null;
    if (ask.correct) {
      const target = c.readings.find((r) => r.id === ask.correct && !r.supersededBy);
      const phaseOk = target && (order.status === 'repaired' ? target.phase === 'verification' : target.phase === 'diagnosis');
      if (target && phaseOk) {
        const request = requestOf(target);
        const label = c.diagnosis.path.find((p) => p.readingId === target.id)?.testLabel ?? c.howTo.get(requestKey(request))?.label ?? requestLine(request, c.circuit.cavities);
        const value = formatEntered(target.valueEntered, target.unitEntered, target.overload);
        return { mode: 'correct', title: label, request, phase: target.phase, supersedes: target.id, was: `${value}, ${target.takenBy.name}, ${when(target.takenAt)}` };
      }
    }
    if (order.status === 'repaired') {
      const items = c.verification;
      const chosen = items[ask.verify ?? -1] ?? items.find((v) => !v.after) ?? null;
      if (!chosen) return null;
      return {
        mode: 'verify',
        title: `After the repair: ${chosen.label}`,
        request: chosen.request,
        phase: 'verification',
        index: chosen.index,
        ...(chosen.after ? { supersedes: chosen.after.id } : {}),
      };
    }
    const next = c.diagnosis.nextTest;
    if (!next || c.diagnosis.status === 'concluded' || c.diagnosis.status === 'exhausted' || c.diagnosis.conclusion) return null;
    return {
      mode: next.recheckOf ? 'recheck' : 'next',
      // A comparison is taken as two readings: the title names the one the pad saves now.
      title: next.comparison ? `${next.label}: ${requestKey(next.request) === requestKey(next.comparison.first.request) ? next.comparison.first.label : next.comparison.second.label}` : next.label,
      request: next.request,
      phase: 'diagnosis',
      ...(next.recheckOf ? { supersedes: next.recheckOf } : {}),
    };
  }
}

/**
 * The diagnosis readings that decided something, each once (the latest standing one per test), to be taken again
 * after the repair; with the verification reading already taken for the same request, if any.
 */
export function verificationItems(diagnosis: Diagnosis, readings: MeasurementRow[]): VerificationItem[] {
  const labels = new Map(diagnosis.path.flatMap((p) => (p.testLabel ? [[p.readingId, p.testLabel] as const] : [])));
  const standing = readings.filter((r) => !r.supersededBy);
  const before = new Map<string, MeasurementRow>();
  for (const r of standing) if (r.phase === 'diagnosis' && labels.has(r.id)) before.set(requestKey(requestOf(r)), r);
  const after = new Map<string, MeasurementRow>();
  for (const r of standing) if (r.phase === 'verification') after.set(requestKey(requestOf(r)), r);
  return [...before.entries()].map(([key, row], index) => ({
    index,
    key,
    label: labels.get(row.id)!,
    request: requestOf(row),
    before: row,
    after: after.get(key) ?? null,
  }));
}

function howToByRequest(tree: Tree): Map<string, HowTo> {
  const out = new Map<string, HowTo>();
  for (const t of tree.tests) {
    out.set(requestKey(t.request), { label: t.label, procedure: t.procedure, preconditions: t.preconditions, cautions: t.cautions });
    if (t.crankRequest) out.set(requestKey(t.crankRequest), { label: t.label, procedure: t.procedure, preconditions: t.preconditions, cautions: t.crankCautions });
  }
  return out;
}
