/**
 * Canonical keys for measurement requests: a reading answers a test when the two requests have the same key
 * (quantity, at, against, location, connector, key, engine, the sensor's input, jumpers, pid). Jumper order does not matter.
 */
import type { Jumper, MeasurementRequest } from '../vocabulary';

/** A measurement request as trees use it: the shared vocabulary (with `sensor` for shared references). */
export type TreeRequest = MeasurementRequest;

/** Stable JSON: object keys sorted, undefined dropped. Used for request keys and tree content hashes. */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') return JSON.stringify(value) ?? 'null';
  if (Array.isArray(value)) return `[${value.map((v) => canonicalJson(v === undefined ? null : v)).join(',')}]`;
  const entries = Object.entries(value as Record<string, unknown>)
    .filter(([, v]) => v !== undefined)
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
}

function jumperKey(jumper: Jumper): string {
  return canonicalJson(jumper);
}

export function requestKey(request: TreeRequest): string {
  return canonicalJson({
    quantity: request.quantity,
    at: request.at,
    against: request.against,
    location: request.location,
    connector: request.connector,
    againstLocation: request.againstLocation,
    otherConnector: request.otherConnector,
    key: request.key,
    engine: request.engine,
    // At rest is the default: an old request without the field and one that says at_rest are the same reading.
    sensorInput: request.sensorInput === 'moved' ? 'moved' : undefined,
    jumpers: [...(request.jumpers ?? [])].map(jumperKey).sort(),
    pid: request.pid,
    sensor: request.sensor,
  });
}

/** The same request with some conditions changed (e.g. the engine cranking for a scan re-read). */
export function withConditions(request: TreeRequest, change: Partial<TreeRequest>): TreeRequest {
  return { ...request, ...change, jumpers: (change.jumpers ?? request.jumpers).map((j) => ({ ...j, via: { ...j.via } })) };
}

/** The signal-changing part of a request: connector state and jumpers. */
export function signalSetupKey(request: TreeRequest): string {
  return canonicalJson({ connector: request.connector, otherConnector: request.otherConnector, sensor: request.sensor, jumpers: [...request.jumpers].map(jumperKey).sort() });
}
