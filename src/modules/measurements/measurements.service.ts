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
import { setContextActor } from '../../common/logging/request-context';
import { AuthService } from '../auth/auth.service';
import { sessionEnded, type PendingSession } from '../auth/session-cache';
import { bucketOf, RateLimitsInterceptor, refuseOver } from '../rate-limits/rate-limits.interceptor';
import { ReadingRepository, type StoredReading } from './reading.repository';

/**
 * What a correction must share with the reading it replaces: the same test. The engine state may differ, since a
 * scan value frozen with the engine stopped is replaced by the same value read while cranking.
 */
function sameTest(m: Parameters<typeof requestOf>[0] | Record<string, unknown>): string {
  return requestKey({ ...requestOf(m as Parameters<typeof requestOf>[0]), engine: 'off' });
}

type ReadingContextOrder = Awaited<ReturnType<ReadingRepository['context']>>['order'];

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
    againstLocation: m.againstLocation ?? null,
    otherConnector: m.otherConnector ?? null,
    key: m.key,
    engine: m.engine,
    sensorInput: m.sensorInput ?? null,
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
  /** Whether the order's vehicle has a high-voltage system (its caution leads every test's cautions). */
  highVoltageSystem: boolean;
  /** The caller as the database has them now (their sign-in checked by this request). */
  actor: Actor;
  /** Read by the write itself: the circuit's readings and the order's repairs, for the diagnosis after it. */
  history?: StoredReading['history'];
}

/** The caller's sign-in: which one, and (when the guard took it from the cache) that it is still to be checked. */
export interface SignInOfRequest {
  signInId: string;
  pending?: PendingSession;
  /** Where the credential came from, for the 401 when it ended. */
  path: string;
}

@Injectable()
export class MeasurementsService {
  private readonly one = new ZodPipe(MeasurementInput, 'body');
  private readonly many = new ZodPipe(MeasurementBatch, 'body');

  constructor(
    private readonly measurements: MeasurementsRepository,
    private readonly orders: RepairOrdersRepository,
    private readonly reading: ReadingRepository,
    private readonly auth: AuthService,
    private readonly limits: RateLimitsInterceptor,
  ) {}

  /**
   * One reading or a batch; a batch is stored all-or-nothing. Readings whose `clientKey` is already stored are
   * not stored again: the stored reading comes back instead (`replayed`), so a tablet may safely re-send. With
   * `history`, the answer carries what the diagnosis after it needs, when the write could read it.
   */
  async record(caller: Actor, repairOrderId: string, body: unknown, signIn?: SignInOfRequest, history = false): Promise<Recorded> {
    const batch = Array.isArray(body);
    // The common case (one new reading, not a correction) reads the sign-in, the budget and the order in one
    // statement, before the body is judged, as the guard and the rate limit would have.
    const alone = !batch && typeof body === 'object' && body !== null && (body as { supersedes?: unknown }).supersedes == null && this.measurements.canInsertAlone();
    const context = signIn && alone ? await this.context(caller, signIn, repairOrderId) : undefined;
    const actor = context?.actor ?? (signIn?.pending ? await this.confirmed(signIn) : caller);
    const inputs = batch ? this.many.transform(body) : [this.one.transform(body)];
    const at = (i: number, field: string) => (batch ? `body.${i}.${field}` : `body.${field}`);
    const keyed = inputs.some((m) => m.clientKey);
    try {
      // Nearly every reading is new: store it straight away, and look for an earlier copy only when that fails.
      return (
        (context && (await this.storeAlone(actor, repairOrderId, context.order, inputs[0]!, history))) ??
        (await this.store(actor, repairOrderId, inputs, batch, at, false))
      );
    } catch (error) {
      if (keyed && (isUniqueViolation(error, 'clientKey') || error instanceof DomainException)) {
        // A re-sent reading (or one that arrived twice at once): answer with the stored copy, which also holds
        // when the order has moved on since; a refusal that was not about a re-send comes back the same again.
        return this.retryWithReplays(actor, repairOrderId, inputs, batch, at);
      }
      throw this.mapped(error);
    }
  }

  /** The sign-in checked, the write counted and the order read, in one statement (see ReadingRepository.context). */
  private async context(caller: Actor, signIn: SignInOfRequest, repairOrderId: string) {
    // A sign-in the guard looked up just now was counted by the rate limit already.
    const budget = signIn.pending ? this.limits.writeBudget(caller) : undefined;
    if (budget) this.limits.housekeep();
    const found = await this.reading.context(signIn.signInId, new Date(), budget && { bucket: bucketOf(budget), windowSeconds: budget.windowSeconds }, repairOrderId);
    const actor = signIn.pending ? this.auth.settled(signIn.pending, found.actor, signIn.path) : found.actor;
    // Signed out between the guard's look and this statement: the same answer as a moment later.
    if (!actor) throw sessionEnded(signIn.path);
    if (budget && found.writes) refuseOver(budget, found.writes.hits, found.writes.resetSeconds);
    if (actor.role !== caller.role || actor.name !== caller.name || actor.shopId !== caller.shopId) setContextActor(actor);
    return { actor, order: found.order };
  }

  /** A pending sign-in checked and the write counted, when the one-statement path does not apply. */
  private async confirmed(signIn: SignInOfRequest): Promise<Actor> {
    const actor = await this.auth.confirm(signIn.pending!, signIn.path);
    setContextActor(actor);
    await this.limits.countWrite(actor);
    return actor;
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
   * The common case in one write: a single new reading, not a correction, without an Idempotency-Key. The order
   * was read with the sign-in (`context`) and the reading is checked as `store` does; it is then stored only while
   * the order still has the status it was checked against (an open order moving to diagnosing in the same
   * statement). Undefined when the order moved on in between: `store` then does it all in one transaction.
   */
  private async storeAlone(actor: Actor, repairOrderId: string, order: ReadingContextOrder, m: MeasurementInput, history: boolean): Promise<Recorded | undefined> {
    if (!order) throw new NotFoundException('repair_order', repairOrderId);
    const at = (_: number, field: string) => `body.${field}`;
    this.requirePhases(order, [m]);
    this.requireTimes(order, [m], at);
    await this.requireReferences(repairOrderId, order.circuits, [m], at, this.measurements.prisma);
    const stored = await this.reading.store(order, { id: actor.userId, name: actor.name }, rowFor(m, repairOrderId, actor.userId, Date.now()), history);
    if (!stored) return undefined;
    return {
      replayed: false,
      result: measurementView(stored.row),
      circuits: order.circuits.filter((c) => c.id === m.circuitId),
      highVoltageSystem: order.vehicle.highVoltageSystem,
      actor,
      history: stored.history,
    };
  }

  private async store(
    actor: Actor,
    repairOrderId: string,
    inputs: MeasurementInput[],
    batch: boolean,
    at: (i: number, field: string) => string,
    lookForReplays: boolean,
  ): Promise<Recorded> {
    const { rows, replayed, circuits, highVoltageSystem } = await this.measurements.transaction(async (tx) => {
      const order = await this.orders.findHeaderWithCircuitsAndVehicle(orderScope(actor), repairOrderId, tx);
      if (!order) throw new NotFoundException('repair_order', repairOrderId);
      this.requireDistinctKeys(inputs, at);
      const stored = lookForReplays ? await this.replays(repairOrderId, inputs, at, tx) : new Map<string, MeasurementRow>();
      const touched = order.circuits.filter((c) => inputs.some((m) => m.circuitId === c.id));
      const fresh = inputs.filter((m) => !m.clientKey || !stored.has(m.clientKey));
      const highVoltageSystem = order.vehicle.highVoltageSystem;
      if (fresh.length === 0) return { rows: inputs.map((m) => stored.get(m.clientKey!)!), replayed: true, circuits: touched, highVoltageSystem };
      this.requirePhases(order, fresh);
      this.requireTimes(order, inputs, at);
      await this.requireReferences(repairOrderId, order.circuits, inputs, at, tx);
      const now = Date.now();
      const created = await this.measurements.insertMany(
        tx,
        { id: actor.userId, name: actor.name },
        fresh.map((m) => rowFor(m, repairOrderId, actor.userId, now)),
      );
      // The first reading starts the diagnosis; of first readings arriving together, the one that moves the order logs it.
      if (order.status === 'open' && (await this.orders.updateAtVersion(tx, repairOrderId, order.version, { status: 'diagnosing' })) === 1) {
        await this.orders.logStatus(tx, repairOrderId, 'open', 'diagnosing', actor.userId, 'first reading recorded', order.version);
      } else {
        await this.orders.touch(tx, repairOrderId);
      }
      const byInput = new Map(fresh.map((m, i) => [m, created[i]!]));
      return { rows: inputs.map((m) => byInput.get(m) ?? stored.get(m.clientKey!)!), replayed: false, circuits: touched, highVoltageSystem };
    });
    const views = rows.map(measurementView);
    return { replayed, result: batch ? { items: views } : views[0], circuits, highVoltageSystem, actor };
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
