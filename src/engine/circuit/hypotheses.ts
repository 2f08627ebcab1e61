/**
 * Root-cause hypothesis ids of the fault trees, mapped to the faults that realise them in the circuit model.
 * Umbrella ids (`sensor_internal`, `module_internal`) map to their most common variant; the specific variants have
 * ids of their own. High-resistance values are typical of a fault worth finding (common practice, no source).
 */
import type { Spreads } from './monte-carlo';
import type { CircuitKind } from '../vocabulary';
import type { FaultSpec, RegulatorSpec } from './types';

/**
 * One form of a cause: its faults, and what it leaves of the module's 5 V supply (a current limit, an output
 * resistance) and of the part spreads (a set point, a short's resistance, a held converter value). A latent
 * property of the circuit: every reading of one circuit is weighed under the same form.
 */
export interface CauseAlternative {
  weight: number;
  faults: FaultSpec[];
  regulator?: Partial<Pick<RegulatorSpec, 'currentLimitAmps' | 'outputOhms' | 'minInputVolts'>>;
  spreads?: Partial<Spreads>;
  /** Only on these circuit kinds (every kind when unset). */
  kinds?: CircuitKind[];
}

const HYPOTHESIS_FAULTS = {
  reference_open: [{ kind: 'open', wire: 'reference' }],
  reference_short_ground: [{ kind: 'short_to_ground', wire: 'reference' }],
  reference_short_voltage: [{ kind: 'short_to_voltage', wire: 'reference' }],
  reference_high_resistance: [{ kind: 'high_resistance', wire: 'reference', ohms: 200 }],
  signal_open: [{ kind: 'open', wire: 'signal' }],
  signal_short_ground: [{ kind: 'short_to_ground', wire: 'signal' }],
  signal_short_voltage: [{ kind: 'short_to_voltage', wire: 'signal' }],
  signal_short_reference: [{ kind: 'short_between', wires: ['signal', 'reference'] }],
  signal_high_resistance: [{ kind: 'high_resistance', wire: 'signal', ohms: 10_000 }],
  ground_open: [{ kind: 'open', wire: 'ground' }],
  ground_short_voltage: [{ kind: 'short_to_voltage', wire: 'ground' }],
  ground_high_resistance: [{ kind: 'high_resistance', wire: 'ground', ohms: 200 }],
  signal_short_sensor_ground: [{ kind: 'short_between', wires: ['signal', 'ground'] }],
  sensor_internal: [{ kind: 'sensor_internal', variant: 'open_track' }],
  sensor_internal_open: [{ kind: 'sensor_internal', variant: 'open_track' }],
  sensor_internal_worn_spot: [{ kind: 'sensor_internal', variant: 'worn_spot' }],
  sensor_internal_stuck: [{ kind: 'sensor_internal', variant: 'stuck' }],
  sensor_internal_shorted: [{ kind: 'sensor_internal', variant: 'shorted' }],
  module_internal: [{ kind: 'module_internal', variant: 'dead_input' }],
  module_internal_input: [{ kind: 'module_internal', variant: 'dead_input' }],
  module_internal_regulator: [{ kind: 'module_internal', variant: 'dead_regulator' }],
  module_internal_weak_regulator: [{ kind: 'module_internal', variant: 'weak_regulator' }],
} as const satisfies Record<string, readonly FaultSpec[]>;

export type HypothesisId = keyof typeof HYPOTHESIS_FAULTS;
export const HYPOTHESIS_IDS = Object.keys(HYPOTHESIS_FAULTS) as HypothesisId[];

/** Ids that stand for a circuit with no fault now (`no_fault_now`: the circuit tests good, e.g. an intermittent). */
export const HEALTHY_IDS = ['good', 'no_fault', 'no_fault_now'] as const;
type HealthyId = (typeof HEALTHY_IDS)[number];

/**
 * Causes that cover several forms, each with a weight (common practice, no source):
 * - an open wire is often a corroded splice or terminal that still passes a little (3 kΩ and more on the
 *   reference: below that it is the reference's high-resistance cause; a fraction of the bias
 *   resistance or more on the signal);
 * - a short between signal and reference is up to a few ohms, or partial (a few hundred ohms to a few kilohms);
 * - a short to ground on a signal is often partial (chafed insulation in water: a kilohm or a few); each form is
 *   drawn across its range;
 * - a high-resistance ground ranges from tens of ohms to a few kilohms (drawn across each form's range);
 * - a shorted 5 V reference is hard (up to a few ohms) or partial (tens of ohms), and the module's supply either
 *   holds its voltage or limits its current (about 0.1–0.3 A on a sensor supply), so it reads 0 V to a few volts;
 * - a failed 5 V supply is dead (0 V, or a few hundred millivolts of leakage), regulates low (3–4.5 V), is weak
 *   and sags under load (output resistance from a few hundred ohms to a few kilohms), or needs so much headroom
 *   that it holds 5 V on a 12 V battery and falls as the battery dips while the engine cranks (drop-out at 11.5 V);
 * - a failed module input reads module ground, full scale, or holds any fixed value;
 * - a wire with high resistance short of an open (damaged strands, a corroded splice or terminal): on the reference
 *   a hundred ohms to a few kilohms (beyond that it is the open reference's form), on the signal wire a few to
 *   some tens of kilohms on a three-wire input (against a bias of 47 kΩ–1 MΩ), about a kilohm to tens of kilohms
 *   on a thermistor input; a terminal with poor fit or corrosion is this same cause (the same wire to repair, and
 *   with the leads on the harness side of the mated connector no tree test reads across the contact itself);
 * - the sensor ground shorted to a battery-voltage circuit is hard (up to a few ohms: the chafe that reaches a
 *   feed);
 * - a short between signal and sensor ground is hard or partial (a few hundred ohms to a few kilohms: water in a
 *   connector or a chafe between the two wires), in the same forms as a signal short to ground;
 * - a three-wire sensor faulty inside has an open track, its output stuck at the reference or at ground, stuck
 *   where its input rests (it reads right until the pedal or throttle moves), or its wiper lifted off the track
 *   where it rests (a thermistor: open).
 */
const THREE_WIRE: CircuitKind[] = ['three_wire_5v'];
const THERMISTOR: CircuitKind[] = ['two_wire_thermistor'];
const LIMITED = (amps: number) => ({ currentLimitAmps: amps });
const CAUSE_ALTERNATIVES: Record<string, CauseAlternative[]> = {
  reference_open: [
    { weight: 0.6, faults: [{ kind: 'open', wire: 'reference' }] },
    { weight: 0.2, faults: [{ kind: 'high_resistance', wire: 'reference', ohms: 10_000 }], spreads: { seriesOhms: [3000, 30_000] } },
    { weight: 0.2, faults: [{ kind: 'high_resistance', wire: 'reference', ohms: 50_000 }], spreads: { seriesOhms: [30_000, 300_000] } },
  ],
  signal_open: [
    { weight: 0.6, faults: [{ kind: 'open', wire: 'signal' }] },
    { weight: 0.2, faults: [{ kind: 'high_resistance', wire: 'signal', ohms: 100_000 }], kinds: THREE_WIRE },
    { weight: 0.2, faults: [{ kind: 'high_resistance', wire: 'signal', ohms: 500_000 }], kinds: THREE_WIRE },
  ],
  signal_short_reference: [
    { weight: 0.7, faults: [{ kind: 'short_between', wires: ['signal', 'reference'], ohms: 0.5 }], spreads: { shortOhms: [0.01, 5] } },
    { weight: 0.3, faults: [{ kind: 'short_between', wires: ['signal', 'reference'], ohms: 700 }], spreads: { shortOhms: [150, 3000] } },
  ],
  signal_short_ground: [
    { weight: 0.6, faults: [{ kind: 'short_to_ground', wire: 'signal' }], spreads: { shortOhms: [0.01, 5] } },
    { weight: 0.2, faults: [{ kind: 'short_to_ground', wire: 'signal', ohms: 1000 }], spreads: { shortOhms: [150, 1500] } },
    { weight: 0.2, faults: [{ kind: 'short_to_ground', wire: 'signal', ohms: 4000 }], spreads: { shortOhms: [1500, 6000] } },
  ],
  ground_high_resistance: [
    { weight: 0.5, faults: [{ kind: 'high_resistance', wire: 'ground', ohms: 200 }], spreads: { seriesOhms: [100, 500] } },
    { weight: 0.25, faults: [{ kind: 'high_resistance', wire: 'ground', ohms: 50 }], spreads: { seriesOhms: [30, 100] } },
    { weight: 0.25, faults: [{ kind: 'high_resistance', wire: 'ground', ohms: 1000 }], spreads: { seriesOhms: [500, 6000] } },
  ],
  reference_short_ground: [
    { weight: 0.3, faults: [{ kind: 'short_to_ground', wire: 'reference' }] },
    { weight: 0.25, faults: [{ kind: 'short_to_ground', wire: 'reference', ohms: 1 }], regulator: LIMITED(0.1), spreads: { shortOhms: [0.05, 5] } },
    { weight: 0.2, faults: [{ kind: 'short_to_ground', wire: 'reference', ohms: 1 }], regulator: LIMITED(0.25), spreads: { shortOhms: [0.05, 5] } },
    { weight: 0.25, faults: [{ kind: 'short_to_ground', wire: 'reference', ohms: 15 }], regulator: LIMITED(0.15), spreads: { shortOhms: [5, 40] } },
  ],
  reference_high_resistance: [
    { weight: 0.4, faults: [{ kind: 'high_resistance', wire: 'reference', ohms: 300 }], spreads: { seriesOhms: [80, 600] }, kinds: THREE_WIRE },
    { weight: 0.4, faults: [{ kind: 'high_resistance', wire: 'reference', ohms: 1500 }], spreads: { seriesOhms: [600, 3000] }, kinds: THREE_WIRE },
    // A sensor drawing several milliamps drops as much across a few kilohms as the model's potentiometer does across
    // ten: this form keeps the drop along the wire from deciding between this cause and an open that still passes.
    { weight: 0.2, faults: [{ kind: 'high_resistance', wire: 'reference', ohms: 6000 }], spreads: { seriesOhms: [3000, 12_000] }, kinds: THREE_WIRE },
  ],
  signal_high_resistance: [
    { weight: 0.5, faults: [{ kind: 'high_resistance', wire: 'signal', ohms: 5000 }], spreads: { seriesOhms: [2000, 12_000] }, kinds: THREE_WIRE },
    { weight: 0.5, faults: [{ kind: 'high_resistance', wire: 'signal', ohms: 30_000 }], spreads: { seriesOhms: [12_000, 70_000] }, kinds: THREE_WIRE },
    { weight: 0.5, faults: [{ kind: 'high_resistance', wire: 'signal', ohms: 2000 }], spreads: { seriesOhms: [600, 4000] }, kinds: THERMISTOR },
    { weight: 0.5, faults: [{ kind: 'high_resistance', wire: 'signal', ohms: 10_000 }], spreads: { seriesOhms: [4000, 30_000] }, kinds: THERMISTOR },
  ],
  ground_short_voltage: [{ weight: 1, faults: [{ kind: 'short_to_voltage', wire: 'ground', ohms: 0.5 }], spreads: { shortOhms: [0.05, 5] } }],
  signal_short_sensor_ground: [
    { weight: 0.6, faults: [{ kind: 'short_between', wires: ['signal', 'ground'], ohms: 0.5 }], spreads: { shortOhms: [0.02, 5] } },
    // The partial forms of a short to ground: from the sensor connector the two read alike, wire-to-wire isolation tells.
    { weight: 0.2, faults: [{ kind: 'short_between', wires: ['signal', 'ground'], ohms: 1000 }], spreads: { shortOhms: [150, 1500] } },
    { weight: 0.2, faults: [{ kind: 'short_between', wires: ['signal', 'ground'], ohms: 4000 }], spreads: { shortOhms: [1500, 6000] } },
  ],
  reference_supply_failed: [
    { weight: 0.25, faults: [{ kind: 'module_internal', variant: 'dead_regulator' }] },
    { weight: 0.15, faults: [{ kind: 'module_internal', variant: 'dead_regulator' }], spreads: { deadRegulatorVolts: [0.02, 0.4] } },
    { weight: 0.2, faults: [], regulator: { outputOhms: 20 }, spreads: { regulatorVolts: [3.0, 4.5] } },
    { weight: 0.2, faults: [{ kind: 'module_internal', variant: 'weak_regulator', ohms: 500 }] },
    { weight: 0.2, faults: [{ kind: 'module_internal', variant: 'weak_regulator', ohms: 2000 }] },
    { weight: 0.15, faults: [], regulator: { minInputVolts: 11.5 }, kinds: THREE_WIRE },
  ],
  sensor_internal: [
    { weight: 0.4, faults: [{ kind: 'sensor_internal', variant: 'open_track' }] },
    { weight: 0.2, faults: [{ kind: 'sensor_internal', variant: 'stuck', value: 0.995 }], kinds: THREE_WIRE },
    { weight: 0.2, faults: [{ kind: 'sensor_internal', variant: 'stuck', value: 0.005 }], kinds: THREE_WIRE },
    { weight: 0.2, faults: [{ kind: 'sensor_internal', variant: 'worn_spot', value: 1e7 }], kinds: THREE_WIRE },
    { weight: 0.2, faults: [{ kind: 'sensor_internal', variant: 'stuck', atRest: true }], kinds: THREE_WIRE },
    // A thermistor that reads in range but wrong, 15 or 25 °C warm (common practice, no source): only a comparison shows it.
    { weight: 0.2, faults: [{ kind: 'sensor_internal', variant: 'skewed', value: 15 }], kinds: ['two_wire_thermistor'] },
    { weight: 0.2, faults: [{ kind: 'sensor_internal', variant: 'skewed', value: 25 }], kinds: ['two_wire_thermistor'] },
  ],
  module_internal: [
    { weight: 0.35, faults: [{ kind: 'module_internal', variant: 'dead_input' }] },
    { weight: 0.25, faults: [{ kind: 'module_internal', variant: 'fixed_input', volts: 5 }], spreads: { moduleInputVolts: [4.95, 5.0] } },
    { weight: 0.4, faults: [{ kind: 'module_internal', variant: 'fixed_input' }], spreads: { moduleInputVolts: [0.1, 4.9] } },
  ],
};

/** The weighted fault lists a cause stands for (one list for most causes), or undefined for an unknown id. */
export function causeAlternatives(id: string, kind?: CircuitKind): CauseAlternative[] | undefined {
  if (Object.hasOwn(CAUSE_ALTERNATIVES, id)) return structuredClone(CAUSE_ALTERNATIVES[id]!.filter((a) => !kind || !a.kinds || a.kinds.includes(kind)));
  const faults = faultsFor(id);
  return faults && [{ weight: 1, faults }];
}

/**
 * The faults to inject for a hypothesis id (a fresh copy each call), or undefined for an id the model does not
 * know. `good`, `no_fault` and `no_fault_now` give the empty list.
 */
export function faultsFor(id: HypothesisId | HealthyId): FaultSpec[];
export function faultsFor(id: string): FaultSpec[] | undefined;
export function faultsFor(id: string): FaultSpec[] | undefined {
  if ((HEALTHY_IDS as readonly string[]).includes(id)) return [];
  if (!Object.hasOwn(HYPOTHESIS_FAULTS, id)) return undefined;
  return structuredClone((HYPOTHESIS_FAULTS as Record<string, readonly FaultSpec[]>)[id]) as FaultSpec[];
}
