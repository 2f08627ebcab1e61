import { checkVin } from '../../engine/vin';
import type { RepairOrderDetail } from './repair-orders.repository';

/** The repair order as the API shows it: dates of each milestone derived from the status log. */
export function toDetailView(order: RepairOrderDetail) {
  const reached = (status: string) => {
    const last = [...order.statusLog].reverse().find((s) => s.toStatus === status);
    return last ? last.at.toISOString() : null;
  };
  const vin = checkVin(order.vehicle.vin, { outsideNorthAmerica: order.vehicle.outsideNorthAmerica });
  return {
    id: order.id,
    number: order.number,
    status: order.status,
    version: order.version,
    complaint: order.complaint,
    cause: order.cause,
    correction: order.correction,
    codes: order.codes,
    codesAfter: order.codesAfter,
    odometerIn: order.odometerIn,
    odometerOut: order.odometerOut,
    codesAfterCheck: order.codesAfterCheckedAt
      ? { method: order.codesAfterMethod, keyCycles: order.codesAfterKeyCycles, note: order.codesAfterNote, checkedAt: order.codesAfterCheckedAt.toISOString() }
      : null,
    vehicle: {
      id: order.vehicle.id,
      vin: order.vehicle.vin,
      checkDigit: vin.ok ? vin.checkDigit : 'invalid',
      builtOutsideNorthAmerica: order.vehicle.outsideNorthAmerica,
      highVoltageSystem: order.vehicle.highVoltageSystem,
      year: order.vehicle.year,
      make: order.vehicle.make,
      model: order.vehicle.model,
      engine: order.vehicle.engine,
      odometer: order.vehicle.odometer,
      odometerUnit: order.vehicle.odometerUnit,
    },
    technician: order.technician,
    createdBy: order.createdBy,
    dates: {
      opened: order.createdAt.toISOString(),
      repaired: reached('repaired'),
      verified: reached('verified'),
      closed: reached('closed'),
      updated: order.updatedAt.toISOString(),
    },
    statusLog: order.statusLog.map((s) => ({
      from: s.fromStatus,
      to: s.toStatus,
      reason: s.reason,
      by: s.by,
      at: s.at.toISOString(),
    })),
    circuits: order.circuits.map((c) => ({
      id: c.id,
      kind: c.kind,
      sensor: c.sensor,
      label: c.label,
      cavities: c.cavities,
      createdAt: c.createdAt.toISOString(),
    })),
  };
}
