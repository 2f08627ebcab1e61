import { Injectable } from '@nestjs/common';
import { ConflictException, DomainException, InvalidInputException, NotFoundException, type Finding } from '../../common/errors/domain.exception';
import { isUniqueViolation } from '../../common/database/prisma-errors';
import { ZodPipe } from '../../common/validation/zod-input';
import type { Prisma, RepairOrderStatus } from '../../generated/prisma/client';
import { orderScope, type Actor } from '../identity/actor';
import { RepairOrdersRepository, type CircuitOfOrder } from '../repair-orders/repair-orders.repository';
import { MeasurementBatch, MeasurementInput, type ListMeasurements } from './measurements.dto';
import { MeasurementsRepository, type MeasurementRow } from './measurements.repository';
import { measurementView, requestOf } from './measurements.view';
import { builtInTreeFor, requestKey, scanUnitRefusal, type TreeRequest } from '../../engine/diagnosis';

/**
 * What a correction must share with the reading it replaces: the same test. The engine state may differ, since a
 * scan value frozen with the engine stopped is replaced by the same value read while cranking.
 */
function sameTest(m: Parameters<typeof requestOf>[0] | Record<string, unknown>): string {
  return requestKey({ ...requestOf(m as Parameters<typeof requestOf>[0]), engine: 'off' });
}

/** Which phase of reading each status accepts. */
const PHASES_BY_STATUS: Record<RepairOrderStatus, ReadonlyArray<'diagnosis' | 'verification'>> = {
  open: ['diagnosis'],
  diagnosing: ['diagnosis'],
  repaired: ['verification'],
  verified: [],
  closed: [],
};

/** The row a reading is stored as. */
function rowFor(m: MeasurementInput, repairOrderId: string, takenById: string, now: number) {
  return {
    repairOrderId,
    circuitId: m.circuitId,
    quantity: m.quantity,
    at: m.at,
    against: m.against ?? null,
    location: m.location,
    connector: m.connector,
    key: m.key,
    engine: m.engine,
    jumpers: m.jumpers,
    pid: m.pid ?? null,
    sensor: m.sensor ?? null,
    clientKey: m.clientKey ?? null,
    valueEntered: m.value,
    unitEntered: m.unit,
    valueSi: m.valueSi,
    overload: m.overload,
    siUnit: m.siUnit,
    meterOhms: m.meterOhms,
    phase: m.phase,
    note: m.note,
    supersedesId: m.supersedes ?? null,
    takenById,
    takenAt: new Date(m.takenAt ?? now),
  };
}

/** A scan value whose unit the circuit's built-in tree cannot convert for the test it answers (the tree names the unit). */
function scanUnitProblem(kind: string | undefined, m: MeasurementInput): string | undefined {
  const tree = kind === undefined || m.quantity !== 'scan_value' ? undefined : builtInTreeFor(kind);
  return tree && scanUnitRefusal(tree, { ...m, jumpers: m.jumpers ?? [] } as TreeRequest, m.siUnit, m.valueSi ?? 0);
}

/** What recording answers: the stored readings (or the earlier copies, when re-sent) and the circuits they are on. */
export interface Recorded {
  replayed: boolean;
  result: unknown;
  circuits: CircuitOfOrder[];
}

@Injectable()
export class MeasurementsService {
  private readonly one = new ZodPipe(MeasurementInput, 'body');
  private readonly many = new ZodPipe(MeasurementBatch, 'body');

  constructor(
    private readonly measurements: MeasurementsRepository,
    private readonly orders: RepairOrdersRepository,
  ) {}

  /**
   * One reading or a batch; a batch is stored all-or-nothing. Readings whose `clientKey` is already stored are
   * not stored again: the stored reading comes back instead (`replayed`), so a tablet may safely re-send.
   */
  async record(actor: Actor, repairOrderId: string, body: unknown): Promise<Recorded> {
    const batch = Array.isArray(body);
    const inputs = batch ? this.many.transform(body) : [this.one.transform(body)];
    const at = (i: number, field: string) => (batch ? `body.${i}.${field}` : `body.${field}`);
    const keyed = inputs.some((m) => m.clientKey);
    try {
      // Nearly every reading is new: store it straight away, and look for an earlier copy only when that fails.
      return (await this.storeAlone(actor, repairOrderId, inputs, batch, at)) ?? (await this.store(actor, repairOrderId, inputs, batch, at, false));
    } catch (error) {
      if (keyed && (isUniqueViolation(error, 'clientKey') || error instanceof DomainException)) {
        // A re-sent reading (or one that arrived twice at once): answer with the stored copy, which also holds
        // when the order has moved on since; a refusal that was not about a re-send comes back the same again.
        return this.retryWithReplays(actor, repairOrderId, inputs, batch, at);
      }
      throw this.mapped(error);
    }
  }

  private async retryWithReplays(actor: Actor, repairOrderId: string, inputs: MeasurementInput[], batch: boolean, at: (i: number, field: string) => string) {
    for (let attempt = 1; ; attempt++) {
      try {
        return await this.store(actor, repairOrderId, inputs, batch, at, true);
      } catch (error) {
        // Stored by a concurrent request between our look and our insert: that copy is there now to replay.
        if (attempt === 1 && isUniqueViolation(error, 'clientKey')) continue;
        throw this.mapped(error);
      }
    }
  }

  private mapped(error: unknown): unknown {
    if (isUniqueViolation(error, 'supersedes')) {
      return new ConflictException('measurement.already_corrected', 'That reading was corrected at the same moment by someone else; reload and correct the latest one.');
    }
    return error;
  }

  /**
   * The common case in one write: a single new reading, not a correction, on an order already under diagnosis or
   * repaired. The order is read and the reading checked as `store` does; the reading is then stored only while the
   * order still has the status it was checked against. Undefined when the case is another one, or the order moved
   * on in between: `store` then does it all in one transaction.
   */
  private async storeAlone(actor: Actor, repairOrderId: string, inputs: MeasurementInput[], batch: boolean, at: (i: number, field: string) => string) {
    const m = inputs[0]!;
    if (batch || m.supersedes || !this.measurements.canInsertAlone()) return undefined;
    const order = await this.orders.findHeaderWithCircuits(orderScope(actor), repairOrderId);
    if (!order) throw new NotFoundException('repair_order', repairOrderId);
    // The first reading moves an open order to diagnosing, which `store` records.
    if (order.status === 'open') return undefined;
    this.requirePhases(order, inputs);
    this.requireTimes(order, inputs, at);
    await this.requireReferences(repairOrderId, order.circuits, inputs, at, this.measurements.prisma);
    const row = await this.measurements.insertWhileStatus(order.status, { id: actor.userId, name: actor.name }, rowFor(m, repairOrderId, actor.userId, Date.now()));
    if (!row) return undefined;
    return { replayed: false, result: measurementView(row), circuits: order.circuits.filter((c) => c.id === m.circuitId) } satisfies Recorded;
  }

  private async store(
    actor: Actor,
    repairOrderId: string,
    inputs: MeasurementInput[],
    batch: boolean,
    at: (i: number, field: string) => string,
    lookForReplays: boolean,
  ): Promise<Recorded> {
    const { rows, replayed, circuits } = await this.measurements.transaction(async (tx) => {
      const order = await this.orders.findHeaderWithCircuits(orderScope(actor), repairOrderId, tx);
      if (!order) throw new NotFoundException('repair_order', repairOrderId);
      this.requireDistinctKeys(inputs, at);
      const stored = lookForReplays ? await this.replays(repairOrderId, inputs, at, tx) : new Map<string, MeasurementRow>();
      const touched = order.circuits.filter((c) => inputs.some((m) => m.circuitId === c.id));
      const fresh = inputs.filter((m) => !m.clientKey || !stored.has(m.clientKey));
      if (fresh.length === 0) return { rows: inputs.map((m) => stored.get(m.clientKey!)!), replayed: true, circuits: touched };
      this.requirePhases(order, fresh);
      this.requireTimes(order, inputs, at);
      await this.requireReferences(repairOrderId, order.circuits, inputs, at, tx);
      const now = Date.now();
      const created = await this.measurements.insertMany(
        tx,
        { id: actor.userId, name: actor.name },
        fresh.map((m) => rowFor(m, repairOrderId, actor.userId, now)),
      );
      if (order.status === 'open') {
        // The first reading starts the diagnosis.
        await this.orders.updateAtVersion(tx, repairOrderId, order.version, { status: 'diagnosing' });
        await this.orders.logStatus(tx, repairOrderId, 'open', 'diagnosing', actor.userId, 'first reading recorded');
      } else {
        await this.orders.touch(tx, repairOrderId);
      }
      const byInput = new Map(fresh.map((m, i) => [m, created[i]!]));
      return { rows: inputs.map((m) => byInput.get(m) ?? stored.get(m.clientKey!)!), replayed: false, circuits: touched };
    });
    const views = rows.map(measurementView);
    return { replayed, result: batch ? { items: views } : views[0], circuits };
  }

  private requireDistinctKeys(inputs: MeasurementInput[], at: (i: number, field: string) => string): void {
    const seen = new Set<string>();
    const findings: Finding[] = [];
    inputs.forEach((m, i) => {
      if (!m.clientKey) return;
      if (seen.has(m.clientKey)) {
        findings.push({ code: 'measurement.client_key_twice', path: at(i, 'clientKey'), message: 'the batch uses this key for two readings; each reading needs its own key' });
      }
      seen.add(m.clientKey);
    });
    if (findings.length) throw new InvalidInputException(findings);
  }

  /** Stored readings for the batch's client keys; a key reused for a different reading is refused. */
  private async replays(repairOrderId: string, inputs: MeasurementInput[], at: (i: number, field: string) => string, tx: Prisma.TransactionClient) {
    const keys = inputs.flatMap((m) => (m.clientKey ? [m.clientKey] : []));
    const findings: Finding[] = [];
    const stored = new Map((await this.measurements.byClientKeys(repairOrderId, keys, tx)).map((r) => [r.clientKey!, r]));
    inputs.forEach((m, i) => {
      const row = m.clientKey ? stored.get(m.clientKey) : undefined;
      if (row && (row.circuitId !== m.circuitId || row.valueEntered !== m.value || row.quantity !== m.quantity || row.at !== m.at)) {
        findings.push({ code: 'measurement.client_key_reused', path: at(i, 'clientKey'), message: 'this key already names a different reading; use a new key for a new reading' });
      }
    });
    if (findings.length) throw new ConflictException('measurement.client_key_reused', findings[0]!.message, {}, findings);
    return stored;
  }

  async list(actor: Actor, repairOrderId: string, query: ListMeasurements) {
    const order = await this.orders.findHeader(orderScope(actor), repairOrderId);
    if (!order) throw new NotFoundException('repair_order', repairOrderId);
    const rows = await this.measurements.list(repairOrderId, query);
    return { items: rows.map(measurementView) };
  }

  private requirePhases(order: { number: string; status: RepairOrderStatus }, inputs: MeasurementInput[]): void {
    const accepted = PHASES_BY_STATUS[order.status];
    const wrong = inputs.find((m) => !accepted.includes(m.phase));
    if (!wrong) return;
    const message =
      accepted.length === 0
        ? `Repair order ${order.number} is ${order.status}: no more readings; reopen it with a reason first.`
        : `Repair order ${order.number} is ${order.status}: it takes ${accepted.join(' or ')} readings, not ${wrong.phase}.`;
    throw new ConflictException('measurement.wrong_phase', message, { status: order.status, acceptedPhases: accepted });
  }

  /** A reading cannot predate the repair order it belongs to. */
  private requireTimes(order: { number: string; createdAt: Date }, inputs: MeasurementInput[], at: (i: number, field: string) => string): void {
    const findings: Finding[] = [];
    inputs.forEach((m, i) => {
      if (m.takenAt && Date.parse(m.takenAt) < order.createdAt.getTime()) {
        findings.push({ code: 'measurement.before_order', path: at(i, 'takenAt'), message: `before repair order ${order.number} was opened (${order.createdAt.toISOString()})` });
      }
    });
    if (findings.length) throw new InvalidInputException(findings);
  }

  private async requireReferences(
    repairOrderId: string,
    ofOrder: ReadonlyArray<{ id: string; kind: string }>,
    inputs: MeasurementInput[],
    at: (i: number, field: string) => string,
    tx: Prisma.TransactionClient,
  ): Promise<void> {
    const findings: Finding[] = [];
    const circuits = new Set(ofOrder.map((c) => c.id));
    inputs.forEach((m, i) => {
      if (!circuits.has(m.circuitId)) findings.push({ code: 'circuit.not_found', path: at(i, 'circuitId'), message: 'names no circuit of this repair order' });
      const refusal = scanUnitProblem(ofOrder.find((c) => c.id === m.circuitId)?.kind, m);
      if (refusal) findings.push({ code: 'measurement.scan_unit_unexpected', path: at(i, 'unit'), message: refusal });
    });
    const targetIds = inputs.flatMap((m) => (m.supersedes ? [m.supersedes] : []));
    const targets = new Map(targetIds.length ? (await this.measurements.correctionTargets(repairOrderId, targetIds, tx)).map((t) => [t.id, t]) : []);
    const seen = new Set<string>();
    inputs.forEach((m, i) => {
      if (!m.supersedes) return;
      const target = targets.get(m.supersedes);
      const path = at(i, 'supersedes');
      if (!target) findings.push({ code: 'measurement.not_found', path, message: 'names no reading of this repair order' });
      else if (target.supersededBy) findings.push({ code: 'measurement.already_corrected', path, message: `that reading was already corrected by ${target.supersededBy.id}; correct that one instead` });
      else if (target.circuitId !== m.circuitId) findings.push({ code: 'measurement.other_circuit', path, message: 'a correction must be on the same circuit as the reading it corrects' });
      else if (sameTest(target) !== sameTest({ ...m, against: m.against ?? null, pid: m.pid ?? null, sensor: m.sensor ?? null })) {
        findings.push({ code: 'measurement.other_test', path, message: 'a correction repeats the same test (quantity, leads, connector, key, jumpers) as the reading it corrects' });
      }
      else if (seen.has(m.supersedes)) findings.push({ code: 'measurement.corrected_twice', path, message: 'the batch corrects this reading twice' });
      seen.add(m.supersedes);
    });
    if (findings.length) throw new InvalidInputException(findings);
  }
}
