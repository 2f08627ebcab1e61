/**
 * Root-cause hypothesis ids of the fault trees, mapped to the faults that realise them in the circuit model.
 * Umbrella ids (`sensor_internal`, `module_internal`) map to their most common variant; the specific variants have
 * ids of their own. High-resistance values are typical of a fault worth finding (common practice, no source).
 */
import type { FaultSpec } from './types';

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

/**
 * The faults to inject for a hypothesis id (a fresh copy each call), or undefined for an id the model does not
 * know. `good`/`no_fault` give the empty list.
 */
export function faultsFor(id: HypothesisId | 'good' | 'no_fault'): FaultSpec[];
export function faultsFor(id: string): FaultSpec[] | undefined;
export function faultsFor(id: string): FaultSpec[] | undefined {
  if (id === 'good' || id === 'no_fault') return [];
  if (!Object.hasOwn(HYPOTHESIS_FAULTS, id)) return undefined;
  return structuredClone((HYPOTHESIS_FAULTS as Record<string, readonly FaultSpec[]>)[id]) as FaultSpec[];
}
