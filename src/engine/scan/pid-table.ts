import type { Unit } from '../units';

/**
 * SAE J1979 service $01 parameters this product reads, as tagged data: each entry carries its byte count, unit,
 * range and its own decoder. Formulas as reproduced on the public "OBD-II PIDs" reference page (A = first data
 * byte, B = second).
 */

export type PidValue =
  | { kind: 'measurement'; value: number; unit: Unit }
  | { kind: 'supported_pids'; value: string[]; unit: null };

export interface PidDefinition {
  /** Two upper-case hex digits, e.g. "0C". */
  pid: string;
  name: string;
  /** SAE J1930 acronym of the sensor or signal, where there is one. */
  j1930?: string;
  bytes: number;
  unit: Unit | null;
  /** Smallest and largest value the formula can give. */
  range: { min: number; max: number } | null;
  decode: (bytes: readonly number[]) => PidValue;
}

const hex2 = (n: number) => n.toString(16).toUpperCase().padStart(2, '0');

/** Bit 7 of the first byte stands for the PID one above the request, on through bit 0 of the fourth byte. */
function supportedBitmap(base: number): PidDefinition['decode'] {
  return (bytes) => {
    const pids: string[] = [];
    bytes.forEach((byte, i) => {
      for (let bit = 7; bit >= 0; bit--) {
        if (byte & (1 << bit)) pids.push(hex2(base + i * 8 + (8 - bit)));
      }
    });
    return { kind: 'supported_pids', value: pids, unit: null };
  };
}

function temperature(pid: string, name: string, j1930: string): PidDefinition {
  return {
    pid, name, j1930, bytes: 1, unit: '°C', range: { min: -40, max: 215 },
    decode: ([a]) => ({ kind: 'measurement', value: a - 40, unit: '°C' }),
  };
}

function pressureKpa(pid: string, name: string, j1930: string): PidDefinition {
  return {
    pid, name, j1930, bytes: 1, unit: 'kPa', range: { min: 0, max: 255 },
    decode: ([a]) => ({ kind: 'measurement', value: a, unit: 'kPa' }),
  };
}

function percent(pid: string, name: string, j1930?: string): PidDefinition {
  return {
    pid, name, ...(j1930 ? { j1930 } : {}), bytes: 1, unit: '%', range: { min: 0, max: 100 },
    decode: ([a]) => ({ kind: 'measurement', value: (100 * a) / 255, unit: '%' }),
  };
}

export const PID_DEFINITIONS: readonly PidDefinition[] = [
  { pid: '00', name: 'PIDs supported [01–20]', bytes: 4, unit: null, range: null, decode: supportedBitmap(0x00) },
  temperature('05', 'Engine coolant temperature', 'ECT'),
  pressureKpa('0B', 'Intake manifold absolute pressure', 'MAP'),
  {
    pid: '0C', name: 'Engine speed', j1930: 'RPM', bytes: 2, unit: 'rpm', range: { min: 0, max: 16383.75 },
    decode: ([a, b]) => ({ kind: 'measurement', value: (256 * a + b) / 4, unit: 'rpm' }),
  },
  temperature('0F', 'Intake air temperature', 'IAT'),
  percent('11', 'Absolute throttle position', 'TP'),
  pressureKpa('33', 'Absolute barometric pressure', 'BARO'),
  {
    pid: '42', name: 'Control module voltage', bytes: 2, unit: 'V', range: { min: 0, max: 65.535 },
    decode: ([a, b]) => ({ kind: 'measurement', value: (256 * a + b) / 1000, unit: 'V' }),
  },
  percent('47', 'Absolute throttle position B', 'TP'),
  percent('49', 'Accelerator pedal position D', 'APP'),
  percent('4A', 'Accelerator pedal position E', 'APP'),
  percent('4C', 'Commanded throttle actuator'),
];

export const PIDS: ReadonlyMap<string, PidDefinition> = new Map(PID_DEFINITIONS.map((d) => [d.pid, d]));
