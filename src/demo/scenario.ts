/**
 * The invented demo shop: people, vehicles and repair orders in every state. Nothing here describes a real
 * shop, person or vehicle; VINs are made up and given a valid 49 CFR 565 check digit at seeding time.
 */

export const DEMO_SHOP = {
  id: '5a0e1c3d-7b2f-4e61-9d0a-1f2e3d4c5b6a',
  name: 'Kestrel Row Motor Works',
  address: '418 Tannery Road, Millbrook Junction',
};

/**
 * Demo passwords are invented, printed at start-up, and pass the NIST SP 800-63B §5.1.1.2 rules the service
 * applies (a demo only: change or deactivate these people on a real install).
 */
export const DEMO_USERS = [
  { id: 'a1d0c0de-0000-4000-8000-00000000f001', name: 'Ines Halvorsen', email: 'ines@kestrel-row.example', role: 'foreman', password: 'amber lantern over the ramp' },
  { id: 'a1d0c0de-0000-4000-8000-00000000a001', name: 'Sam Lindqvist', email: 'sam@kestrel-row.example', role: 'admin', password: 'quiet ledger with nine keys' },
  { id: 'a1d0c0de-0000-4000-8000-00000000e001', name: 'Teo Marchetti', email: 'teo@kestrel-row.example', role: 'technician', password: 'copper fern under bay two' },
  { id: 'a1d0c0de-0000-4000-8000-00000000e002', name: 'Ruth Abernathy', email: 'ruth@kestrel-row.example', role: 'technician', password: 'slow river meets the probe' },
] as const;

/** A second invented shop of the same group: its people see only its own work, never Kestrel Row's. */
export const DEMO_SHOP_TWO = {
  id: '5a0e1c3d-7b2f-4e61-9d0a-2f3e4d5c6b7a',
  name: 'Fennick Yard Auto Electric',
  address: '27 Cooper Street, Ashgrove Flats',
};

export const DEMO_USERS_TWO = [
  { id: 'b2d0c0de-0000-4000-8000-00000000f001', name: 'Odile Prentiss', email: 'odile@fennick-yard.example', role: 'foreman', password: 'paper kite above the hoist' },
  { id: 'b2d0c0de-0000-4000-8000-00000000e001', name: 'Kwame Desrosiers', email: 'kwame@fennick-yard.example', role: 'technician', password: 'green meter, patient hands' },
] as const;

export const FOREMAN_TWO = DEMO_USERS_TWO[0].id;
export const TECH_TWO = DEMO_USERS_TWO[1].id;

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

/** A circuit whose readings the engine and the circuit model produce for an invented fault. */
export interface DemoCircuit {
  kind: 'three_wire_5v' | 'two_wire_thermistor';
  sensor: string;
  label: string;
  cavities: Record<string, string>;
  /** The fault the invented car has (a fault-tree hypothesis id). */
  fault: string;
  /** Stop the diagnosis after this many readings (a job still in progress). */
  stopAfter?: number;
  /** Type the reading with this index wrong first, then correct it (shows a struck correction on the proof). */
  typoAt?: number;
}

export interface DemoOrder {
  number: string;
  vehicle: string;
  technician: string;
  complaint: string;
  codes: string[];
  /** Days before seeding that it was opened. */
  openedDaysAgo: number;
  path: Status[];
  cause?: string;
  correction?: string;
  codesAfter?: string[];
  circuit?: DemoCircuit;
  repair?: { part: 'reference' | 'signal' | 'ground' | 'sensor' | 'module' | 'connector'; action: string; location: string; parts: Array<{ name: string; number?: string; quantity: number }> };
  /** Foreman decisions, in order. */
  reviews?: Array<{ decision: 'approved' | 'returned'; comment: string }>;
}

export const DEMO_ORDERS: DemoOrder[] = [
  {
    number: 'KR-24031',
    vehicle: 'pathline',
    technician: TEO,
    complaint: 'Reduced engine power message after rain; throttle pedal feels dead for a few seconds.',
    codes: ['P0122'],
    openedDaysAgo: 2,
    path: ['open', 'diagnosing', 'repaired', 'verified'],
    cause: 'TP sensor 1 signal wire chafed through on the intake bracket and open near the connector.',
    correction: 'Cut out the damaged section, spliced in new wire with sealed crimp sleeves, re-routed clear of the bracket.',
    codesAfter: [],
    circuit: { kind: 'three_wire_5v', sensor: 'TP A', label: 'TP sensor 1', cavities: { A: 'reference', B: 'signal', C: 'ground' }, fault: 'signal_open', typoAt: 1 },
    repair: {
      part: 'signal',
      action: 'Spliced the signal wire with sealed crimp sleeves and re-routed the harness clear of the intake bracket',
      location: 'signal wire, 12 cm from the TP sensor connector',
      parts: [
        { name: 'Sealed crimp splice sleeve, 0.5 mm²', number: 'KR-SPL-05', quantity: 2 },
        { name: 'Harness tape, cloth', quantity: 1 },
      ],
    },
  },
  {
    number: 'KR-24035',
    vehicle: 'ridgeback',
    technician: RUTH,
    complaint: 'Check-engine light on, hard start when cold; coolant gauge reads cold all the time.',
    codes: ['P0118'],
    openedDaysAgo: 1,
    path: ['open', 'diagnosing'],
    circuit: { kind: 'two_wire_thermistor', sensor: 'ECT', label: 'ECT sensor', cavities: { '1': 'signal', '2': 'ground' }, fault: 'signal_open', stopAfter: 2 },
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
    cause: 'APP sensor 1 ground terminal corroded: high resistance in the sensor ground.',
    correction: 'Replaced the ground terminal with a new one and sealed the connector.',
    codesAfter: [],
    circuit: { kind: 'three_wire_5v', sensor: 'APP D', label: 'APP sensor 1', cavities: { '1': 'reference', '2': 'signal', '3': 'ground' }, fault: 'ground_high_resistance' },
    repair: {
      part: 'ground',
      action: 'Replaced the corroded sensor-ground terminal and sealed the connector',
      location: 'sensor ground, cavity 3 of the APP sensor connector',
      parts: [{ name: 'Connector terminal, 0.64 mm', number: 'KR-TRM-064', quantity: 1 }],
    },
    reviews: [{ decision: 'approved', comment: 'Terminal replaced, readings good.' }],
  },
  {
    number: 'KR-24037',
    vehicle: 'pathline-new',
    technician: TEO,
    complaint: 'Fuel-tank pressure code after refuelling.',
    codes: ['P0452'],
    openedDaysAgo: 3,
    path: ['open', 'diagnosing'],
    circuit: { kind: 'three_wire_5v', sensor: 'FTP', label: 'FTP sensor', cavities: { '1': 'ground', '2': 'signal', '3': 'reference' }, fault: 'reference_short_ground', stopAfter: 3 },
  },
];

/** The second shop's one car and one job, in diagnosis. */
export const DEMO_VEHICLES_TWO = [
  { key: 'tarsel', vin: '7XTKV3A1?RK600215', year: 2024, make: 'Kovan', model: 'Tarsel', engine: '1.5 L I3 turbo', odometer: 28_745 },
] as const;

export const DEMO_ORDERS_TWO: DemoOrder[] = [
  {
    number: 'FY-1108',
    vehicle: 'tarsel',
    technician: TECH_TWO,
    complaint: 'Temperature gauge pegged hot on a cold engine; fan runs all the time.',
    codes: ['P0117'],
    openedDaysAgo: 1,
    path: ['open', 'diagnosing'],
    circuit: { kind: 'two_wire_thermistor', sensor: 'ECT', label: 'ECT sensor', cavities: { '1': 'signal', '2': 'ground' }, fault: 'signal_short_ground', stopAfter: 2 },
  },
];
