import { Injectable } from '@nestjs/common';
import { ConflictException, NotFoundException } from '../../common/errors/domain.exception';
import { sensorTerm } from '../../engine/sensors';
import type { Circuit } from '../../generated/prisma/client';
import { FaultTreeCatalog } from '../fault-trees/fault-tree-catalog.service';
import { orderScope, type Actor } from '../identity/actor';
import { RepairOrdersRepository } from '../repair-orders/repair-orders.repository';
import type { CreateCircuit } from './circuits.dto';
import { CircuitsRepository } from './circuits.repository';

type CircuitWithTree = Circuit & { faultTree: { id: string; treeId: string; version: string } | null };

export function circuitView(c: CircuitWithTree) {
  const term = sensorTerm(c.sensor);
  return {
    id: c.id,
    repairOrderId: c.repairOrderId,
    kind: c.kind,
    sensor: c.sensor,
    sensorTerm: term ? { term: term.term, name: term.name } : null,
    label: c.label,
    cavities: c.cavities as Record<string, string>,
    faultTree: c.faultTree,
    createdAt: c.createdAt.toISOString(),
  };
}

@Injectable()
export class CircuitsService {
  constructor(
    private readonly circuits: CircuitsRepository,
    private readonly orders: RepairOrdersRepository,
    private readonly trees: FaultTreeCatalog,
  ) {}

  async create(actor: Actor, repairOrderId: string, input: CreateCircuit) {
    const order = await this.orders.findHeader(orderScope(actor), repairOrderId);
    if (!order) throw new NotFoundException('repair_order', repairOrderId);
    if (order.status === 'closed' || order.status === 'verified') {
      throw new ConflictException('repair_order.finished', `Repair order ${order.number} is ${order.status}; reopen it with a reason to add a circuit.`);
    }
    const created = await this.circuits.transaction(async (tx) => {
      const tree = await this.trees.bindForCircuit(actor, input.kind, input.treeId, tx);
      await this.orders.touch(tx, repairOrderId);
      return this.circuits.create(tx, {
        repairOrderId,
        kind: input.kind,
        sensor: input.sensor,
        label: input.label,
        cavities: input.cavities,
        faultTreeId: tree.id,
        createdById: actor.userId,
      });
    });
    return circuitView(created);
  }

  async list(actor: Actor, repairOrderId: string) {
    const order = await this.orders.findHeader(orderScope(actor), repairOrderId);
    if (!order) throw new NotFoundException('repair_order', repairOrderId);
    return { items: (await this.circuits.listForOrder(repairOrderId)).map(circuitView) };
  }
}
