import { Injectable } from '@nestjs/common';
import { ConflictException, DomainException, InvalidInputException, NotFoundException } from '../../common/errors/domain.exception';
import { isUniqueViolation } from '../../common/database/prisma-errors';
import { checkMove } from '../../engine/status';
import type { Prisma } from '../../generated/prisma/client';
import { orderScope, type Actor } from '../identity/actor';
import { UsersRepository } from '../identity/users.repository';
import type { ChangeStatus, CreateRepairOrder, ListRepairOrders, UpdateRepairOrder } from './repair-orders.dto';
import { RepairOrdersRepository } from './repair-orders.repository';
import { toDetailView } from './repair-orders.view';

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
   * Opens an order. Orders opened at the same moment on two instances may draw the same next number or both find
   * a new VIN unknown: the database's unique indexes refuse the second, and that one simply tries again, seeing
   * the first. No database lock is held while waiting, so a burst of openings never ties up the connections
   * readings need.
   */
  async create(actor: Actor, input: CreateRepairOrder) {
    for (let attempt = 1; ; attempt++) {
      try {
        return await this.get(actor, await this.oneAtATime(actor.shopId, () => this.open(actor, input, attempt)));
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

  private open(actor: Actor, input: CreateRepairOrder, attempt: number): Promise<string> {
    return this.orders.transaction(async (tx) => {
      await this.requireTechnician(actor, input.technicianId, 'body.technicianId', tx);
      const vehicleId = await this.resolveVehicle(actor, input, tx);
      const number = input.number ?? (await this.nextNumber(actor.shopId, tx, attempt));
      const created = await this.orders.create(tx, {
        shopId: actor.shopId,
        number,
        vehicleId,
        technicianId: input.technicianId ?? null,
        complaint: input.complaint,
        codes: input.codes,
        odometerIn: input.vehicle?.odometer ?? null,
        createdById: actor.userId,
      });
      await this.orders.logStatus(tx, created.id, null, 'open', actor.userId);
      return created.id;
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
    await this.orders.transaction(async (tx) => {
      const current = await this.orders.find(orderScope(actor), id, tx);
      if (!current) throw new NotFoundException('repair_order', id);
      if (input.version !== undefined) this.requireVersion(current, input.version);
      await this.requireProgress(tx, current, input.to);
      const move = checkMove(current.status, input.to, input.reason);
      if (!move.ok) {
        const f = move.finding;
        if (f.code === 'status.reason_required') {
          throw new InvalidInputException([{ code: f.code, path: 'body.reason', message: f.message }]);
        }
        throw new ConflictException(f.code, f.message, { from: current.status, to: input.to, allowed: f.allowed });
      }
      const changed = await this.orders.updateAtVersion(tx, id, current.version, { status: input.to });
      if (changed !== 1) this.raceLost(id);
      await this.orders.logStatus(tx, id, current.status, input.to, actor.userId, input.reason ?? '');
    });
    return this.get(actor, id);
  }

  /** Moves that need work done first: a repair before "repaired", the foreman's approval before "closed". */
  private async requireProgress(tx: Prisma.TransactionClient, current: { id: string; number: string; status: string }, to: string): Promise<void> {
    if (to !== 'repaired' && to !== 'closed') return;
    const { repairs, latestDecision } = await this.orders.progress(tx, current.id);
    if (to === 'repaired' && current.status === 'diagnosing' && repairs === 0) {
      throw new ConflictException('status.repair_not_recorded', `Record the repair on ${current.number} (what was done, where, parts) before marking it repaired.`, { from: current.status, to });
    }
    if (to === 'closed' && current.status === 'verified' && latestDecision !== 'approved') {
      throw new ConflictException(
        'status.not_approved',
        `${current.number} can be closed once a foreman has approved the repair (latest decision: ${latestDecision ?? 'none'}).`,
        { from: current.status, to, latestDecision },
      );
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

  private async resolveVehicle(actor: Actor, input: CreateRepairOrder, tx: Prisma.TransactionClient): Promise<string> {
    if (input.vehicleId) {
      const vehicle = await this.orders.vehicleInShop(actor.shopId, input.vehicleId, tx);
      if (!vehicle) throw new InvalidInputException([{ code: 'vehicle.not_found', path: 'body.vehicleId', message: 'names no vehicle of this shop' }]);
      return vehicle.id;
    }
    const v = input.vehicle!;
    const existing = await this.orders.vehicleByVin(actor.shopId, v.vin, tx);
    // A high-voltage system once reported stays marked: the caution is never dropped by a later order.
    if (existing && v.highVoltageSystem && !existing.highVoltageSystem) await this.orders.markHighVoltage(existing.id, tx);
    if (existing) return existing.id;
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
    return created.id;
  }

  /**
   * The number after the shop's highest "RO-nnnnn", hand-typed ones included. After a clash with an order opened
   * at the same moment (the unique index refuses it, and `create` tries again), each retry starts a little further
   * on (at random), so that several openings retrying together part ways; a number may then be left out.
   */
  private async nextNumber(shopId: string, tx: Prisma.TransactionClient, attempt = 1): Promise<string> {
    const n = (await this.orders.highestRoNumber(shopId, tx)) + 1 + Math.floor(Math.random() * attempt);
    return `RO-${String(n).padStart(5, '0')}`;
  }
}
