/**
 * The module's view of a signal: its converter reads the input node against module ground, clamped to 0…full
 * scale and quantised. A scan tool shows this value, never more than full scale, however high the wire is driven.
 * Common practice, no source: a 10-bit converter with a 5.00 V full scale (modules use 8 to 12 bits).
 */
export const MODULE_ADC = { fullScaleVolts: 5.0, bits: 10 } as const;

/** One converter step, V. */
export const ADC_STEP_VOLTS = MODULE_ADC.fullScaleVolts / (2 ** MODULE_ADC.bits - 1);

/** The value the module reports for a voltage at its converter node. */
export function adcReading(volts: number): number {
  if (!Number.isFinite(volts)) return volts;
  const clamped = Math.min(MODULE_ADC.fullScaleVolts, Math.max(0, volts));
  return Math.round(clamped / ADC_STEP_VOLTS) * ADC_STEP_VOLTS;
}
