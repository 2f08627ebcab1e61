import { Injectable } from '@nestjs/common';
import { ConflictException, InvalidInputException, NotFoundException, type Finding } from '../../common/errors/domain.exception';
import { isUniqueViolation } from '../../common/database/prisma-errors';
import { ZodPipe } from '../../common/validation/zod-input';
import type { Prisma, RepairOrderStatus } from '../../generated/prisma/client';
import type { Actor } from '../identity/actor';
import { RepairOrdersRepository } from '../repair-orders/repair-orders.repository';
import { MeasurementBatch, MeasurementInput, type ListMeasurements } from './measurements.dto';
import { MeasurementsRepository } from './measurements.repository';
import { measurementView } from './measurements.view';

/** Which phase of reading each status accepts. */
const PHASES_BY_STATUS: Record<RepairOrderStatus, ReadonlyArray<'diagnosis' | 'verification'>> = {
  open: ['diagnosis'],
  diagnosing: ['diagnosis'],
  repaired: ['verification'],
  verified: [],
  closed: [],
};

@Injectable()
export class MeasurementsService {
  private readonly one = new ZodPipe(MeasurementInput, 'body');
  private readonly many = new ZodPipe(MeasurementBatch, 'body');

  constructor(
    private readonly measurements: MeasurementsRepository,
    private readonly orders: RepairOrdersRepository,
  ) {}

  /** One reading or a batch; a batch is stored all-or-nothing. */
  async record(actor: Actor, repairOrderId: string, body: unknown) {
    const batch = Array.isArray(body);
    const inputs = batch ? this.many.transform(body) : [this.one.transform(body)];
    const at = (i: number, field: string) => (batch ? `body.${i}.${field}` : `body.${field}`);
    try {
      const rows = await this.measurements.transaction(async (tx) => {
        const order = await this.orders.findHeader(actor.shopId, repairOrderId, tx);
        if (!order) throw new NotFoundException('repair_order', repairOrderId);
        this.requirePhases(order, inputs);
        await this.requireReferences(repairOrderId, inputs, at, tx);
        const now = Date.now();
        const created = await this.measurements.insertMany(
          tx,
          inputs.map((m) => ({
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
            valueEntered: m.value,
            unitEntered: m.unit,
            valueSi: m.valueSi,
            overload: m.overload,
            siUnit: m.siUnit,
            meterOhms: m.meterOhms,
            phase: m.phase,
            note: m.note,
            supersedesId: m.supersedes ?? null,
            takenById: actor.userId,
            takenAt: new Date(m.takenAt ?? now),
          })),
        );
        if (order.status === 'open') {
          // The first reading starts the diagnosis.
          await this.orders.updateAtVersion(tx, repairOrderId, order.version, { status: 'diagnosing' });
          await this.orders.logStatus(tx, repairOrderId, 'open', 'diagnosing', actor.userId, 'first reading recorded');
        }
        return created;
      });
      const views = rows.map(measurementView);
      return batch ? { items: views } : views[0];
    } catch (error) {
      if (isUniqueViolation(error, 'supersedes')) {
        throw new ConflictException('measurement.already_corrected', 'That reading was corrected at the same moment by someone else; reload and correct the latest one.');
      }
      throw error;
    }
  }

  async list(actor: Actor, repairOrderId: string, query: ListMeasurements) {
    const order = await this.orders.findHeader(actor.shopId, repairOrderId);
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

  private async requireReferences(
    repairOrderId: string,
    inputs: MeasurementInput[],
    at: (i: number, field: string) => string,
    tx: Prisma.TransactionClient,
  ): Promise<void> {
    const findings: Finding[] = [];
    const circuits = new Set((await this.measurements.circuitIds(repairOrderId, tx)).map((c) => c.id));
    inputs.forEach((m, i) => {
      if (!circuits.has(m.circuitId)) findings.push({ code: 'circuit.not_found', path: at(i, 'circuitId'), message: 'names no circuit of this repair order' });
    });
    const targetIds = inputs.flatMap((m) => (m.supersedes ? [m.supersedes] : []));
    const targets = new Map((await this.measurements.correctionTargets(repairOrderId, targetIds, tx)).map((t) => [t.id, t]));
    const seen = new Set<string>();
    inputs.forEach((m, i) => {
      if (!m.supersedes) return;
      const target = targets.get(m.supersedes);
      const path = at(i, 'supersedes');
      if (!target) findings.push({ code: 'measurement.not_found', path, message: 'names no reading of this repair order' });
      else if (target.supersededBy) findings.push({ code: 'measurement.already_corrected', path, message: `that reading was already corrected by ${target.supersededBy.id}; correct that one instead` });
      else if (target.circuitId !== m.circuitId) findings.push({ code: 'measurement.other_circuit', path, message: 'a correction must be on the same circuit as the reading it corrects' });
      else if (seen.has(m.supersedes)) findings.push({ code: 'measurement.corrected_twice', path, message: 'the batch corrects this reading twice' });
      seen.add(m.supersedes);
    });
    if (findings.length) throw new InvalidInputException(findings);
  }
}
