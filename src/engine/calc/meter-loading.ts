/**
 * A meter on a source with internal resistance: the textbook voltage divider, both ways.
 *
 *   reading = V_open · R_meter / (R_meter + R_source)
 *   R_source = R_meter · (V_open / reading − 1)
 */
import { checkFinite, checkResistance, finding, type Finding, type Result } from './findings';

export interface MeterLoadingInput {
  /** Open-circuit voltage of the source, V. */
  sourceVolts: number;
  /** Source (Thevenin) resistance, Ω. */
  sourceOhms: number;
  /** Meter input resistance, Ω (> 0). */
  meterOhms: number;
}

/** What a meter of the given input resistance reads on the source. */
export function meterReading(input: MeterLoadingInput): Result<number> {
  const found = [
    ...checkFinite(input?.sourceVolts, 'sourceVolts', 'Source voltage'),
    ...checkResistance(input?.sourceOhms, 'sourceOhms', 'Source resistance'),
    ...checkResistance(input?.meterOhms, 'meterOhms', 'Meter input resistance', true),
  ];
  if (found.length) return { ok: false, findings: found };
  return { ok: true, value: (input.sourceVolts * input.meterOhms) / (input.meterOhms + input.sourceOhms) };
}

export interface LoadedReadingInput {
  /** Voltage the source would show unloaded (the regulated 5 V for a pull-up bias), V. */
  openVolts: number;
  /** Reading under the load, V. */
  readVolts: number;
  /** Resistance of the load (the meter's input, or meter and a known resistor in parallel), Ω. */
  loadOhms: number;
}

function checkLoaded(input: LoadedReadingInput, loadWhat: string): Finding[] {
  const found = [
    ...checkFinite(input?.openVolts, 'openVolts', 'Open-circuit voltage'),
    ...checkFinite(input?.readVolts, 'readVolts', 'Reading'),
    ...checkResistance(input?.loadOhms, 'loadOhms', loadWhat, true),
  ];
  if (found.length) return found;
  const { openVolts, readVolts } = input;
  if (openVolts === 0) return [finding('loading.no_source_voltage', 'openVolts', 'The open-circuit voltage must not be 0 V.')];
  if (Math.sign(readVolts) !== Math.sign(openVolts)) {
    return [finding('loading.reading_zero_or_reversed', 'readVolts', 'The reading must have the sign of the open-circuit voltage and not be 0 V.')];
  }
  if (Math.abs(readVolts) > Math.abs(openVolts)) {
    return [finding('loading.reading_above_open', 'readVolts', `A load cannot raise the voltage: reading ${readVolts} V exceeds the open-circuit ${openVolts} V.`)];
  }
  return [];
}

/**
 * Source resistance a loaded reading reveals: R = R_load · (V_open / V_read − 1). With the meter alone as the load
 * this is the bias resistance of a biased signal input.
 */
export function sourceOhmsFromLoadedReading(input: LoadedReadingInput): Result<number> {
  const found = checkLoaded(input, 'Load resistance');
  if (found.length) return { ok: false, findings: found };
  return { ok: true, value: input.loadOhms * (input.openVolts / input.readVolts - 1) };
}

/** Bias resistance from a biased input read by a meter of input resistance `meterOhms`. */
export function biasOhmsFromReading(input: { openVolts: number; readVolts: number; meterOhms: number }): Result<number> {
  const found = checkLoaded({ openVolts: input?.openVolts, readVolts: input?.readVolts, loadOhms: input?.meterOhms }, 'Meter input resistance').map((f) =>
    f.path === 'loadOhms' ? { ...f, path: 'meterOhms' } : f,
  );
  if (found.length) return { ok: false, findings: found };
  return { ok: true, value: input.meterOhms * (input.openVolts / input.readVolts - 1) };
}

/** Whether two resistance figures agree within a relative tolerance (of the larger one). */
export function resistancesAgree(a: number, b: number, relativeTolerance = 0.1): Result<{ agree: boolean; relativeDifference: number }> {
  const found = [
    ...checkResistance(a, 'a', 'First resistance'),
    ...checkResistance(b, 'b', 'Second resistance'),
    ...checkFinite(relativeTolerance, 'relativeTolerance', 'Relative tolerance'),
  ];
  if (found.length) return { ok: false, findings: found };
  const larger = Math.max(a, b);
  const relativeDifference = larger === 0 ? 0 : Math.abs(a - b) / larger;
  return { ok: true, value: { agree: relativeDifference <= relativeTolerance, relativeDifference } };
}

/** Parallel combination of resistances (a meter with a known resistor across its leads). */
export function parallelOhms(...ohms: number[]): number {
  return 1 / ohms.reduce((sum, r) => sum + 1 / r, 0);
}

/**
 * Thevenin source resistance from two readings of the same source under two loads (L1, L2):
 * V1 = Vs·L1/(L1 + Rs), V2 = Vs·L2/(L2 + Rs)  ⇒  Rs = (V1 − V2) / (V2/L2 − V1/L1).
 */
export function sourceOhmsFromTwoLoads(input: { volts1: number; load1Ohms: number; volts2: number; load2Ohms: number }): Result<number> {
  const found = [
    ...checkFinite(input?.volts1, 'volts1', 'First reading'),
    ...checkResistance(input?.load1Ohms, 'load1Ohms', 'First load', true),
    ...checkFinite(input?.volts2, 'volts2', 'Second reading'),
    ...checkResistance(input?.load2Ohms, 'load2Ohms', 'Second load', true),
  ];
  if (found.length) return { ok: false, findings: found };
  const denominator = input.volts2 / input.load2Ohms - input.volts1 / input.load1Ohms;
  if (input.load1Ohms === input.load2Ohms || denominator === 0) {
    return { ok: false, findings: [finding('loading.loads_not_different', 'load2Ohms', 'The two loads must differ and draw different currents.')] };
  }
  const ohms = (input.volts1 - input.volts2) / denominator;
  if (ohms < 0) return { ok: false, findings: [finding('loading.inconsistent_readings', 'volts2', 'The heavier load must not read higher: the readings imply a negative source resistance.')] };
  return { ok: true, value: ohms };
}
