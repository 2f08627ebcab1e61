/**
 * How far a reading may sit from the truth because of the instrument alone, and what "anything the instrument can
 * show" looks like (the leak cause's density).
 *
 * Common practice, no source: a handheld DMM reads DC volts within ±(0.5 % of reading + 2 counts) and ohms within
 * ±(1 % + 2 counts) on a 6000-count display; we take the 6 V range's 1 mV as the finest volts count (technicians
 * rarely lock a lower range) and add 0.2 Ω for leads not zeroed. The module's converter reads within ±(0.5 % + 2
 * steps) (see circuit/adc.ts). The stated bound is used as the kernel's standard deviation: generous on purpose,
 * since the meter in the bay is not the one the model assumed.
 */
import { ADC_STEP_VOLTS, MODULE_ADC } from '../circuit';
import type { Quantity } from '../vocabulary';

/**
 * What a test's value is, for weighing it: a quantity read on one instrument, or the difference of two readings
 * (a comparison) in volts or in °C.
 */
export type WeighQuantity = Quantity | 'difference_V' | 'difference_°C';

const COUNTS = 6000;
const step = (y: number, finest: number) => (y === 0 || !Number.isFinite(y) ? finest : Math.max(finest, 10 ** Math.ceil(Math.log10(Math.abs(y) / COUNTS))));

const BOUNDS: Record<WeighQuantity, (y: number) => number> = {
  dc_volts: (y) => 0.005 * Math.abs(y) + 2 * step(y, 1e-3),
  ohms: (y) => 0.01 * Math.abs(y) + 2 * step(y, 0.1) + 0.2,
  amps: (y) => 0.01 * Math.abs(y) + 2 * step(y, 1e-3),
  scan_value: (y) => 0.005 * Math.abs(y) + 2 * ADC_STEP_VOLTS,
  // A meter reading against the converter's, both near mid-scale (2.5 V): the two bounds above combined in quadrature.
  'difference_V': (y) => Math.hypot(0.005 * 2.5 + 2e-3, 0.005 * 2.5 + 2 * ADC_STEP_VOLTS) + 0.005 * Math.abs(y),
  // Two temperature PIDs shown in whole degrees (SAE J1979 PID 05 and 0F: A − 40): ±0.5 °C each.
  'difference_°C': () => 1,
};

/** ± the instrument's own error at reading `y` (V, Ω or A). */
export function instrumentBound(quantity: WeighQuantity, y: number): number {
  return BOUNDS[quantity](y);
}

/**
 * How far a real circuit may sit from the circuit model's prediction besides the instrument: ground offsets, leakage
 * across a break, terminal and splice resistances the model does not draw (the model discrepancy of Kennedy &
 * O'Hagan, "Bayesian calibration of computer models", JRSS B 63, 2001). Common practice, no source: 15 mV + 1 % on
 * volts and scan values, 0.3 Ω + 2 % on ohms, 1 mA + 1 % on amps.
 */
const DISCREPANCY: Record<WeighQuantity, (y: number) => number> = {
  dc_volts: (y) => 0.015 + 0.01 * Math.abs(y),
  scan_value: (y) => 0.015 + 0.01 * Math.abs(y),
  ohms: (y) => 0.3 + 0.02 * Math.abs(y),
  amps: (y) => 1e-3 + 0.01 * Math.abs(y),
  // Two readings of one circuit at once share its ground offsets and leakage: what is left is smaller (common
  // practice, no source: 10 mV + 1 %; 1.5 °C + 2 % between a coolant and an intake-air sensor after a cold soak).
  'difference_V': (y) => 0.01 + 0.01 * Math.abs(y),
  'difference_°C': (y) => 1.5 + 0.02 * Math.abs(y),
};

/**
 * The kernel a predicted reading is blurred with: the instrument's error (tightened by √n for n agreeing repeats,
 * which re-measure the meter) and the model's discrepancy (which repeats do not shrink).
 */
export function kernelSigma(quantity: WeighQuantity, y: number, n = 1): number {
  return Math.hypot(BOUNDS[quantity](y) / Math.sqrt(n), Number.isFinite(y) ? DISCREPANCY[quantity](y) : 0);
}

/** Ohms the leak density spreads over (log-uniform) and the share it gives an overload display. */
const OHMS_RANGE: [number, number] = [0.05, 6e7];
const OHMS_OVERLOAD_SHARE = 0.2;
const LOG_OHMS_SPAN = Math.log(OHMS_RANGE[1] / OHMS_RANGE[0]);
/** Uniform spans for the other quantities: what a meter or scan tool can show on a 12 V vehicle. */
const SPANS: Record<Exclude<WeighQuantity, 'ohms'>, [number, number]> = {
  dc_volts: [-1, 16],
  amps: [-1, 10],
  scan_value: [-0.1, MODULE_ADC.fullScaleVolts + 0.1],
  // A scan value (0–5 V) less a meter reading (−1–16 V); two temperature PIDs (−40–215 °C each).
  'difference_V': [-16.1, MODULE_ADC.fullScaleVolts + 1.1],
  'difference_°C': [-255, 255],
};

/**
 * Density of "anything the instrument can show" at `y` (an overload, `Infinity`, gets a probability): the leak
 * cause's likelihood and the heavy tail of every modelled cause.
 */
export function broadDensity(quantity: WeighQuantity, y: number): number {
  if (quantity === 'ohms') {
    if (y === Number.POSITIVE_INFINITY) return OHMS_OVERLOAD_SHARE;
    return (1 - OHMS_OVERLOAD_SHARE) / (LOG_OHMS_SPAN * Math.max(y, OHMS_RANGE[0]));
  }
  const [lo, hi] = SPANS[quantity];
  return 1 / (hi - lo);
}

/** Mass of the broad density on [lo, hi) (an open top includes the overload). */
export function broadMass(quantity: WeighQuantity, lo: number, hi: number): number {
  if (quantity === 'ohms') {
    const a = Math.max(lo, OHMS_RANGE[0]);
    const b = Math.min(hi, OHMS_RANGE[1]);
    const finite = b > a ? ((1 - OHMS_OVERLOAD_SHARE) * Math.log(b / a)) / LOG_OHMS_SPAN : 0;
    return finite + (hi === Number.POSITIVE_INFINITY ? OHMS_OVERLOAD_SHARE : 0);
  }
  const [s0, s1] = SPANS[quantity];
  return Math.max(0, Math.min(hi, s1) - Math.max(lo, s0)) / (s1 - s0);
}
