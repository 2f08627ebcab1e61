import { Inject, Injectable } from '@nestjs/common';
import { APP_CONFIG, type AppConfig } from '../../config/config';
import type { CircuitKind } from '../../generated/prisma/client';
import { NotFoundException } from '../../common/errors/domain.exception';
import { diagnose, type Diagnosis, type Reading, type Repair, type ScanConditions, type Tree, type WorkContext } from '../../engine/diagnosis';
import { orderScope, type Actor } from '../identity/actor';
import { FaultTreeCatalog } from '../fault-trees/fault-tree-catalog.service';
import { MeasurementsRepository, type MeasurementRow } from '../measurements/measurements.repository';
import { requestOf } from '../measurements/measurements.view';
import { RepairOrdersRepository } from '../repair-orders/repair-orders.repository';
import { RepairsRepository, type RepairRow } from '../repairs/repairs.repository';

export function engineReading(m: MeasurementRow): Reading {
  return {
    id: m.id,
    request: requestOf(m),
    value: m.overload ? 'overload' : (m.valueSi as number),
    ...(m.quantity === 'scan_value' && m.siUnit ? { unit: m.siUnit } : {}),
    takenAt: m.takenAt.toISOString(),
    phase: m.phase,
    ...(m.supersededBy ? { supersededBy: m.supersededBy.id } : {}),
  };
}

/** `asDiagnosed`: as it stood before any repair; `conditions`: the temperatures the technician gave. */
export interface CircuitDiagnosisOptions {
  asDiagnosed?: boolean;
  conditions?: ScanConditions;
}

/**
 * The diagnosis of a circuit, recomputed from the stored readings and repairs with the tree version the circuit
 * started with. Nothing of it is stored: the readings are the truth.
 */
@Injectable()
export class DiagnosisService {
  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    private readonly orders: RepairOrdersRepository,
    private readonly measurements: MeasurementsRepository,
    private readonly repairs: RepairsRepository,
    private readonly trees: FaultTreeCatalog,
  ) {}

  /**
   * `asDiagnosed`: the diagnosis as it stood before any repair (diagnosis readings only, no repairs), which is
   * what a proof of repair states as the root cause; by default, the diagnosis now.
   */
  async forCircuit(
    actor: Actor,
    repairOrderId: string,
    circuitId: string,
    options: CircuitDiagnosisOptions = {},
  ): Promise<{ tree: Tree; diagnosis: Diagnosis; readings: MeasurementRow[]; context: WorkContext }> {
    const order = await this.orders.findHeaderWithCircuitsAndVehicle(orderScope(actor), repairOrderId);
    if (!order) throw new NotFoundException('repair_order', repairOrderId);
    const circuit = order.circuits.find((c) => c.id === circuitId);
    if (!circuit) throw new NotFoundException('circuit', circuitId, 'on this repair order');
    const context: WorkContext = { sensor: circuit.sensor, highVoltageSystem: order.vehicle.highVoltageSystem };
    return { ...(await this.ofCircuit(actor, repairOrderId, circuit, options)), context };
  }

  /**
   * The same for a circuit the caller has already found on an order the actor may see (recording a reading has,
   * inside its transaction), so that a reading and the diagnosis after it cost no lookups twice.
   */
  async ofCircuit(
    actor: Actor,
    repairOrderId: string,
    circuit: { id: string; kind: CircuitKind; faultTreeId: string | null },
    options: CircuitDiagnosisOptions = {},
    /** The circuit's readings (corrected ones included) and the order's repairs, when the caller read them already. */
    read?: { readings: MeasurementRow[]; repairs: Array<Pick<RepairRow, 'id' | 'part' | 'at' | 'circuitId'>> },
  ): Promise<{ tree: Tree; diagnosis: Diagnosis; readings: MeasurementRow[] }> {
    const circuitId = circuit.id;
    const tree = circuit.faultTreeId
      ? await this.trees.byStoredId(actor, circuit.faultTreeId)
      : (await this.measurements.transaction((tx) => this.trees.bindForCircuit(actor, circuit.kind, undefined, tx))).tree;
    const [readings, repairs] = read
      ? [read.readings, read.repairs]
      : await Promise.all([this.measurements.list(repairOrderId, { circuitId, includeSuperseded: true }), this.repairs.listForOrder(repairOrderId)]);
    const engineRepairs: Repair[] = options.asDiagnosed
      ? []
      : repairs.filter((r) => r.circuitId === null || r.circuitId === circuitId).map((r) => ({ id: r.id, part: r.part, at: r.at.toISOString() }));
    const counted = options.asDiagnosed ? readings.filter((m) => m.phase === 'diagnosis') : readings;
    // The codes read at intake weigh the causes of this circuit's sensor (which 5 V reference feeds it is not stored).
    const coded = await this.orders.codesForCircuit(repairOrderId, circuitId);
    const codes = coded ? { codes: coded.repairOrder.codes, sensor: coded.sensor } : undefined;
    const diagnosis = await diagnose(tree, counted.map(engineReading), engineRepairs, {
      concludeAt: this.config.concludeAt,
      codes,
      ...(options.conditions ? { conditions: options.conditions } : {}),
    });
    return { tree, diagnosis, readings };
  }
}
