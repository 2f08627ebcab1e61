/**
 * Safety cautions as tagged data: each entry says in plain words what to watch for and decides itself whether a
 * measurement request needs it. Tree loading adds any caution a test's request needs but the tree forgot.
 * Wording is our own; always defer to the manufacturer's service information.
 */
import type { MeasurementRequest } from '../vocabulary';

export interface CautionKind {
  id: string;
  text: string;
  /** True when a test with this request must show the caution. */
  appliesTo(request: MeasurementRequest): boolean;
}

const touchesReference = (request: MeasurementRequest) =>
  request.jumpers.some((j) => j.from === 'reference' || j.to === 'reference');

export const CAUTION_KINDS: readonly CautionKind[] = [
  {
    id: 'engine_turning',
    text:
      'The engine will crank or run: work where the exhaust is ventilated or extracted, set the parking brake with the ' +
      'transmission in park or neutral, and keep hands, leads and clothing clear of belts and fans.',
    appliesTo: (r) => r.engine === 'cranking' || r.engine === 'running',
  },
  {
    id: 'fused_jumper_only',
    text: 'Use a fused jumper lead only; never bridge with bare wire.',
    appliesTo: (r) => r.jumpers.length > 0,
  },
  {
    id: 'no_battery_on_reference',
    text: 'Never put battery voltage on the 5 V reference or on the signal wire: it can destroy the module.',
    appliesTo: (r) => touchesReference(r) || r.jumpers.some((j) => j.from === 'battery_positive' || j.to === 'battery_positive'),
  },
  {
    id: 'backprobe_gently',
    text: 'Back-probe along the wire at the rear of the connector without spreading, bending or forcing the terminals.',
    appliesTo: (r) => r.connector === 'backprobed',
  },
  {
    id: 'ohms_unpowered',
    text:
      'Ohms checks only with the key off and the circuit unpowered; never use an ohmmeter on airbag (supplemental ' +
      'restraint) circuits.',
    appliesTo: (r) => r.quantity === 'ohms',
  },
  {
    id: 'unplug_key_off',
    text: 'Turn the key off before unplugging or plugging a connector; check the terminals for corrosion or spread pins.',
    appliesTo: (r) => r.connector === 'unplugged',
  },
  {
    id: 'service_information',
    text: "Follow the manufacturer's service information for this vehicle where it differs from these steps.",
    appliesTo: () => true,
  },
];

const BY_ID = new Map(CAUTION_KINDS.map((c) => [c.id, c]));

export function cautionKind(id: string): CautionKind | undefined {
  return BY_ID.get(id);
}

/** Ids of the catalogue cautions a request needs, in catalogue order. */
export function requiredCautions(request: MeasurementRequest): string[] {
  return CAUTION_KINDS.filter((c) => c.appliesTo(request)).map((c) => c.id);
}
