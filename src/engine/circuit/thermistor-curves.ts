/**
 * NTC thermistors as the trade finds them: curves and module bias resistors as data, each saying where it comes
 * from, and the pairings a module uses (a single pull-up, or a dual-range pull-up that switches a second resistor in
 * parallel once the engine is warm, so a hot sensor still reads well clear of 0 V).
 *
 * Curves: the Steinhart–Hart equation (J. S. Steinhart and S. R. Hart, Deep-Sea Research 15, 1968) or the beta form
 * R = R25·exp(β·(1/T − 1/298.15 K)). None is a maker's part; every value here is generic and marked as recalled.
 */
import type { BiasSpec, ThermistorModel } from './types';

export interface ThermistorCurve {
  id: string;
  model: ThermistorModel;
  /** Where the values come from. */
  source: string;
}

/** A module's thermistor bias: one pull-up, or a pull-up that switches to `hotOhms` above `switchC`. */
export type ThermistorBias =
  | { id: string; kind: 'single'; ohms: number; source: string }
  | { id: string; kind: 'dual_range'; coldOhms: number; hotOhms: number; switchC: number; source: string };

export const THERMISTOR_CURVES: readonly ThermistorCurve[] = [
  { id: 'generic_10k_steinhart_hart', model: { kind: 'steinhart_hart', a: 1.12924e-3, b: 2.34108e-4, c: 8.7755e-8 }, source: 'from memory, generic' },
  { id: 'generic_10k_beta_3950', model: { kind: 'beta', r25Ohms: 10_000, beta: 3950 }, source: 'beta form; 10 kΩ at 25 °C, β 3950 K from memory, generic' },
  { id: 'generic_10k_beta_3435', model: { kind: 'beta', r25Ohms: 10_000, beta: 3435 }, source: 'beta form; 10 kΩ at 25 °C, β 3435 K from memory, generic' },
  { id: 'generic_2k2_beta_3500', model: { kind: 'beta', r25Ohms: 2_200, beta: 3500 }, source: 'beta form; 2.2 kΩ at 25 °C, β 3500 K from memory, generic (a low-ohm coolant-style sensor)' },
];

export const THERMISTOR_BIASES: readonly ThermistorBias[] = [
  { id: 'pull_up_10k', kind: 'single', ohms: 10_000, source: 'common practice, no source' },
  { id: 'pull_up_2k49', kind: 'single', ohms: 2_490, source: 'common practice, no source' },
  // 10 kΩ cold; 1 kΩ switched in parallel (909 Ω) when warm: common practice, no source; switch point from memory.
  { id: 'dual_range_10k_909', kind: 'dual_range', coldOhms: 10_000, hotOhms: 909, switchC: 50, source: 'common practice, no source' },
];

/** Curve and bias as modules pair them (common practice, no source). */
export const THERMISTOR_PAIRINGS: ReadonlyArray<{ curve: string; bias: string }> = [
  { curve: 'generic_10k_steinhart_hart', bias: 'pull_up_10k' },
  { curve: 'generic_10k_beta_3950', bias: 'pull_up_10k' },
  { curve: 'generic_10k_beta_3435', bias: 'dual_range_10k_909' },
  { curve: 'generic_10k_steinhart_hart', bias: 'dual_range_10k_909' },
  { curve: 'generic_2k2_beta_3500', bias: 'pull_up_2k49' },
];

export const thermistorCurve = (id: string) => THERMISTOR_CURVES.find((c) => c.id === id);
export const thermistorBias = (id: string) => THERMISTOR_BIASES.find((b) => b.id === id);

/** The pull-up the module has in circuit at a coolant temperature (a dual-range bias has switched above its point). */
export function biasAt(bias: ThermistorBias, temperatureC: number): BiasSpec {
  if (bias.kind === 'single') return { kind: 'pull_up', ohms: bias.ohms };
  return { kind: 'pull_up', ohms: temperatureC > bias.switchC ? bias.hotOhms : bias.coldOhms };
}
