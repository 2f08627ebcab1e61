import { describe, expect, it } from 'vitest';
import {
  absoluteToVacuum,
  checkReading,
  formatValue,
  fromSi,
  PA_PER_ATM,
  parseUnit,
  toSi,
  type Unit,
  UNITS,
  unitsFor,
  vacuumToAbsolute,
} from '../../../src/engine/units';
import { QUANTITIES } from '../../../src/engine/vocabulary';

describe('parseUnit', () => {
  it.each([
    ['V', 'V'], ['v', 'V'], ['mV', 'mV'], ['mv', 'mV'],
    ['Ω', 'Ω'], ['\u2126', 'Ω'], ['ohm', 'Ω'], ['ohms', 'Ω'], ['Ohm', 'Ω'], ['OHMS', 'Ω'],
    ['kΩ', 'kΩ'], ['kohm', 'kΩ'], ['kOhms', 'kΩ'],
    ['MΩ', 'MΩ'], ['Mohm', 'MΩ'], ['M', 'MΩ'], ['megohm', 'MΩ'],
    ['A', 'A'], ['mA', 'mA'],
    ['Pa', 'Pa'], ['kPa', 'kPa'], ['kpa', 'kPa'], ['KPA', 'kPa'],
    ['inHg', 'inHg'], ['in Hg', 'inHg'], ['inhg', 'inHg'],
    ['psi', 'psi'], ['PSI', 'psi'],
    ['°C', '°C'], ['C', '°C'], ['degC', '°C'], ['\u2103', '°C'],
    ['°F', '°F'], ['F', '°F'], ['degF', '°F'], ['  deg  F ', '°F'],
    ['%', '%'], ['rpm', 'rpm'], ['RPM', 'rpm'],
  ])('reads %j as %s', (text, unit) => {
    expect(parseUnit(text)).toEqual({ ok: true, unit });
  });

  it.each([
    ['m', 'units.ambiguous', 'milli or mega'],
    ['mohm', 'units.ambiguous', 'milliohms or megohms'],
    ['MOHM', 'units.ambiguous', 'milliohms or megohms'],
    ['mΩ', 'units.ambiguous', 'milliohms'],
    // A bare "k" is a prefix, never used alone (BIPM SI Brochure, 9th ed., §3, from memory): refused with the list of units.
    ['k', 'units.ambiguous', 'expected one of V, mV, Ω, kΩ, MΩ'],
    ['K', 'units.ambiguous', 'not a unit'],
    ['MV', 'units.unknown', 'unknown unit "MV"'],
    ['MA', 'units.unknown', 'unknown unit "MA"'],
    ['volts?', 'units.unknown', 'unknown unit'],
    ['', 'units.unknown', 'unit is empty'],
    // Names of Object.prototype's members are text like any other (the fuzz test found "valueOf" giving a 500).
    ['valueOf', 'units.unknown', 'unknown unit "valueOf"'],
    ['constructor', 'units.unknown', 'unknown unit "constructor"'],
    ['__proto__', 'units.unknown', 'unknown unit "__proto__"'],
    ['toString', 'units.unknown', 'unknown unit "toString"'],
  ])('refuses %j with %s explaining "%s"', (text, code, message) => {
    const result = parseUnit(text, 'readings[2].unit');
    expect(result).toMatchObject({ ok: false, findings: [{ code, path: 'readings[2].unit' }] });
    expect(!result.ok && result.findings[0].message).toContain(message);
  });
});

describe('toSi and fromSi', () => {
  it.each<[number, Unit, number, string, string]>([
    [1, 'inHg', 3386.389, 'Pa', 'NIST SP 811 appendix B (inch of mercury, conventional)'],
    [1, 'psi', 6894.757, 'Pa', 'NIST SP 811 appendix B'],
    [20, 'inHg', 67727.78, 'Pa', 'computed from NIST SP 811: 20 × 3386.389'],
    [101.325, 'kPa', 101325, 'Pa', 'SI prefix k = 10³ (NIST SP 811 §4.3)'],
    [4870, 'mV', 4.87, 'V', 'SI prefix m = 10⁻³'],
    [267, 'kΩ', 267000, 'Ω', 'SI prefix k = 10³'],
    [10, 'MΩ', 10_000_000, 'Ω', 'SI prefix M = 10⁶'],
    [250, 'mA', 0.25, 'A', 'SI prefix m = 10⁻³'],
    [212, '°F', 100, '°C', 'computed from NIST SP 811: t/°C = (t/°F − 32)/1.8'],
    [32, '°F', 0, '°C', 'computed from NIST SP 811'],
    [-40, '°F', -40, '°C', 'computed from NIST SP 811'],
    [83, '°C', 83, '°C', 'stored as entered: °C is the canonical temperature unit'],
    [50.196, '%', 50.196, '%', 'stored as entered'],
    [750, 'rpm', 750, 'rpm', 'stored as entered'],
  ])('converts %d %s to %d %s (%s)', (value, unit, si, siUnit) => {
    const result = toSi(value, unit);
    expect(result.siUnit).toBe(siUnit);
    expect(result.value).toBeCloseTo(si, 9);
    expect(fromSi(result.value, unit)).toBeCloseTo(value, 9);
  });

  it.each<[Unit, number, number, string]>([
    ['inHg', 29.9213, 4, 'computed from NIST SP 811: 101 325 / 3386.389'],
    ['psi', 14.6959, 4, 'computed from NIST SP 811: 101 325 / 6894.757'],
    ['kPa', 101.325, 9, 'NIST SP 811 appendix B: 1 atm = 101 325 Pa exactly'],
  ])('expresses one standard atmosphere in %s as %d (%s)', (unit, expected, digits) => {
    expect(fromSi(PA_PER_ATM, unit)).toBeCloseTo(expected, digits);
  });

  it.each([...UNITS])('round-trips 12.345 %s through the stored unit', (unit) => {
    expect(fromSi(toSi(12.345, unit).value, unit)).toBeCloseTo(12.345, 9);
  });
});

describe('unitsFor', () => {
  it.each([
    ['dc_volts', ['V', 'mV']],
    ['ohms', ['Ω', 'kΩ', 'MΩ']],
    ['amps', ['A', 'mA']],
  ] as const)('allows a %s reading only in %j', (quantity, units) => {
    expect([...unitsFor(quantity)]).toEqual(units);
  });

  it.each([['%'], ['rpm'], ['kPa'], ['inHg'], ['psi'], ['°C'], ['°F'], ['V']] as const)(
    'allows a scan value in %s',
    (unit) => {
      expect(unitsFor('scan_value')).toContain(unit);
    },
  );

  it.each([...QUANTITIES])('gives a non-empty unit list for every vocabulary quantity (%s)', (quantity) => {
    expect(unitsFor(quantity).length).toBeGreaterThan(0);
  });
});

describe('checkReading', () => {
  it.each([
    [4.87, 'V', 'dc_volts', 4.87, 'V'],
    [253, 'kohm', 'ohms', 253_000, 'Ω'],
    [20, 'inHg', 'scan_value', 67727.78, 'Pa'],
    [-40, 'F', 'scan_value', -40, '°C'],
  ] as const)('accepts %d %s as a %s reading stored as %d %s', (value, unit, quantity, siValue, siUnit) => {
    const result = checkReading(value, unit, quantity);
    expect(result.ok).toBe(true);
    if (result.ok) {
      expect(result.siValue).toBeCloseTo(siValue, 6);
      expect(result.siUnit).toBe(siUnit);
    }
  });

  it.each([
    [4.87, 'kΩ', 'dc_volts', 'units.wrong_for_quantity', 'unit', 'a dc_volts reading takes V, mV; got kΩ'],
    [12, 'V', 'ohms', 'units.wrong_for_quantity', 'unit', 'a ohms reading takes Ω, kΩ, MΩ; got V'],
    [5, 'mohm', 'ohms', 'units.ambiguous', 'unit', 'milliohms or megohms'],
    ['4.87', 'V', 'dc_volts', 'reading.not_a_number', 'value', 'finite number, got "4.87"'],
    [Number.NaN, 'V', 'dc_volts', 'reading.not_a_number', 'value', 'finite number'],
    [-3, 'Ω', 'ohms', 'reading.negative_resistance', 'value', 'cannot be negative'],
    [-500, '°F', 'scan_value', 'reading.below_absolute_zero', 'value', 'below absolute zero'],
  ] as const)('refuses %j %s as %s with %s at %s: "%s"', (value, unit, quantity, code, path, message) => {
    const result = checkReading(value, unit, quantity);
    expect(result.ok).toBe(false);
    const finding = !result.ok ? result.findings.find((f) => f.code === code) : undefined;
    expect(finding?.path).toBe(path);
    expect(finding?.message).toContain(message);
  });
});

describe('formatValue', () => {
  it.each<[number, Unit, boolean, string]>([
    [4.87, 'V', false, '4.870 V'],
    [12.589, 'V', false, '12.59 V'],
    [0.3177, 'V', false, '0.3177 V'],
    [83, '°C', false, '83.0 °C'],
    [50.19607843, '%', false, '50.2 %'], // NIST SP 811 §7.10.2: a space before %
    [1726, 'rpm', false, '1726 rpm'],
    [16383.75, 'rpm', false, '16384 rpm'],
    [33.597, 'kPa', false, '33.60 kPa'],
    [-0.00001, 'V', false, '-0.00001000 V'],
    [-0.0000001, '°C', false, '0.0 °C'],
    [267000, 'Ω', true, '267.0 kΩ'],
    [10, 'MΩ', true, '10.00 MΩ'],
    [0.0123, 'V', true, '12.30 mV'],
    [0.0000456, 'A', true, '45.60 µA'],
    [999.96, 'mV', true, '1.000 V'],
    [0, 'kΩ', true, '0.000 Ω'],
    [Number.NaN, 'V', false, '— V'],
  ])('shows %d %s (autoPrefix %s) as %j', (value, unit, autoPrefix, text) => {
    expect(formatValue(value, unit, { autoPrefix })).toBe(text);
  });

  it('uses the micro sign U+00B5 for micro', () => {
    expect(formatValue(0.000002, 'V', { autoPrefix: true })).toBe('2.000 \u00b5V');
  });
});

describe('vacuum and absolute pressure', () => {
  it('gives 33.597 kPa absolute for 20 inHg vacuum under a 101.325 kPa barometer (computed from NIST SP 811 inHg)', () => {
    const result = vacuumToAbsolute(toSi(20, 'inHg').value, toSi(101.325, 'kPa').value);
    expect(result.ok && fromSi(result.pa, 'kPa')).toBeCloseTo(33.597, 3);
  });

  it('recovers 20 inHg of vacuum from 33.597 kPa absolute under 101.325 kPa (computed, inverse)', () => {
    const result = absoluteToVacuum(33_597.22, 101_325);
    expect(result.ok && fromSi(result.pa, 'inHg')).toBeCloseTo(20, 4);
  });

  it.each([
    [() => vacuumToAbsolute(-1, 101_325), 'pressure.invalid', 'vacuum'],
    [() => vacuumToAbsolute(5_000, Number.NaN), 'pressure.invalid', 'barometric'],
    [() => vacuumToAbsolute(110_000, 101_325), 'pressure.vacuum_exceeds_barometric', 'vacuum'],
    [() => absoluteToVacuum(150_000, 101_325), 'pressure.above_barometric', 'absolute'],
  ])('refuses impossible pressures (case %#) with %s at %s', (call, code, path) => {
    expect(call()).toMatchObject({ ok: false, findings: [{ code, path }] });
  });
});
