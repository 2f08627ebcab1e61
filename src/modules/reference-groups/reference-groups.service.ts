import { Injectable } from '@nestjs/common';
import { ConflictException, InvalidInputException, NotFoundException } from '../../common/errors/domain.exception';
import type { Finding } from '../../engine/findings';
import { orderScope, type Actor } from '../identity/actor';
import { RepairOrdersRepository } from '../repair-orders/repair-orders.repository';
import type { CreateReferenceGroup } from './reference-groups.dto';
import { ReferenceGroupsRepository, type ReferenceGroupRow } from './reference-groups.repository';

export function referenceGroupView(g: ReferenceGroupRow) {
  return { id: g.id, repairOrderId: g.repairOrderId, circuitIds: g.circuitIds, source: g.source, note: g.note, createdBy: g.createdBy, createdAt: g.createdAt.toISOString() };
}

const KIND_WORDS: Record<string, string> = { two_wire_thermistor: 'a two-wire thermistor', shared_5v_reference: 'a shared-reference circuit' };

/** Which circuits of a repair order share one 5 V reference: grouped by the technician or by wire identification. */
@Injectable()
export class ReferenceGroupsService {
  constructor(
    private readonly groups: ReferenceGroupsRepository,
    private readonly orders: RepairOrdersRepository,
  ) {}

  async list(actor: Actor, repairOrderId: string) {
    const order = await this.orders.findHeader(orderScope(actor), repairOrderId);
    if (!order) throw new NotFoundException('repair_order', repairOrderId);
    return { items: (await this.groups.listActive(repairOrderId)).map(referenceGroupView) };
  }

  async create(actor: Actor, repairOrderId: string, input: CreateReferenceGroup) {
    const order = await this.orders.findHeaderWithCircuits(orderScope(actor), repairOrderId);
    if (!order) throw new NotFoundException('repair_order', repairOrderId);
    if (order.status === 'closed' || order.status === 'verified') {
      throw new ConflictException('repair_order.finished', `Repair order ${order.number} is ${order.status}; reopen it with a reason to group its circuits.`);
    }
    return this.groups.transaction(async (tx) => {
      const active = await this.groups.listActive(repairOrderId, tx);
      const findings: Finding[] = [];
      input.circuitIds.forEach((id, i) => {
        const path = `body.circuitIds[${i}]`;
        const circuit = order.circuits.find((c) => c.id === id);
        const other = active.find((g) => g.circuitIds.includes(id));
        if (!circuit) findings.push({ code: 'reference_group.unknown_circuit', path, message: `expected a circuit of this repair order; there is none with id ${id}` });
        else if (circuit.kind !== 'three_wire_5v') findings.push({ code: 'reference_group.not_three_wire', path, message: `expected a three-wire 5 V circuit; circuit ${id} is ${KIND_WORDS[circuit.kind] ?? circuit.kind}` });
        else if (other) findings.push({ code: 'reference_group.circuit_in_another_group', path, message: `circuit ${id} is already in reference group ${other.id}; a circuit is on one reference only (clear that group first)` });
      });
      if (findings.length) throw new InvalidInputException(findings);
      await this.orders.touch(tx, repairOrderId);
      const created = await this.groups.create(tx, { repairOrderId, circuitIds: input.circuitIds, source: input.source, note: input.note, createdById: actor.userId });
      return referenceGroupView(created);
    });
  }

  async clear(actor: Actor, repairOrderId: string, groupId: string) {
    const order = await this.orders.findHeader(orderScope(actor), repairOrderId);
    if (!order) throw new NotFoundException('repair_order', repairOrderId);
    const cleared = await this.groups.transaction(async (tx) => {
      const done = await this.groups.clear(tx, repairOrderId, groupId, actor.userId);
      if (done) await this.orders.touch(tx, repairOrderId);
      return done;
    });
    if (!cleared) throw new NotFoundException('reference_group', groupId, 'on this repair order');
    return { id: groupId, cleared: true as const };
  }
}
