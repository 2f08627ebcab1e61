/**
 * NTC thermistor arithmetic: Steinhart–Hart (Steinhart & Hart, Deep-Sea Research 15, 1968) and the beta equation,
 * both ways, and the divider a module pull-up makes with the thermistor.
 *
 *   Steinhart–Hart: 1/T = A + B·ln R + C·(ln R)³      (T in kelvin)
 *   Beta:           R = R25 · exp(β·(1/T − 1/298.15 K))
 */
import { checkFinite, checkResistance, finding, joinPath, type Finding, type Result } from './findings';

export const KELVIN_OFFSET = 273.15;
const T25_KELVIN = 298.15;

export interface SteinhartHartCoefficients {
  a: number;
  b: number;
  c: number;
}

export interface BetaCoefficients {
  r25Ohms: number;
  beta: number;
}

function checkCoefficients(k: SteinhartHartCoefficients, path: string): Finding[] {
  const found = [
    ...checkFinite(k?.a, joinPath(path, 'a'), 'Coefficient A'),
    ...checkFinite(k?.b, joinPath(path, 'b'), 'Coefficient B'),
    ...checkFinite(k?.c, joinPath(path, 'c'), 'Coefficient C'),
  ];
  if (found.length) return found;
  if (k.b <= 0) found.push(finding('thermistor.coefficient_b_not_positive', joinPath(path, 'b'), 'Coefficient B of an NTC thermistor must be positive.'));
  if (k.c < 0) found.push(finding('thermistor.coefficient_c_negative', joinPath(path, 'c'), 'Coefficient C must not be negative (the cubic would have several roots).'));
  return found;
}

function checkBeta(k: BetaCoefficients, path: string): Finding[] {
  const found = [
    ...checkResistance(k?.r25Ohms, joinPath(path, 'r25Ohms'), 'Resistance at 25 °C', true),
    ...checkFinite(k?.beta, joinPath(path, 'beta'), 'Beta'),
  ];
  if (!found.length && k.beta <= 0) found.push(finding('thermistor.beta_not_positive', joinPath(path, 'beta'), 'Beta of an NTC thermistor must be positive (kelvin).'));
  return found;
}

function checkTemperature(temperatureC: number, path: string): Finding[] {
  const found = checkFinite(temperatureC, path, 'Temperature');
  if (!found.length && temperatureC <= -KELVIN_OFFSET) {
    found.push(finding('thermistor.below_absolute_zero', path, `Temperature must be above −273.15 °C, got ${temperatureC} °C.`));
  }
  return found;
}

/** Temperature (°C) of a thermistor of resistance `ohms`, Steinhart–Hart. */
export function steinhartHartTemperature(ohms: number, k: SteinhartHartCoefficients): Result<number> {
  const found = [...checkResistance(ohms, 'ohms', 'Thermistor resistance', true), ...checkCoefficients(k, 'coefficients')];
  if (found.length) return { ok: false, findings: found };
  const x = Math.log(ohms);
  const inverseT = k.a + k.b * x + k.c * x * x * x;
  if (!(inverseT > 0)) return { ok: false, findings: [finding('thermistor.outside_model', 'ohms', `The coefficients give no positive temperature at ${ohms} Ω.`)] };
  return { ok: true, value: 1 / inverseT - KELVIN_OFFSET };
}

/**
 * Resistance at `temperatureC`, Steinhart–Hart inverted: C·x³ + B·x + (A − 1/T) = 0 in x = ln R, a depressed cubic
 * with p = B/C > 0, so exactly one real root (Cardano).
 */
export function steinhartHartResistance(temperatureC: number, k: SteinhartHartCoefficients): Result<number> {
  const found = [...checkTemperature(temperatureC, 'temperatureC'), ...checkCoefficients(k, 'coefficients')];
  if (found.length) return { ok: false, findings: found };
  const inverseT = 1 / (temperatureC + KELVIN_OFFSET);
  let x: number;
  if (k.c === 0) {
    x = (inverseT - k.a) / k.b;
  } else {
    const p = k.b / k.c;
    const q = (k.a - inverseT) / k.c;
    const root = Math.sqrt((q * q) / 4 + (p * p * p) / 27);
    x = Math.cbrt(-q / 2 + root) + Math.cbrt(-q / 2 - root);
  }
  return { ok: true, value: Math.exp(x) };
}

/** Resistance at `temperatureC`, beta equation. */
export function betaResistance(temperatureC: number, k: BetaCoefficients): Result<number> {
  const found = [...checkTemperature(temperatureC, 'temperatureC'), ...checkBeta(k, 'coefficients')];
  if (found.length) return { ok: false, findings: found };
  const t = temperatureC + KELVIN_OFFSET;
  return { ok: true, value: k.r25Ohms * Math.exp(k.beta * (1 / t - 1 / T25_KELVIN)) };
}

/** Temperature (°C) of a thermistor of resistance `ohms`, beta equation. */
export function betaTemperature(ohms: number, k: BetaCoefficients): Result<number> {
  const found = [...checkResistance(ohms, 'ohms', 'Thermistor resistance', true), ...checkBeta(k, 'coefficients')];
  if (found.length) return { ok: false, findings: found };
  return { ok: true, value: 1 / (1 / T25_KELVIN + Math.log(ohms / k.r25Ohms) / k.beta) - KELVIN_OFFSET };
}

export interface DividerInput {
  supplyVolts: number;
  pullUpOhms: number;
  thermistorOhms: number;
}

/** Voltage at the module input: supply through the pull-up into the thermistor, V = Vs·Rt/(Rt + Rp). */
export function thermistorDividerVolts(input: DividerInput): Result<number> {
  const found = [
    ...checkFinite(input?.supplyVolts, 'supplyVolts', 'Supply voltage'),
    ...checkResistance(input?.pullUpOhms, 'pullUpOhms', 'Pull-up resistance', true),
    ...checkResistance(input?.thermistorOhms, 'thermistorOhms', 'Thermistor resistance'),
  ];
  if (found.length) return { ok: false, findings: found };
  return { ok: true, value: (input.supplyVolts * input.thermistorOhms) / (input.thermistorOhms + input.pullUpOhms) };
}

/** Thermistor resistance a divider voltage reveals: Rt = Rp·V/(Vs − V). */
export function thermistorOhmsFromDivider(input: { supplyVolts: number; pullUpOhms: number; volts: number }): Result<number> {
  const found = [
    ...checkFinite(input?.supplyVolts, 'supplyVolts', 'Supply voltage'),
    ...checkResistance(input?.pullUpOhms, 'pullUpOhms', 'Pull-up resistance', true),
    ...checkFinite(input?.volts, 'volts', 'Divider voltage'),
  ];
  if (found.length) return { ok: false, findings: found };
  if (input.volts < 0 || input.volts >= input.supplyVolts) {
    return { ok: false, findings: [finding('divider.volts_outside_supply', 'volts', `The divider voltage must lie in [0, ${input.supplyVolts}) V, got ${input.volts} V.`)] };
  }
  return { ok: true, value: (input.pullUpOhms * input.volts) / (input.supplyVolts - input.volts) };
}
