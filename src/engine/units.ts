import type { Finding } from './findings';
import type { Quantity } from './vocabulary';

/**
 * Units for measurement entry: parse what a technician typed, check it fits the quantity measured, convert to the
 * stored unit and back, and format for display. Pressure conversions use NIST SP 811 (2008), appendix B.
 *
 * Stored ("SI") units: V, Ω, A, Pa, and °C for temperature. Kelvin is the SI base unit, but technicians, service
 * information and scan data all speak °C, and a Celsius value is exact to convert; so °C is the canonical
 * temperature unit here. % and rpm are stored as they are.
 */


export const UNITS = ['V', 'mV', 'Ω', 'kΩ', 'MΩ', 'A', 'mA', 'Pa', 'kPa', 'inHg', 'psi', '°C', '°F', '%', 'rpm'] as const;
export type Unit = (typeof UNITS)[number];
export type SiUnit = 'V' | 'Ω' | 'A' | 'Pa' | '°C' | '%' | 'rpm';

/** NIST SP 811 appendix B: inch of mercury, conventional. */
export const PA_PER_INHG = 3386.389;
/** NIST SP 811 appendix B: pound-force per square inch. */
export const PA_PER_PSI = 6894.757;
/** NIST SP 811 appendix B: standard atmosphere, exact. */
export const PA_PER_ATM = 101_325;
export const ABSOLUTE_ZERO_C = -273.15;

interface UnitDef {
  siUnit: SiUnit;
  toSi: (v: number) => number;
  fromSi: (v: number) => number;
}

const same = (v: number) => v;
// Divide for sub-units so that e.g. 4870 mV gives exactly 4.87 V.
const scaled = (factor: number, divide = false): Pick<UnitDef, 'toSi' | 'fromSi'> =>
  divide ? { toSi: (v) => v / factor, fromSi: (v) => v * factor } : { toSi: (v) => v * factor, fromSi: (v) => v / factor };

const DEFS: Readonly<Record<Unit, UnitDef>> = {
  V: { siUnit: 'V', toSi: same, fromSi: same },
  mV: { siUnit: 'V', ...scaled(1000, true) },
  Ω: { siUnit: 'Ω', toSi: same, fromSi: same },
  kΩ: { siUnit: 'Ω', ...scaled(1e3) },
  MΩ: { siUnit: 'Ω', ...scaled(1e6) },
  A: { siUnit: 'A', toSi: same, fromSi: same },
  mA: { siUnit: 'A', ...scaled(1000, true) },
  Pa: { siUnit: 'Pa', toSi: same, fromSi: same },
  kPa: { siUnit: 'Pa', ...scaled(1e3) },
  inHg: { siUnit: 'Pa', ...scaled(PA_PER_INHG) },
  psi: { siUnit: 'Pa', ...scaled(PA_PER_PSI) },
  '°C': { siUnit: '°C', toSi: same, fromSi: same },
  // NIST SP 811 appendix B: t/°C = (t/°F − 32)/1.8
  '°F': { siUnit: '°C', toSi: (f) => (f - 32) / 1.8, fromSi: (c) => c * 1.8 + 32 },
  '%': { siUnit: '%', toSi: same, fromSi: same },
  rpm: { siUnit: 'rpm', toSi: same, fromSi: same },
};

/** Spellings matched exactly (case matters: M is mega, m is milli). */
const EXACT: Readonly<Record<string, Unit>> = {
  V: 'V', mV: 'mV', mv: 'mV',
  Ω: 'Ω', kΩ: 'kΩ', MΩ: 'MΩ', M: 'MΩ', Mohm: 'MΩ', Mohms: 'MΩ', MOhm: 'MΩ', MOhms: 'MΩ', megohm: 'MΩ', megohms: 'MΩ',
  A: 'A', mA: 'mA', ma: 'mA',
  Pa: 'Pa', '°C': '°C', '°F': '°F', '%': '%',
};

/** Spellings whose case does not matter, keyed in lower case. */
const FOLDED: Readonly<Record<string, Unit>> = {
  v: 'V', ohm: 'Ω', ohms: 'Ω', kohm: 'kΩ', kohms: 'kΩ', kω: 'kΩ', a: 'A',
  pa: 'Pa', kpa: 'kPa', inhg: 'inHg', 'in hg': 'inHg', 'in. hg': 'inHg', '"hg': 'inHg', psi: 'psi',
  c: '°C', degc: '°C', 'deg c': '°C', '° c': '°C', f: '°F', degf: '°F', 'deg f': '°F', '° f': '°F',
  rpm: 'rpm', 'r/min': 'rpm',
};

/** Spellings refused because they could mean two things, keyed in lower case, with the explanation. */
const AMBIGUOUS: Readonly<Record<string, string>> = {
  m: "'m' could be milli or mega; write MΩ (or M, Mohm) for megohms, mV or mA for millivolts or milliamps",
  mohm: "'mohm' could be milliohms or megohms; write MΩ (or Mohm) for megohms (milliohms are not accepted)",
  mohms: "'mohms' could be milliohms or megohms; write MΩ (or Mohm) for megohms (milliohms are not accepted)",
  mω: "'mΩ' (milliohms) is not accepted; write MΩ for megohms or Ω for ohms",
  k: `'k' alone is a prefix, not a unit; expected one of ${UNITS.join(', ')} (kilohms: kΩ or kohm)`,
};

function own<T>(table: Readonly<Record<string, T>>, key: string): T | undefined {
  return Object.hasOwn(table, key) ? table[key] : undefined;
}

export type ParseUnitResult = { ok: true; unit: Unit } | { ok: false; findings: Finding[] };

/** Turns typed unit text ("kohm", "degF", "inHg", "Ω") into a canonical unit, or explains why it cannot. */
export function parseUnit(text: string, path = 'unit'): ParseUnitResult {
  if (typeof text !== 'string') {
    return { ok: false, findings: [{ code: 'units.not_a_string', path, message: `unit must be text such as "V" or "kΩ"` }] };
  }
  // NFKC folds the ohm sign U+2126 into Greek omega and ℃/℉ into °C/°F.
  const cleaned = text.normalize('NFKC').trim().replace(/\s+/g, ' ');
  // Own keys only: typed text such as "valueOf" or "constructor" must not find Object.prototype's members.
  const exact = own(EXACT, cleaned);
  if (exact) return { ok: true, unit: exact };
  const lower = cleaned.toLowerCase();
  const ambiguous = own(AMBIGUOUS, lower);
  if (ambiguous) return { ok: false, findings: [{ code: 'units.ambiguous', path, message: ambiguous }] };
  const folded = own(FOLDED, lower);
  if (folded) return { ok: true, unit: folded };
  return {
    ok: false,
    findings: [
      {
        code: 'units.unknown',
        path,
        message: cleaned === '' ? `unit is empty; expected one of ${UNITS.join(', ')}` : `unknown unit ${JSON.stringify(cleaned)}; expected one of ${UNITS.join(', ')}`,
      },
    ],
  };
}

const PER_QUANTITY: Readonly<Record<Quantity, readonly Unit[]>> = {
  dc_volts: ['V', 'mV'],
  ohms: ['Ω', 'kΩ', 'MΩ'],
  amps: ['A', 'mA'],
  scan_value: UNITS,
};

/** Units a reading of the given quantity may be entered in (a scan value may carry any of them). */
export function unitsFor(quantity: Quantity): readonly Unit[] {
  return PER_QUANTITY[quantity];
}

export interface SiValue {
  value: number;
  siUnit: SiUnit;
}

/** Converts a value to its stored unit (V, Ω, A, Pa, °C, %, rpm). */
export function toSi(value: number, unit: Unit): SiValue {
  const def = DEFS[unit];
  return { value: def.toSi(value), siUnit: def.siUnit };
}

/** Converts a value in the stored unit of `unit`'s kind back to `unit`. */
export function fromSi(siValue: number, unit: Unit): number {
  return DEFS[unit].fromSi(siValue);
}

export function siUnitOf(unit: Unit): SiUnit {
  return DEFS[unit].siUnit;
}

export type CheckReadingResult =
  | { ok: true; value: number; unit: Unit; siValue: number; siUnit: SiUnit }
  | { ok: false; findings: Finding[] };

/**
 * Everything the HTTP layer needs for one entered reading: the value is a finite number, the unit is known and fits
 * the quantity, resistances are not negative, temperatures are not below absolute zero; then the stored value.
 */
export function checkReading(
  value: unknown,
  unitText: string,
  quantity: Quantity,
  paths: { value?: string; unit?: string } = {},
): CheckReadingResult {
  const valuePath = paths.value ?? 'value';
  const unitPath = paths.unit ?? 'unit';
  const findings: Finding[] = [];
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    findings.push({ code: 'reading.not_a_number', path: valuePath, message: `reading must be a finite number, got ${JSON.stringify(value) ?? String(value)}` });
  }
  const parsed = parseUnit(unitText, unitPath);
  if (!parsed.ok) return { ok: false, findings: [...findings, ...parsed.findings] };
  const allowed = unitsFor(quantity);
  if (!allowed.includes(parsed.unit)) {
    findings.push({
      code: 'units.wrong_for_quantity',
      path: unitPath,
      message: `a ${quantity} reading takes ${allowed.join(', ')}; got ${parsed.unit}`,
    });
  }
  if (findings.length > 0) return { ok: false, findings };
  const entered = value as number;
  const si = toSi(entered, parsed.unit);
  if (si.siUnit === 'Ω' && entered < 0) {
    findings.push({ code: 'reading.negative_resistance', path: valuePath, message: `a resistance cannot be negative (got ${entered} ${parsed.unit})` });
  }
  if (si.siUnit === '°C' && si.value < ABSOLUTE_ZERO_C) {
    findings.push({ code: 'reading.below_absolute_zero', path: valuePath, message: `${entered} ${parsed.unit} is below absolute zero (−273.15 °C)` });
  }
  if (findings.length > 0) return { ok: false, findings };
  return { ok: true, value: entered, unit: parsed.unit, siValue: si.value, siUnit: si.siUnit };
}

export interface FormatOptions {
  /** Significant figures for units without fixed decimals (default 4). */
  significant?: number;
  /** Rescale volts, amps and ohms to the prefix that reads best (µV, mV, kΩ, MΩ ...). Default false. */
  autoPrefix?: boolean;
}

/** Units shown with a fixed number of decimals rather than significant figures. */
const FIXED_DECIMALS: Partial<Record<Unit, number>> = { rpm: 0, '%': 1, '°C': 1, '°F': 1 };

/** Display prefixes per stored unit, largest first; µ is the micro sign U+00B5. */
const PREFIXES: Partial<Record<SiUnit, ReadonlyArray<readonly [number, string]>>> = {
  V: [[1, 'V'], [1e-3, 'mV'], [1e-6, 'µV']],
  A: [[1, 'A'], [1e-3, 'mA'], [1e-6, 'µA']],
  Ω: [[1e6, 'MΩ'], [1e3, 'kΩ'], [1, 'Ω']],
};

function roundSignificant(value: number, significant: number): string {
  if (value === 0) return (0).toFixed(Math.max(0, significant - 1));
  const decimals = Math.max(0, significant - 1 - Math.floor(Math.log10(Math.abs(value))));
  return value.toFixed(decimals);
}

/**
 * A value for display with its unit symbol, separated by a space (NIST SP 811 §7.2 and §7.10.2, which also
 * space "%" and "°C"). A non-finite value displays as "—" before the unit.
 */
export function formatValue(value: number, unit: Unit, opts: FormatOptions = {}): string {
  if (!Number.isFinite(value)) return `— ${unit}`;
  const significant = opts.significant ?? 4;
  let shownValue = value;
  let shownUnit: string = unit;
  const prefixes = PREFIXES[siUnitOf(unit)];
  if (opts.autoPrefix && prefixes) {
    const si = Number(toSi(value, unit).value.toPrecision(significant));
    const [factor, symbol] = prefixes.find(([f]) => Math.abs(si) >= f) ?? prefixes[prefixes.length - 1];
    shownValue = si === 0 ? 0 : si / factor;
    shownUnit = si === 0 ? siUnitOf(unit) : symbol;
  }
  const fixed = FIXED_DECIMALS[unit];
  let text = fixed === undefined ? roundSignificant(shownValue, significant) : shownValue.toFixed(fixed);
  if (Number(text) === 0) text = text.replace(/^-/, '');
  return `${text} ${shownUnit}`;
}

export type PressureResult = { ok: true; pa: number } | { ok: false; findings: Finding[] };

function pressureFindings(entries: Array<[string, number]>): Finding[] {
  return entries
    .filter(([, v]) => typeof v !== 'number' || !Number.isFinite(v) || v < 0)
    .map(([path, v]) => ({ code: 'pressure.invalid', path, message: `${path} must be a finite pressure of 0 Pa or more, got ${String(v)}` }));
}

/**
 * Absolute pressure from a gauge vacuum reading and the barometer, all in Pa (convert with `toSi` first):
 * absolute = barometric − vacuum.
 */
export function vacuumToAbsolute(vacuumPa: number, barometricPa: number): PressureResult {
  const findings = pressureFindings([['vacuum', vacuumPa], ['barometric', barometricPa]]);
  if (findings.length === 0 && vacuumPa > barometricPa) {
    findings.push({ code: 'pressure.vacuum_exceeds_barometric', path: 'vacuum', message: `a vacuum of ${vacuumPa} Pa is deeper than the barometric ${barometricPa} Pa allows` });
  }
  return findings.length > 0 ? { ok: false, findings } : { ok: true, pa: barometricPa - vacuumPa };
}

/** Gauge vacuum from an absolute pressure and the barometer, all in Pa: vacuum = barometric − absolute. */
export function absoluteToVacuum(absolutePa: number, barometricPa: number): PressureResult {
  const findings = pressureFindings([['absolute', absolutePa], ['barometric', barometricPa]]);
  if (findings.length === 0 && absolutePa > barometricPa) {
    findings.push({ code: 'pressure.above_barometric', path: 'absolute', message: `${absolutePa} Pa absolute is above the barometric ${barometricPa} Pa: that is boost, not vacuum` });
  }
  return findings.length > 0 ? { ok: false, findings } : { ok: true, pa: barometricPa - absolutePa };
}

export type { Finding };
