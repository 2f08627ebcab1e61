import { Injectable } from '@nestjs/common';
import { ConflictException, DomainException, InvalidInputException, NotFoundException } from '../../common/errors/domain.exception';
import { isUniqueViolation } from '../../common/database/prisma-errors';
import { checkMove } from '../../engine/status';
import type { Prisma, RepairOrderStatus } from '../../generated/prisma/client';
import { StatusGates } from './status-gates';
import { orderScope, type Actor } from '../identity/actor';
import { UsersRepository } from '../identity/users.repository';
import { OrderNumberingService } from '../order-numbering/order-numbering.service';
import type { ChangeStatus, CreateRepairOrder, ListRepairOrders, UpdateRepairOrder } from './repair-orders.dto';
import { RepairOrdersRepository } from './repair-orders.repository';
import { toDetailView } from './repair-orders.view';
import { vehicleWarnings } from './vehicle-warnings';
import type { Finding } from '../../common/errors/domain.exception';

/** Tries at opening an order before answering 503: each clash means another order was opened meanwhile. */
const OPENING_ATTEMPTS = 20;
/** Longest an opening waits for its turn in this process before answering 503. */
const OPENING_WAIT_MS = 5000;

const busyOpening = () =>
  new DomainException('unavailable', 'repair_order.opening_busy', 'Many repair orders are being opened in this shop at this moment; try again in a few seconds.');

@Injectable()
export class RepairOrdersService {
  /** Per shop, the end of the queue of openings in this process. */
  private readonly openings = new Map<string, Promise<void>>();

  constructor(
    private readonly orders: RepairOrdersRepository,
    private readonly users: UsersRepository,
    private readonly numbering: OrderNumberingService,
    private readonly gates: StatusGates,
  ) {}

  async list(actor: Actor, query: ListRepairOrders) {
    const { items, total } = await this.orders.list(orderScope(actor), query);
    return { items, page: query.page, pageSize: query.pageSize, total };
  }

  async get(actor: Actor, id: string) {
    const order = await this.orders.find(orderScope(actor), id);
    if (!order) throw new NotFoundException('repair_order', id);
    return toDetailView(order);
  }

  /**
   * Opens an order. The automatic number comes from the shop's own counter row (numbers typed by hand never move
   * it). Orders opened at the same moment on two instances may both find a new VIN unknown, or an automatic number
   * may meet one being typed at that moment: the database's unique indexes refuse the second, and that one simply
   * tries again, seeing the first.
   */
  async create(actor: Actor, input: CreateRepairOrder) {
    for (let attempt = 1; ; attempt++) {
      try {
        const opened = await this.oneAtATime(actor.shopId, () => this.open(actor, input));
        const order = await this.get(actor, opened.id);
        return opened.warnings.length ? { ...order, warnings: opened.warnings } : order;
      } catch (error) {
        const clash = (input.number === undefined && isUniqueViolation(error, 'number')) || isUniqueViolation(error, 'vin');
        if (clash && attempt < OPENING_ATTEMPTS) continue;
        if (clash) throw busyOpening();
        if (isUniqueViolation(error, 'number')) {
          throw new ConflictException('repair_order.number_taken', `Repair order number ${input.number} is already used in this shop.`, {}, [
            { code: 'repair_order.number_taken', path: 'body.number', message: 'already used in this shop' },
          ]);
        }
        throw error;
      }
    }
  }

  /**
   * Openings in one shop take turns within this process, queued in memory, so they do not clash with each other
   * and hold no database connection while they wait; only openings on other instances can still clash.
   */
  private oneAtATime<T>(shopId: string, work: () => Promise<T>): Promise<T> {
    const queuedAt = Date.now();
    const run = (this.openings.get(shopId) ?? Promise.resolve()).then(() => {
      // Whoever sent a request that waited this long has likely given up (and may send it again): do not open it late.
      if (Date.now() - queuedAt > OPENING_WAIT_MS) throw busyOpening();
      return work();
    });
    const settled = run.then(
      () => undefined,
      () => undefined,
    );
    this.openings.set(shopId, settled);
    void settled.then(() => {
      if (this.openings.get(shopId) === settled) this.openings.delete(shopId);
    });
    return run;
  }

  private open(actor: Actor, input: CreateRepairOrder): Promise<{ id: string; warnings: Finding[] }> {
    return this.orders.transaction(async (tx) => {
      await this.requireTechnician(actor, input.technicianId, 'body.technicianId', tx);
      const { id: vehicleId, warnings } = await this.resolveVehicle(actor, input, tx);
      // Taken last, so the shop's counter row is locked only for the insert that follows.
      const number = input.number ?? (await this.numbering.take(actor.shopId, tx));
      const created = await this.orders.create(tx, {
        shopId: actor.shopId,
        number,
        vehicleId,
        // A technician who opens an order is the one working on it unless they name someone else.
        technicianId: input.technicianId ?? (actor.role === 'technician' ? actor.userId : null),
        complaint: input.complaint,
        codes: input.codes,
        odometerIn: input.vehicle?.odometer ?? null,
        createdById: actor.userId,
      });
      await this.orders.logStatus(tx, created.id, null, 'open', actor.userId, '', 0);
      return { id: created.id, warnings };
    });
  }

  async update(actor: Actor, id: string, input: UpdateRepairOrder) {
    await this.orders.transaction(async (tx) => {
      const current = await this.orders.find(orderScope(actor), id, tx);
      if (!current) throw new NotFoundException('repair_order', id);
      if (current.status === 'closed') {
        throw new ConflictException('repair_order.closed', 'A closed repair order cannot be changed; reopen it with a reason first.');
      }
      if (input.technicianId) await this.requireTechnician(actor, input.technicianId, 'body.technicianId', tx);
      const { version, ...changes } = input;
      this.requireVersion(current, version);
      // Another instance may have moved the version between our read and this write: then nothing changed.
      if ((await this.orders.updateAtVersion(tx, id, version, changes)) !== 1) this.raceLost(id);
    });
    return this.get(actor, id);
  }

  async changeStatus(actor: Actor, id: string, input: ChangeStatus) {
    // The evidence a move needs is checked on the order as read here; the move then lands only on that version.
    const seen = await this.orders.findHeader(orderScope(actor), id);
    if (!seen) throw new NotFoundException('repair_order', id);
    if (input.version !== undefined) this.requireVersion(seen, input.version);
    this.requireLegal(seen.status, input);
    await this.gates.check(actor, seen, input.to);
    await this.orders.transaction(async (tx) => {
      const current = await this.orders.find(orderScope(actor), id, tx);
      if (!current) throw new NotFoundException('repair_order', id);
      if (current.version !== seen.version) this.raceLost(id);
      await this.requireProgress(tx, current, input.to);
      const changed = await this.orders.updateAtVersion(tx, id, current.version, { status: input.to });
      if (changed !== 1) this.raceLost(id);
      await this.orders.logStatus(tx, id, current.status, input.to, actor.userId, input.reason ?? '', current.version);
    });
    return this.get(actor, id);
  }

  private requireLegal(from: RepairOrderStatus, input: ChangeStatus): void {
    const move = checkMove(from, input.to, input.reason);
    if (move.ok) return;
    const f = move.finding;
    if (f.code === 'status.reason_required') throw new InvalidInputException([{ code: f.code, path: 'body.reason', message: f.message }]);
    throw new ConflictException(f.code, f.message, { from, to: input.to, allowed: f.allowed });
  }

  /** A repair before "repaired" (the evidence "verified" and "closed" need is checked by the status gates). */
  private async requireProgress(tx: Prisma.TransactionClient, current: { id: string; number: string; status: string }, to: string): Promise<void> {
    if (to !== 'repaired') return;
    const { repairs } = await this.orders.progress(tx, current.id);
    if (current.status === 'diagnosing' && repairs === 0) {
      throw new ConflictException('status.repair_not_recorded', `Record the repair on ${current.number} (what was done, where, parts) before marking it repaired.`, { from: current.status, to });
    }
  }

  private requireVersion(current: { version: number; updatedAt: Date }, version: number): void {
    if (current.version !== version) {
      throw new ConflictException(
        'repair_order.stale_version',
        `This repair order changed since you read it (you sent version ${version}, it is now at ${current.version}); reload and apply your change again.`,
        { currentVersion: current.version, changedAt: current.updatedAt.toISOString() },
      );
    }
  }

  private raceLost(id: string): never {
    throw new ConflictException('repair_order.stale_version', `Repair order ${id} was changed by someone else at the same moment; reload and try again.`);
  }

  private async requireTechnician(actor: Actor, userId: string | undefined, path: string, tx: Prisma.TransactionClient) {
    if (!userId) return;
    const user = await this.users.findInShop(actor.shopId, userId, tx);
    if (!user || !user.active || user.role !== 'technician') {
      throw new InvalidInputException([{ code: 'user.not_a_technician', path, message: 'names no active technician of this shop' }]);
    }
  }

  private async resolveVehicle(actor: Actor, input: CreateRepairOrder, tx: Prisma.TransactionClient): Promise<{ id: string; warnings: Finding[] }> {
    if (input.vehicleId) {
      const vehicle = await this.orders.vehicleInShop(actor.shopId, input.vehicleId, tx);
      if (!vehicle) throw new InvalidInputException([{ code: 'vehicle.not_found', path: 'body.vehicleId', message: 'names no vehicle of this shop' }]);
      return { id: vehicle.id, warnings: [] };
    }
    const v = input.vehicle!;
    const existing = await this.orders.vehicleByVin(actor.shopId, v.vin, tx);
    const warnings = vehicleWarnings(v, existing);
    // A high-voltage system once reported stays marked: the caution is never dropped by a later order.
    if (existing && v.highVoltageSystem && !existing.highVoltageSystem) await this.orders.markHighVoltage(existing.id, tx);
    if (existing) return { id: existing.id, warnings };
    const created = await this.orders.createVehicle(tx, {
      shopId: actor.shopId,
      vin: v.vin,
      outsideNorthAmerica: v.builtOutsideNorthAmerica,
      highVoltageSystem: v.highVoltageSystem,
      year: v.year,
      make: v.make,
      model: v.model,
      engine: v.engine,
      odometer: v.odometer,
      odometerUnit: v.odometerUnit,
      createdById: actor.userId,
    });
    return { id: created.id, warnings };
  }
}
