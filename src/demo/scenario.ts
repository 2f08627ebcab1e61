/**
 * The invented demo shop: people, vehicles and repair orders in every state. Nothing here describes a real
 * shop, person or vehicle; VINs are made up and given a valid 49 CFR 565 check digit at seeding time.
 */
import type { MeasurementRequest } from '../engine/vocabulary';

export const DEMO_SHOP = {
  id: '5a0e1c3d-7b2f-4e61-9d0a-1f2e3d4c5b6a',
  name: 'Kestrel Row Motor Works',
  address: '418 Tannery Road, Millbrook Junction',
};

export const DEMO_USERS = [
  { id: 'a1d0c0de-0000-4000-8000-00000000f001', name: 'Ines Halvorsen', email: 'ines@kestrel-row.example', role: 'foreman' },
  { id: 'a1d0c0de-0000-4000-8000-00000000a001', name: 'Sam Lindqvist', email: 'sam@kestrel-row.example', role: 'admin' },
  { id: 'a1d0c0de-0000-4000-8000-00000000e001', name: 'Teo Marchetti', email: 'teo@kestrel-row.example', role: 'technician' },
  { id: 'a1d0c0de-0000-4000-8000-00000000e002', name: 'Ruth Abernathy', email: 'ruth@kestrel-row.example', role: 'technician' },
] as const;

export const FOREMAN = DEMO_USERS[0].id;
export const TEO = DEMO_USERS[2].id;
export const RUTH = DEMO_USERS[3].id;

/** VINs without a valid check digit yet: the seed computes position 9. */
export const DEMO_VEHICLES = [
  { key: 'pathline', vin: '7XTRN4C2?RK100417', year: 2024, make: 'Norrin', model: 'Pathline', engine: '2.0 L I4', odometer: 41_220 },
  { key: 'kessa', vin: '7XTRN4C2?PK203388', year: 2023, make: 'Norrin', model: 'Kessa', engine: '1.6 L I4', odometer: 67_904 },
  { key: 'ridgeback', vin: '7XTAV2B1?SK310952', year: 2025, make: 'Altavue', model: 'Ridgeback', engine: '3.5 L V6', odometer: 12_385 },
  { key: 'ridgeback-old', vin: '7XTAV2B1?NK417726', year: 2022, make: 'Altavue', model: 'Ridgeback', engine: '3.5 L V6', odometer: 98_310 },
  { key: 'pathline-new', vin: '7XTRN6D2?TK520064', year: 2026, make: 'Norrin', model: 'Pathline', engine: '2.0 L I4 turbo', odometer: 3_118 },
] as const;

type Status = 'open' | 'diagnosing' | 'repaired' | 'verified' | 'closed';

export interface DemoReading {
  request: MeasurementRequest;
  value: number;
  unit: string;
  phase?: 'diagnosis' | 'verification';
  note?: string;
  /** Minutes after the repair order was opened. */
  minute: number;
  /** This reading corrects the one with that index in the list. */
  corrects?: number;
}

export interface DemoOrder {
  number: string;
  vehicle: (typeof DEMO_VEHICLES)[number]['key'];
  technician: string;
  complaint: string;
  codes: string[];
  /** Days before seeding that it was opened. */
  openedDaysAgo: number;
  path: Status[];
  cause?: string;
  correction?: string;
  codesAfter?: string[];
  circuit?: { kind: 'three_wire_5v' | 'two_wire_thermistor'; sensor: string; label: string; cavities: Record<string, string> };
  readings?: DemoReading[];
}

const koeo = { key: 'on', engine: 'off', jumpers: [] } as const;
const v = (at: MeasurementRequest['at'], against: MeasurementRequest['against'], location: MeasurementRequest['location'], connector: MeasurementRequest['connector']): MeasurementRequest => ({
  quantity: 'dc_volts',
  at,
  against,
  location,
  connector,
  ...koeo,
  jumpers: [],
});

export const DEMO_ORDERS: DemoOrder[] = [
  {
    number: 'KR-24031',
    vehicle: 'pathline',
    technician: TEO,
    complaint: 'Reduced engine power message after rain; throttle pedal feels dead for a few seconds.',
    codes: ['P0122'],
    openedDaysAgo: 6,
    path: ['open', 'diagnosing', 'repaired', 'verified'],
    cause: 'TP sensor 1 signal wire chafed through on the intake bracket and open near the connector.',
    correction: 'Cut out the damaged section, spliced in new wire with sealed crimp sleeves, re-routed clear of the bracket.',
    codesAfter: [],
    circuit: { kind: 'three_wire_5v', sensor: 'TP', label: 'TP sensor 1', cavities: { A: 'reference', B: 'signal', C: 'ground' } },
    readings: [
      { request: v('reference', 'battery_negative', 'sensor_connector', 'backprobed'), value: 5.01, unit: 'V', minute: 12 },
      { request: v('signal', 'battery_negative', 'sensor_connector', 'backprobed'), value: 0.62, unit: 'V', minute: 15 },
      { request: v('signal', 'battery_negative', 'module_connector', 'backprobed'), value: 4.78, unit: 'V', minute: 24, note: 'typed 4.78 by mistake' },
      { request: v('signal', 'battery_negative', 'module_connector', 'backprobed'), value: 4.87, unit: 'V', minute: 26, corrects: 2 },
      { request: v('ground', 'battery_negative', 'sensor_connector', 'backprobed'), value: 0.02, unit: 'V', minute: 29 },
      { request: v('signal', 'battery_negative', 'module_connector', 'backprobed'), value: 0.63, unit: 'V', phase: 'verification', minute: 95 },
      { request: v('reference', 'battery_negative', 'sensor_connector', 'backprobed'), value: 5.0, unit: 'V', phase: 'verification', minute: 97 },
      { request: v('ground', 'battery_negative', 'sensor_connector', 'backprobed'), value: 0.02, unit: 'V', phase: 'verification', minute: 98 },
    ],
  },
  {
    number: 'KR-24035',
    vehicle: 'ridgeback',
    technician: RUTH,
    complaint: 'Check-engine light on, hard start when cold; coolant gauge reads cold all the time.',
    codes: ['P0118'],
    openedDaysAgo: 1,
    path: ['open', 'diagnosing'],
    circuit: { kind: 'two_wire_thermistor', sensor: 'ECT', label: 'ECT sensor', cavities: { '1': 'signal', '2': 'ground' } },
    readings: [
      { request: v('signal', 'battery_negative', 'sensor_connector', 'backprobed'), value: 4.96, unit: 'V', minute: 8 },
      { request: { ...v('signal', 'ground', 'sensor_connector', 'unplugged'), key: 'on' }, value: 4.99, unit: 'V', minute: 14 },
    ],
  },
  {
    number: 'KR-24036',
    vehicle: 'kessa',
    technician: TEO,
    complaint: 'Stalls at idle when coming to a stop; MAP reading looks high on the scan tool.',
    codes: ['P0108'],
    openedDaysAgo: 0,
    path: ['open'],
  },
  {
    number: 'KR-24029',
    vehicle: 'ridgeback-old',
    technician: RUTH,
    complaint: 'Intermittent pedal-position warning on the highway.',
    codes: ['P2138'],
    openedDaysAgo: 12,
    path: ['open', 'diagnosing', 'repaired', 'verified', 'closed'],
    cause: 'APP sensor connector terminal spread and loose on the signal cavity.',
    correction: 'Replaced the connector terminal with a new one; verified signal sweep.',
    codesAfter: [],
  },
  {
    number: 'KR-24037',
    vehicle: 'pathline-new',
    technician: TEO,
    complaint: 'Fuel-tank pressure code after refuelling.',
    codes: ['P0452'],
    openedDaysAgo: 3,
    path: ['open', 'diagnosing', 'repaired'],
    cause: 'FTP sensor ground terminal corroded (high resistance).',
    correction: 'Cleaned and re-pinned the ground terminal; applied dielectric grease.',
    codesAfter: [],
    circuit: { kind: 'three_wire_5v', sensor: 'FTP', label: 'FTP sensor', cavities: { '1': 'ground', '2': 'signal', '3': 'reference' } },
    readings: [{ request: v('ground', 'battery_negative', 'sensor_connector', 'backprobed'), value: 0.41, unit: 'V', minute: 18 }],
  },
];
