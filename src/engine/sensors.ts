/**
 * Sensor names from SAE J1930 (electrical/electronic systems diagnostic terms) that Tracebay knows how to
 * model, with the circuit kind each one usually is. Other names are accepted as free text.
 */
import type { CircuitKind } from './vocabulary';

export interface SensorTerm {
  term: string;
  name: string;
  usualKind: CircuitKind;
}

export const SENSOR_TERMS: readonly SensorTerm[] = [
  { term: 'TP', name: 'throttle position', usualKind: 'three_wire_5v' },
  { term: 'APP', name: 'accelerator pedal position', usualKind: 'three_wire_5v' },
  { term: 'MAP', name: 'manifold absolute pressure', usualKind: 'three_wire_5v' },
  { term: 'BARO', name: 'barometric pressure', usualKind: 'three_wire_5v' },
  { term: 'FTP', name: 'fuel tank pressure', usualKind: 'three_wire_5v' },
  { term: 'FRP', name: 'fuel rail pressure', usualKind: 'three_wire_5v' },
  { term: 'EGR', name: 'exhaust gas recirculation valve position', usualKind: 'three_wire_5v' },
  { term: 'ECT', name: 'engine coolant temperature', usualKind: 'two_wire_thermistor' },
  { term: 'IAT', name: 'intake air temperature', usualKind: 'two_wire_thermistor' },
  { term: 'EOT', name: 'engine oil temperature', usualKind: 'two_wire_thermistor' },
  { term: 'TFT', name: 'transmission fluid temperature', usualKind: 'two_wire_thermistor' },
];

/** The J1930 entry a free-text sensor name starts with ("TP sensor 2" → TP), if any. */
export function sensorTerm(text: string): SensorTerm | undefined {
  const head = text.trim().split(/[\s_-]+/)[0]?.toUpperCase() ?? '';
  return SENSOR_TERMS.find((s) => s.term === head);
}

/** Sensors whose input the throttle or pedal moves with the engine stopped (key on): position sensors. */
const PEDAL_MOVED_TERMS: readonly string[] = ['TP', 'APP'];

/**
 * Whether pressing the throttle or pedal moves this sensor's input: true for TP and APP, false for any other known
 * SAE J1930 sensor (a pressure sensor moves only with the engine running), undefined when the name is not a term.
 */
export function pedalMovesInput(sensor: string | undefined): boolean | undefined {
  const term = sensor === undefined ? undefined : sensorTerm(sensor);
  return term ? PEDAL_MOVED_TERMS.includes(term.term) : undefined;
}
