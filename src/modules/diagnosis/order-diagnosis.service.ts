import { Inject, Injectable } from '@nestjs/common';
import { APP_CONFIG, type AppConfig } from '../../config/config';
import { NotFoundException } from '../../common/errors/domain.exception';
import { roundProbabilities } from '../../common/round-probabilities';
import { isReferenceVoltageCode } from '../../engine/codes';
import { cautionsInContext, diagnose, type Reading, type Repair } from '../../engine/diagnosis';
import {
  groupActivation,
  groupCauseCircuit,
  groupSensorId,
  groupTestOf,
  groupTree,
  isPluggedReferenceReading,
  pointsAtReference,
  whereGroupTestIsTaken,
  type OrderCircuit,
} from '../../engine/diagnosis/shared-reference-order';
import { orderScope, type Actor } from '../identity/actor';
import { MeasurementsRepository } from '../measurements/measurements.repository';
import { requestOf } from '../measurements/measurements.view';
import { ReferenceGroupsRepository } from '../reference-groups/reference-groups.repository';
import { RepairOrdersRepository } from '../repair-orders/repair-orders.repository';
import { RepairsRepository } from '../repairs/repairs.repository';
import { DiagnosisService, engineReading } from './diagnosis.service';
import { diagnosisView } from './diagnosis.view';

/** Causes of the order view: the leading few of each circuit and of each active group. */
const CAUSES_EACH = 3;
const CAUSES_SHOWN = 8;

/**
 * The diagnosis of a whole repair order: every circuit's own, and for each reference group the shared-reference
 * tree over its circuits' readings. When the circuits of a group point at their common reference together (or a
 * reference-voltage code backs one of them, or a shared-reference reading was taken), the order view takes the
 * group's diagnosis in their place and proposes its next test. Recomputed on every call; nothing is stored.
 */
@Injectable()
export class OrderDiagnosisService {
  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    private readonly orders: RepairOrdersRepository,
    private readonly groups: ReferenceGroupsRepository,
    private readonly measurements: MeasurementsRepository,
    private readonly repairs: RepairsRepository,
    private readonly circuits: DiagnosisService,
  ) {}

  async forOrder(actor: Actor, repairOrderId: string) {
    const header = await this.orders.findHeader(orderScope(actor), repairOrderId);
    if (!header) throw new NotFoundException('repair_order', repairOrderId);
    const [context, readings, repairs] = await Promise.all([
      this.groups.orderContext(repairOrderId),
      this.measurements.list(repairOrderId, { includeSuperseded: true }),
      this.repairs.listForOrder(repairOrderId),
    ]);
    if (!context) throw new NotFoundException('repair_order', repairOrderId);
    const perCircuit = [];
    for (const circuit of context.circuits) {
      const own = readings.filter((m) => m.circuitId === circuit.id);
      const { tree, diagnosis } = await this.circuits.ofCircuit(actor, repairOrderId, circuit, {}, { readings: own, repairs });
      const reference = own.filter((m) => !m.supersededBy && !m.overload && m.phase === 'diagnosis' && isPluggedReferenceReading(requestOf(m))).at(-1);
      perCircuit.push({ circuit, tree, diagnosis, referenceVolts: reference?.valueSi ?? undefined });
    }
    // Code evidence: a sensor reference-voltage code on the order backs a circuit that points at its reference.
    const referenceCodes = context.codes.filter(isReferenceVoltageCode);
    const groupViews = [];
    for (const group of context.referenceGroups) {
      const members = group.circuitIds.map((id) => context.circuits.find((c) => c.id === id)).filter((c) => c !== undefined);
      const tree = groupTree(members);
      const engineReadings: Reading[] = [];
      for (const m of readings) {
        const k = members.findIndex((c) => c.id === m.circuitId);
        const testId = k >= 0 ? groupTestOf(tree, k, requestOf(m)) : undefined;
        if (testId) engineReadings.push({ ...engineReading(m), request: structuredClone(tree.tests.find((t) => t.id === testId)!.request) });
      }
      const engineRepairs: Repair[] = repairs
        .filter((r) => r.circuitId === null || group.circuitIds.includes(r.circuitId))
        .map((r) => ({ id: r.id, part: r.part === 'sensor' && r.circuitId ? `${groupSensorId(group.circuitIds.indexOf(r.circuitId))}_sensor` : r.part, at: r.at.toISOString() }));
      const diagnosis = await diagnose(tree, engineReadings, engineRepairs, { concludeAt: this.config.concludeAt });
      const activation = groupActivation(perCircuit.filter((p) => group.circuitIds.includes(p.circuit.id)), referenceCodes, engineReadings.length);
      groupViews.push({ group, members, tree, diagnosis, ...activation });
    }
    const inActive = new Map(groupViews.filter((g) => g.active).flatMap((g) => g.group.circuitIds.map((id) => [id, g.group.id] as const)));
    const groupOf = new Map(groupViews.flatMap((g) => g.group.circuitIds.map((id) => [id, g.group.id] as const)));

    const causes = [
      ...perCircuit
        .filter((p) => !inActive.has(p.circuit.id))
        .flatMap((p) => p.diagnosis.ranked.slice(0, CAUSES_EACH).map((h) => ({ ...rankedOf(h), circuitId: p.circuit.id, referenceGroupId: null }))),
      ...groupViews
        .filter((g) => g.active)
        .flatMap((g) => g.diagnosis.ranked.slice(0, CAUSES_EACH).map((h) => ({ ...rankedOf(h), circuitId: groupCauseCircuit(g.members, h.id), referenceGroupId: g.group.id }))),
    ].sort((a, b) => b.probability - a.probability);

    const nextTest = this.nextTest(groupViews, perCircuit, inActive, context.vehicle.highVoltageSystem);
    return roundProbabilities({
      repairOrderId,
      circuits: perCircuit.map((p) => ({
        circuitId: p.circuit.id,
        label: p.circuit.label,
        kind: p.circuit.kind,
        referenceGroupId: groupOf.get(p.circuit.id) ?? null,
        status: p.diagnosis.status,
        leading: p.diagnosis.ranked[0] ? rankedOf(p.diagnosis.ranked[0]) : null,
        pointsAtReference: pointsAtReference(p.diagnosis, p.referenceVolts),
      })),
      referenceGroups: groupViews.map((g) => ({ id: g.group.id, circuitIds: g.group.circuitIds, active: g.active, why: g.why, diagnosis: diagnosisView(g.tree, g.diagnosis) })),
      leadingCauses: causes.slice(0, CAUSES_SHOWN),
      nextTest,
      findings: groupViews.flatMap((g) => (g.members.length < g.group.circuitIds.length ? [{ code: 'reference_group.circuit_missing', path: `referenceGroups.${g.group.id}`, message: 'a circuit of this group is no longer on the order' }] : [])),
    });
  }

  /**
   * An active group's next test first (taken at one of its circuits), else the first circuit still testing; with
   * the cautions of the circuit it is taken on and of the vehicle (a high-voltage system first), as the test screen shows them.
   */
  private nextTest(
    groups: Array<{ group: { id: string }; members: OrderCircuit[]; tree: ReturnType<typeof groupTree>; diagnosis: Awaited<ReturnType<typeof diagnose>>; active: boolean }>,
    perCircuit: Array<{ circuit: OrderCircuit; tree: { tests: Array<{ id: string; procedure: string[] }> }; diagnosis: Awaited<ReturnType<typeof diagnose>> }>,
    inActive: Map<string, string>,
    highVoltageSystem: boolean,
  ) {
    const cautions = (next: { cautions: Array<{ id: string; text: string }>; request: Reading['request'] }, circuit: OrderCircuit) =>
      cautionsInContext(next.cautions, next.request, { sensor: circuit.sensor, highVoltageSystem }).map((c) => ({ id: c.id, text: c.text }));
    for (const g of groups) {
      const next = g.active ? g.diagnosis.nextTest : null;
      if (!next) continue;
      const { circuit, sensor } = whereGroupTestIsTaken(g.members, next.request);
      const test = g.tree.tests.find((t) => t.id === next.id)!;
      return { id: next.id, label: next.label, request: { ...next.request, sensor }, circuitId: circuit.id, referenceGroupId: g.group.id, procedure: test.procedure, cautions: cautions(next, circuit) };
    }
    for (const p of perCircuit) {
      const next = p.diagnosis.nextTest;
      if (!next || inActive.has(p.circuit.id)) continue;
      return {
        id: next.id,
        label: next.label,
        request: next.request,
        circuitId: p.circuit.id,
        referenceGroupId: null,
        procedure: p.tree.tests.find((t) => t.id === next.id)?.procedure ?? [],
        cautions: cautions(next, p.circuit),
      };
    }
    return null;
  }
}

function rankedOf(h: { id: string; label: string; part: string; probability: number }) {
  return { id: h.id, label: h.label, part: h.part, probability: h.probability };
}
