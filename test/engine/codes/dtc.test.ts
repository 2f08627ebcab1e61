import { describe, expect, it } from 'vitest';
import {
  decodeDtcBytes,
  encodeDtc,
  GENERIC_MEANINGS,
  genericMeaning,
  isReferenceVoltageCode,
  parseDtc,
  scopeOf,
  systemOf,
} from '../../../src/engine/codes';

// Check values: SAE J2012 two-byte layout (first two bits P, C, B, U; next two the first digit; then three hex digits), computed.
const BYTE_CASES: Array<[string, number[], string]> = [
  ['01 04', [0x01, 0x04], 'P0104'], // SAE J2012 layout, computed
  ['41 23', [0x41, 0x23], 'C0123'], // SAE J2012 layout, computed
  ['80 03', [0x80, 0x03], 'B0003'], // SAE J2012 layout, computed
  ['C1 58', [0xc1, 0x58], 'U0158'], // the OBD-II reference page's worked example
  ['0A 12', [0x0a, 0x12], 'P0A12'], // computed from the SAE J2012 bit layout
  ['31 23', [0x31, 0x23], 'P3123'], // computed: bits 13–12 = 3
  ['FF FF', [0xff, 0xff], 'U3FFF'], // computed: every bit set
];

describe('decodeDtcBytes', () => {
  it.each(BYTE_CASES)('decodes the bytes %s to %s (SAE J2012 layout)', (text, bytes, code) => {
    expect(decodeDtcBytes(bytes)).toEqual({ ok: true, code });
    expect(decodeDtcBytes(text)).toEqual({ ok: true, code });
  });

  it.each([['00 00'], [[0, 0]], ['0000']])('decodes %j as no code (SAE J2012)', (bytes) => {
    expect(decodeDtcBytes(bytes as string | number[])).toEqual({ ok: true, code: null });
  });

  it.each([
    [[0x01], 'dtc.wrong_byte_count', 'bytes'],
    [[0x01, 0x04, 0x00], 'dtc.wrong_byte_count', 'bytes'],
    [[0x01, 256], 'bytes.out_of_range', 'bytes[1]'],
    [[-1, 4], 'bytes.out_of_range', 'bytes[0]'],
    [[1.5, 4], 'bytes.out_of_range', 'bytes[0]'],
    ['01 G4', 'bytes.bad_hex', 'bytes[1]'],
    ['', 'dtc.wrong_byte_count', 'bytes'],
  ])('refuses %j with %s at %s', (bytes, code, path) => {
    const result = decodeDtcBytes(bytes as string | number[]);
    expect(result).toMatchObject({ ok: false, findings: [{ code, path }] });
  });
});

describe('encodeDtc', () => {
  it.each(BYTE_CASES)('encodes %s back from %s (SAE J2012 layout)', (_text, bytes, code) => {
    expect(encodeDtc(code)).toEqual({ ok: true, bytes });
  });

  it.each([['P0122'], ['C0035'], ['B1A2F'], ['U0100'], ['P2ABC']])('round-trips %s through its two bytes', (code) => {
    const encoded = encodeDtc(code);
    expect(encoded.ok && decodeDtcBytes(encoded.bytes)).toEqual({ ok: true, code });
  });
});

describe('parseDtc', () => {
  it.each([
    ['P0122', 'P0122'],
    ['p0a12', 'P0A12'],
    [' u0158 ', 'U0158'],
    ['c3fff', 'C3FFF'],
  ])('accepts %j and normalises it to %s', (text, code) => {
    expect(parseDtc(text)).toEqual({ ok: true, code });
  });

  it.each([
    ['P012', 'has 4 characters'],
    ['P01222', 'has 6 characters'],
    ['X0122', "starts with 'X'"],
    ['P4122', "has '4' as its second character"],
    ['P01G2', "has 'G' at position 4"],
    ['', 'has 0 characters'],
  ])('rejects %j saying it %s', (text, message) => {
    const result = parseDtc(text, 'codes[0]');
    expect(result).toMatchObject({ ok: false, findings: [{ code: 'dtc.bad_format', path: 'codes[0]' }] });
    expect(!result.ok && result.findings[0].message).toContain(message);
  });
});

describe('systemOf and scopeOf', () => {
  it.each([
    ['P0122', 'powertrain', 'sae_generic'],
    ['C0123', 'chassis', 'sae_generic'],
    ['B1003', 'body', 'manufacturer'],
    ['u0158', 'network', 'sae_generic'],
    ['P2135', 'powertrain', 'unclassified'],
    ['P3400', 'powertrain', 'unclassified'],
  ])('places %s in the %s system with scope %s (SAE J2012: 0 generic, 1 manufacturer)', (code, system, scope) => {
    expect(systemOf(code)).toBe(system);
    expect(scopeOf(code)).toBe(scope);
  });

  it.each([['Z0000'], ['P01']])('gives no system or scope for the malformed %s', (code) => {
    expect(systemOf(code)).toBeUndefined();
    expect(scopeOf(code)).toBeUndefined();
  });
});

describe('generic meanings (SAE J2012, generic code list)', () => {
  it.each([
    ['P0122', 'throttle_pedal_position_a', 'low input', 'three_wire_5v'],
    ['P0123', 'throttle_pedal_position_a', 'high input', 'three_wire_5v'],
    ['P0120', 'throttle_pedal_position_a', undefined, 'three_wire_5v'],
    ['P0124', 'throttle_pedal_position_a', 'intermittent', 'three_wire_5v'],
    ['P0105', 'map_baro', undefined, 'three_wire_5v'],
    ['P0108', 'map_baro', 'high input', 'three_wire_5v'],
    ['P0115', 'coolant_temperature', undefined, 'two_wire_thermistor'],
    ['P0118', 'coolant_temperature', 'high input', 'two_wire_thermistor'],
    ['P0112', 'intake_air_temperature', 'low input', 'two_wire_thermistor'],
    ['P0452', 'fuel_tank_pressure', 'low input', 'three_wire_5v'],
    ['P2127', 'pedal_position_e', 'low input', 'three_wire_5v'],
    ['P0641', 'reference_a', 'circuit/open', 'three_wire_5v'],
    ['P0643', 'reference_a', 'high input', 'three_wire_5v'],
    ['P0651', 'reference_b', 'circuit/open', 'three_wire_5v'],
    ['P0653', 'reference_b', 'high input', 'three_wire_5v'],
    ['P0697', 'reference_c', 'circuit/open', 'three_wire_5v'],
    ['p0699', 'reference_c', 'high input', 'three_wire_5v'],
  ])('tables %s in group %s (variant %s) on a %s circuit', (code, group, variant, circuitKind) => {
    const meaning = genericMeaning(code);
    expect(meaning).toMatchObject({ code: code.toUpperCase(), group, circuitKind, source: 'SAE J2012, generic code list' });
    expect(meaning?.variant).toBe(variant);
    expect(meaning?.meaning).toContain('generic SAE meaning');
  });

  it.each([['P0640'], ['P0104'], ['P0109'], ['P0119'], ['P0125'], ['P0644'], ['P0650'], ['P0654'], ['P0696'], ['P069A']])(
    'does not table %s (outside the listed ranges; P0640 is not a reference-voltage code)',
    (code) => {
      expect(genericMeaning(code)).toBeUndefined();
      expect(isReferenceVoltageCode(code)).toBe(false);
    },
  );

  it.each([['P0641'], ['P0652'], ['P0698']])('marks %s as a sensor reference-voltage code', (code) => {
    expect(isReferenceVoltageCode(code)).toBe(true);
  });

  it('gives a meaning for every row of the code table', () => {
    // 5 TP A + 5 TP B + 16 P2120–P2135 + 4 MAP + 4 IAT + 4 ECT + 5 FTP + 3 × 3 reference = 52 (counted from the SAE J2012 ranges tabled)
    expect(GENERIC_MEANINGS.size).toBe(52);
  });
});
