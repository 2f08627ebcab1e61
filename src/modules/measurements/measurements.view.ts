import type { Jumper, MeasurementRequest } from '../../engine/vocabulary';
import type { MeasurementRow } from './measurements.repository';

export function requestOf(m: MeasurementRow): MeasurementRequest {
  return {
    quantity: m.quantity,
    at: m.at,
    ...(m.against ? { against: m.against } : {}),
    location: m.location,
    connector: m.connector,
    ...(m.againstLocation ? { againstLocation: m.againstLocation } : {}),
    ...(m.otherConnector ? { otherConnector: m.otherConnector } : {}),
    key: m.key,
    engine: m.engine,
    ...(m.sensorInput ? { sensorInput: m.sensorInput } : {}),
    jumpers: m.jumpers as unknown as Jumper[],
    ...(m.pid ? { pid: m.pid } : {}),
    ...(m.sensor ? { sensor: m.sensor } : {}),
  };
}

export function measurementView(m: MeasurementRow) {
  return {
    id: m.id,
    circuitId: m.circuitId,
    request: requestOf(m),
    value: { entered: m.overload ? 'OL' : m.valueEntered, unit: m.unitEntered, si: m.valueSi, siUnit: m.siUnit, overload: m.overload },
    meterOhms: m.meterOhms,
    phase: m.phase,
    note: m.note,
    takenBy: m.takenBy,
    takenAt: m.takenAt.toISOString(),
    supersedes: m.supersedesId,
    clientKey: m.clientKey,
    supersededBy: m.supersededBy
      ? { id: m.supersededBy.id, by: m.supersededBy.takenBy, at: m.supersededBy.takenAt.toISOString() }
      : null,
  };
}
