import { describe, expect, it } from 'vitest';
import { buildCodeTable, CODE_TABLE, codeMayConcern, codeRow, codeSensorOf, genericMeaning, isReferenceVoltageCode, windowsOf } from '../../../src/engine/codes';

const hex = (n: number) => `P${n.toString(16).toUpperCase().padStart(4, '0')}`;
/** The codes of a range with decimal digits only: P212A–P212F sit inside P2120–P2135 in hex but are another sensor's series. */
const range = (first: number, last: number) => Array.from({ length: last - first + 1 }, (_, i) => hex(first + i)).filter((c) => /^P\d{4}$/.test(c));

// The generic ranges the table must cover (SAE J2012, generic code list; ranges from memory).
const LISTED_RANGES: Array<[string, number, number]> = [
  ['TP A', 0x120, 0x123],
  ['TP B', 0x220, 0x223],
  ['APP D/E/F and TP A/B correlation', 0x2120, 0x2135],
  ['MAP', 0x105, 0x108],
  ['IAT', 0x110, 0x113],
  ['ECT', 0x115, 0x118],
  ['fuel tank pressure', 0x450, 0x454],
  ['5 V reference A', 0x641, 0x643],
  ['5 V reference B', 0x651, 0x653],
  ['5 V reference C', 0x697, 0x699],
];

describe('the code table covers the listed generic ranges', () => {
  it.each(LISTED_RANGES)('has a row for every code of the %s range (SAE J2012, generic code list)', (_name, first, last) => {
    const missing = range(first, last).filter((code) => !CODE_TABLE.has(code));
    expect(missing).toEqual([]);
  });

  it.each([['P212A'], ['P212C'], ['P212F']])('has no row for %s (a further sensor series, not tabled: reported as a finding)', (code) => {
    expect(CODE_TABLE.has(code)).toBe(false);
  });

  it('holds only codes of the listed ranges and their "intermittent" neighbours', () => {
    const listed = new Set(LISTED_RANGES.flatMap(([, a, b]) => range(a, b)));
    const extra = [...CODE_TABLE.keys()].filter((c) => !listed.has(c));
    // P0124, P0224: TP A/B circuit intermittent (SAE J2012, generic code list; from memory)
    expect(extra.sort()).toEqual(['P0124', 'P0224']);
  });
});

describe('code meanings (SAE J2012, generic code list; failure types from memory)', () => {
  it.each([
    ['P0120', 'TP A', 'circuit'],
    ['P0121', 'TP A', 'range_performance'],
    ['P0122', 'TP A', 'low_input'],
    ['P0123', 'TP A', 'high_input'],
    ['P0222', 'TP B', 'low_input'],
    ['P0223', 'TP B', 'high_input'],
    ['P2122', 'APP D', 'low_input'],
    ['P2123', 'APP D', 'high_input'],
    ['P2127', 'APP E', 'low_input'],
    ['P2128', 'APP E', 'high_input'],
    ['P2132', 'APP F', 'low_input'],
    ['P2133', 'APP F', 'high_input'],
    ['P2135', 'TP A', 'correlation'],
    ['P0107', 'MAP', 'low_input'],
    ['P0108', 'MAP', 'high_input'],
    ['P0112', 'IAT', 'low_input'],
    ['P0113', 'IAT', 'high_input'],
    ['P0117', 'ECT', 'low_input'],
    ['P0118', 'ECT', 'high_input'],
    ['P0452', 'FTP', 'low_input'],
    ['P0453', 'FTP', 'high_input'],
    ['P0641', '5 V reference A', 'circuit_open'],
    ['P0642', '5 V reference A', 'low_input'],
    ['P0643', '5 V reference A', 'high_input'],
    ['P0652', '5 V reference B', 'low_input'],
    ['P0698', '5 V reference C', 'low_input'],
    ['P0699', '5 V reference C', 'high_input'],
  ])('reads %s as %s, %s', (code, sensor, failure) => {
    const row = codeRow(code)!;
    expect(row.sensors).toContain(sensor);
    expect(row.failure).toBe(failure);
    expect(row.source).toBe('SAE J2012, generic code list');
    expect(row.meaning).toContain('generic SAE meaning');
  });

  it.each([['P0640'], ['P0644'], ['P0650'], ['P0696'], ['P1122'], ['P0A12']])('has no row for %s (outside the ranges; P0640 is not a reference-voltage code)', (code) => {
    expect(codeRow(code)).toBeUndefined();
    expect(genericMeaning(code)).toBeUndefined();
    expect(isReferenceVoltageCode(code)).toBe(false);
  });

  it.each([['P0641'], ['P0652'], ['p0699']])('marks %s as a sensor reference-voltage code watched at the module', (code) => {
    expect(isReferenceVoltageCode(code)).toBe(true);
    expect(codeRow(code)!.monitor).toBe('reference');
  });
});

describe('windows (common practice, no source: a 5 V module signal limit of about 0.2 V and 4.8 V, reference 5 V ± 0.5 V)', () => {
  it.each([
    ['P0122', [[-Infinity, 0.2]]],
    ['P0123', [[4.8, Infinity]]],
    ['P0120', [[-Infinity, 0.2], [4.8, Infinity]]],
    ['P0642', [[-Infinity, 4.5]]],
    ['P0643', [[5.5, Infinity]]],
    ['P0641', [[-Infinity, 4.5], [5.5, Infinity]]],
  ])('reads %s as the voltage window(s) %j', (code, windows) => {
    expect(windowsOf(codeRow(code)!)!.windows.map((w) => [w.lo, w.hi])).toEqual(windows);
  });

  it.each([['P0121'], ['P0124'], ['P2135'], ['P0454'], ['P0116']])('gives %s (range/performance, intermittent or correlation: set on a comparison) no window', (code) => {
    expect(windowsOf(codeRow(code)!)).toBeUndefined();
  });
});

describe('the table is validated when built', () => {
  it.each([
    ['a malformed code', [{ sensors: ['MAP'], monitor: 'signal', name: 'x', certainty: 'from memory', codes: { P01: 'circuit' } }], 'not a code'],
    ['a code twice', [{ sensors: ['MAP'], monitor: 'signal', name: 'x', certainty: 'from memory', codes: { P0107: 'low_input' } }, { sensors: ['IAT'], monitor: 'signal', name: 'y', certainty: 'from memory', codes: { P0107: 'low_input' } }], 'twice'],
    ['an unknown sensor', [{ sensors: ['O2S'], monitor: 'signal', name: 'x', certainty: 'from memory', codes: { P0130: 'circuit' } }], 'Invalid'],
    ['an unknown failure type', [{ sensors: ['MAP'], monitor: 'signal', name: 'x', certainty: 'from memory', codes: { P0107: 'shorted' } }], 'Invalid'],
    ['circuit/open on a signal', [{ sensors: ['MAP'], monitor: 'signal', name: 'x', certainty: 'from memory', codes: { P0107: 'circuit_open' } }], 'reference failure type'],
  ])('refuses %s', (_name, data, message) => {
    expect(() => buildCodeTable(data)).toThrow(message);
  });
});

describe('which table sensor a circuit names', () => {
  it.each([
    ['TP A', { sensor: 'TP A' }],
    ['TP B', { sensor: 'TP B' }],
    ['TP sensor 2', { sensor: 'TP B' }],
    ['tp 1', { sensor: 'TP A' }],
    ['APP E', { sensor: 'APP E' }],
    ['APP 3', { sensor: 'APP F' }],
    ['MAP', { sensor: 'MAP' }],
    ['BARO', { sensor: 'MAP' }],
    ['ECT', { sensor: 'ECT' }],
    ['FTP 1', { sensor: 'FTP' }],
    ['TP', { ambiguous: ['TP A', 'TP B'] }],
    ['APP 4', { ambiguous: ['APP D', 'APP E', 'APP F'] }],
  ])('maps %j to %j (SAE J1930 terms)', (text, match) => {
    expect(codeSensorOf(text)).toEqual(match);
  });

  it.each([['O2S 1'], ['throttle'], ['']])('maps %j to no table sensor', (text) => {
    expect(codeSensorOf(text)).toBeUndefined();
  });
});

describe('whether a code returned after a repair may concern the repaired circuit', () => {
  it.each([
    ['P0122', 'TP A', 'three_wire_5v', true],
    ['P0122', 'TP', 'three_wire_5v', true],
    ['P0222', 'TP sensor 1', 'three_wire_5v', false],
    ['P0107', 'TP A', 'three_wire_5v', false],
    ['P0118', 'ECT', 'two_wire_thermistor', true],
    ['P0642', 'MAP', 'three_wire_5v', true],
    ['P0642', 'ECT', 'two_wire_thermistor', false],
    ['P0453', 'fuel tank pressure, rear', 'three_wire_5v', false],
  ] as const)('%s on a %s circuit (%s): %s', (code, sensor, kind, expected) => {
    expect(codeMayConcern(codeRow(code)!, sensor, kind)).toBe(expected);
  });
});
