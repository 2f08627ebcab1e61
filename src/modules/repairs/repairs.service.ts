import { Injectable } from '@nestjs/common';
import { ConflictException, InvalidInputException, NotFoundException } from '../../common/errors/domain.exception';
import { orderScope, type Actor } from '../identity/actor';
import { CircuitsRepository } from '../circuits/circuits.repository';
import { RepairOrdersRepository } from '../repair-orders/repair-orders.repository';
import type { RecordRepair } from './repairs.dto';
import { RepairsRepository, type RepairRow } from './repairs.repository';

export function repairView(r: RepairRow) {
  return {
    id: r.id,
    circuitId: r.circuitId,
    part: r.part,
    action: r.action,
    location: r.location,
    parts: r.parts as Array<{ name: string; number?: string; quantity: number }>,
    note: r.note,
    labour: { clockOnAt: r.clockOnAt?.toISOString() ?? null, clockOffAt: r.clockOffAt?.toISOString() ?? null, minutes: r.labourMinutes },
    by: r.by,
    at: r.at.toISOString(),
  };
}

/** The same repair as one already recorded: what a double-sent request looks like. */
function sameRepair(r: RepairRow, input: RecordRepair): boolean {
  return (
    r.circuitId === (input.circuitId ?? null) &&
    r.part === input.part &&
    r.action === input.action &&
    r.location === input.location &&
    r.note === input.note &&
    JSON.stringify(r.parts) === JSON.stringify(input.parts)
  );
}

@Injectable()
export class RepairsService {
  constructor(
    private readonly repairs: RepairsRepository,
    private readonly orders: RepairOrdersRepository,
    private readonly circuits: CircuitsRepository,
  ) {}

  /** Records a repair; the first one on a diagnosing repair order marks it repaired (ready for verification). */
  async record(actor: Actor, repairOrderId: string, input: RecordRepair) {
    const row = await this.repairs.transaction(async (tx) => {
      const order = await this.orders.findHeader(orderScope(actor), repairOrderId, tx);
      if (!order) throw new NotFoundException('repair_order', repairOrderId);
      if (order.status !== 'diagnosing' && order.status !== 'repaired') {
        throw new ConflictException(
          'repair.wrong_status',
          `Repair order ${order.number} is ${order.status}: repairs are recorded while diagnosing or repaired.`,
          { status: order.status },
        );
      }
      if (input.circuitId && !(await this.circuits.findInOrder(repairOrderId, input.circuitId, tx))) {
        throw new InvalidInputException([{ code: 'circuit.not_found', path: 'body.circuitId', message: 'names no circuit of this repair order' }]);
      }
      const latest = (await this.repairs.listForOrder(repairOrderId, tx)).at(-1);
      if (latest && sameRepair(latest, input)) {
        throw new ConflictException('repair.duplicate', `This repair is already recorded on ${order.number} (${latest.by.name}, ${latest.at.toISOString()}); a repair sent twice is stored once.`, { repairId: latest.id });
      }
      const created = await this.repairs.create(tx, {
        repairOrderId,
        circuitId: input.circuitId ?? null,
        part: input.part,
        action: input.action,
        location: input.location,
        parts: input.parts,
        note: input.note,
        clockOnAt: input.clockOnAt ? new Date(input.clockOnAt) : null,
        clockOffAt: input.clockOffAt ? new Date(input.clockOffAt) : null,
        labourMinutes: input.labourMinutes ?? null,
        byId: actor.userId,
      });
      // Each repair moves the order to its next version: another repair (or move) that landed since the order was
      // read makes this one lose, so repairs sent together are stored once and never log the same move twice.
      const status = order.status === 'diagnosing' ? { status: 'repaired' as const } : {};
      if ((await this.orders.updateAtVersion(tx, repairOrderId, order.version, status)) !== 1) {
        throw new ConflictException('repair.order_changed', `Repair order ${order.number} changed at the same moment (another repair or status move); reload it and record the repair again if it is still needed.`);
      }
      if (order.status === 'diagnosing') await this.orders.logStatus(tx, repairOrderId, 'diagnosing', 'repaired', actor.userId, 'repair recorded', order.version);
      return created;
    });
    return repairView(row);
  }

  async list(actor: Actor, repairOrderId: string) {
    const order = await this.orders.findHeader(orderScope(actor), repairOrderId);
    if (!order) throw new NotFoundException('repair_order', repairOrderId);
    return { items: (await this.repairs.listForOrder(repairOrderId)).map(repairView) };
  }
}
