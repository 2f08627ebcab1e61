import { Injectable } from '@nestjs/common';
import type { Db } from '../../common/database/database.tokens';
import { PrismaRepository } from '../../common/database/prisma-repository';
import type { Prisma, RepairOrderStatus } from '../../generated/prisma/client';
import type { ListRepairOrders } from './repair-orders.dto';
import type { OrderScope } from '../identity/actor';

const summarySelect = {
  id: true,
  number: true,
  status: true,
  complaint: true,
  codes: true,
  version: true,
  createdAt: true,
  updatedAt: true,
  vehicle: { select: { id: true, vin: true, year: true, make: true, model: true } },
  technician: { select: { id: true, name: true } },
} satisfies Prisma.RepairOrderSelect;

const detailInclude = {
  vehicle: true,
  technician: { select: { id: true, name: true, role: true } },
  createdBy: { select: { id: true, name: true } },
  statusLog: { orderBy: [{ at: 'asc' }, { id: 'asc' }], include: { by: { select: { id: true, name: true } } } },
  circuits: { orderBy: [{ createdAt: 'asc' }, { id: 'asc' }] },
} satisfies Prisma.RepairOrderInclude;

/** The where-clause of a scope: the shop, and for a technician their own or assigned orders. */
export function scopeWhere(scope: OrderScope): Prisma.RepairOrderWhereInput {
  return scope.technicianId
    ? { shopId: scope.shopId, OR: [{ technicianId: scope.technicianId }, { createdById: scope.technicianId }] }
    : { shopId: scope.shopId };
}

export type RepairOrderDetail = Prisma.RepairOrderGetPayload<{ include: typeof detailInclude }>;

/** What checks on a write need of an order. */
const HEADER = { id: true, status: true, version: true, number: true, createdAt: true, updatedAt: true } satisfies Prisma.RepairOrderSelect;

/** What a write on an order needs of its circuits; the sensor, for the cautions of the diagnosis it answers with. */
const CIRCUIT_OF_ORDER = { id: true, kind: true, faultTreeId: true, sensor: true } satisfies Prisma.CircuitSelect;
export type CircuitOfOrder = Prisma.CircuitGetPayload<{ select: typeof CIRCUIT_OF_ORDER }>;

@Injectable()
export class RepairOrdersRepository extends PrismaRepository {
  async list(scope: OrderScope, q: ListRepairOrders) {
    // `contains` is a LIKE pattern: a typed % or _ means itself.
    const text = q.q?.replace(/[\\%_]/g, (c) => '\\' + c);
    const where: Prisma.RepairOrderWhereInput = {
      AND: [scopeWhere(scope)],
      ...(q.status?.length ? { status: { in: q.status } } : {}),
      ...(q.technicianId ? { technicianId: q.technicianId } : {}),
      ...(q.changedSince ? { updatedAt: { gte: new Date(q.changedSince) } } : {}),
      ...(text
        ? {
            OR: [
              { number: { contains: text, mode: 'insensitive' } },
              { vehicle: { vin: { contains: text.toUpperCase() } } },
              { complaint: { contains: text, mode: 'insensitive' } },
            ],
          }
        : {}),
    };
    const [items, total] = await Promise.all([
      this.prisma.repairOrder.findMany({
        where,
        select: summarySelect,
        orderBy: [{ updatedAt: 'desc' }, { id: 'asc' }],
        skip: (q.page - 1) * q.pageSize,
        take: q.pageSize,
      }),
      this.prisma.repairOrder.count({ where }),
    ]);
    return { items, total };
  }

  find(scope: OrderScope, id: string, db: Db = this.prisma): Promise<RepairOrderDetail | null> {
    return db.repairOrder.findFirst({ where: { id, ...scopeWhere(scope) }, include: detailInclude });
  }

  findHeader(scope: OrderScope, id: string, db: Db = this.prisma) {
    return db.repairOrder.findFirst({ where: { id, ...scopeWhere(scope) }, select: HEADER });
  }

  /** The order's trouble codes and a circuit's sensor (what a diagnosis weighs the codes against), in one query. */
  codesForCircuit(repairOrderId: string, circuitId: string, db: Db = this.prisma) {
    return db.circuit.findFirst({ where: { id: circuitId, repairOrderId }, select: { sensor: true, repairOrder: { select: { codes: true } } } });
  }

  /** The header and the order's circuits (what a reading may name, and which fault tree each one follows), in one query. */
  findHeaderWithCircuits(scope: OrderScope, id: string, db: Db = this.prisma) {
    return db.repairOrder.findFirst({
      where: { id, ...scopeWhere(scope) },
      select: { ...HEADER, circuits: { select: CIRCUIT_OF_ORDER, orderBy: [{ createdAt: 'asc' }, { id: 'asc' }] } },
    });
  }

  /** The same with what the cautions of a test depend on: the vehicle's high-voltage system and each circuit's sensor. */
  findHeaderWithCircuitsAndVehicle(scope: OrderScope, id: string, db: Db = this.prisma) {
    return db.repairOrder.findFirst({
      where: { id, ...scopeWhere(scope) },
      select: {
        ...HEADER,
        vehicle: { select: { highVoltageSystem: true } },
        circuits: { select: CIRCUIT_OF_ORDER, orderBy: [{ createdAt: 'asc' }, { id: 'asc' }] },
      },
    });
  }

  /** Marks the order as changed (for `changedSince`) when something on it was added; the version stays. */
  async touch(db: Db, id: string): Promise<void> {
    await db.repairOrder.updateMany({ where: { id }, data: { updatedAt: new Date() } });
  }

  /** What a status move depends on: repairs recorded, and the foreman's latest decision. */
  async progress(db: Db, id: string) {
    // One after the other: inside a transaction both share a single connection.
    const repairs = await db.repair.count({ where: { repairOrderId: id } });
    const latestReview = await db.review.findFirst({ where: { repairOrderId: id }, orderBy: [{ at: 'desc' }, { seq: 'desc' }], select: { decision: true } });
    return { repairs, latestDecision: latestReview?.decision ?? null };
  }

  vehicleInShop(shopId: string, id: string, db: Db) {
    return db.vehicle.findFirst({ where: { id, shopId }, select: { id: true, odometer: true } });
  }

  vehicleByVin(shopId: string, vin: string, db: Db) {
    return db.vehicle.findUnique({ where: { shopId_vin: { shopId, vin } }, select: { id: true, year: true, make: true, model: true, highVoltageSystem: true } });
  }

  markHighVoltage(id: string, db: Db) {
    return db.vehicle.update({ where: { id }, data: { highVoltageSystem: true }, select: { id: true } });
  }

  createVehicle(db: Db, data: Prisma.VehicleUncheckedCreateInput) {
    return db.vehicle.create({ data, select: { id: true } });
  }

  create(db: Db, data: Prisma.RepairOrderUncheckedCreateInput) {
    return db.repairOrder.create({ data, select: { id: true } });
  }

  /** Optimistic update: only the row still at `version` changes; returns how many rows did. */
  async updateAtVersion(db: Db, id: string, version: number, data: Prisma.RepairOrderUncheckedUpdateManyInput) {
    const { count } = await db.repairOrder.updateMany({
      where: { id, version },
      data: { ...data, version: { increment: 1 }, updatedAt: new Date() },
    });
    return count;
  }

  /**
   * Records a move made from the order at `fromVersion` (0 for its opening). The database takes one move per
   * version, so of two moves decided on the same reading of the order only the first lands.
   */
  logStatus(db: Db, repairOrderId: string, from: RepairOrderStatus | null, to: RepairOrderStatus, byId: string, reason: string, fromVersion: number) {
    return db.statusChange.create({ data: { repairOrderId, fromStatus: from, toStatus: to, byId, reason, fromVersion } });
  }
}
