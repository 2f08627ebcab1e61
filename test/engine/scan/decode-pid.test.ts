import { describe, expect, it } from 'vitest';
import { decodePid, PID_DEFINITIONS, parsePid, pidDefinition } from '../../../src/engine/scan';

// Check values: SAE J1979 mode 01 formulas as reproduced on the
// public "OBD-II PIDs" reference page. "computed" = worked out from that formula.
describe('decodePid on measurements', () => {
  it.each([
    ['05', '7B', 83, '°C', 'computed: A − 40'],
    ['05', '00', -40, '°C', 'bottom of range, A − 40'],
    ['05', 'FF', 215, '°C', 'top of range, A − 40'],
    ['0F', '3C', 20, '°C', 'computed: A − 40'],
    ['0B', '21', 33, 'kPa', 'computed: A'],
    ['0B', '65', 101, 'kPa', 'computed: A'],
    ['33', '65', 101, 'kPa', 'computed: A'],
    ['0C', '0B B8', 750, 'rpm', 'computed: (256A + B)/4'],
    ['0C', '1A F8', 1726, 'rpm', 'computed: (256A + B)/4'],
    ['0C', 'FF FF', 16383.75, 'rpm', 'top of range, (256A + B)/4'],
    ['42', '31 2D', 12.589, 'V', 'computed: (256A + B)/1000'],
    ['42', '36 B0', 14.0, 'V', 'computed: (256A + B)/1000'],
    ['11', '80', 50.196, '%', 'computed: 100A/255'],
    ['11', '33', 20.0, '%', 'computed: 100A/255'],
    ['47', '80', 50.196, '%', 'computed: 100A/255'],
    ['47', '33', 20.0, '%', 'computed: 100A/255'],
    ['49', '80', 50.196, '%', 'computed: 100A/255'],
    ['49', '33', 20.0, '%', 'computed: 100A/255'],
    ['4A', '80', 50.196, '%', 'computed: 100A/255'],
    ['4A', '33', 20.0, '%', 'computed: 100A/255'],
    ['4C', '80', 50.196, '%', 'computed: 100A/255'],
    ['4C', '33', 20.0, '%', 'computed: 100A/255'],
  ])('decodes PID %s bytes %s as %d %s (SAE J1979, %s)', (pid, bytes, value, unit) => {
    const result = decodePid(pid, bytes);
    expect(result).toMatchObject({ ok: true, pid, kind: 'measurement', unit });
    expect(result.ok && (result.value as number)).toBeCloseTo(value, 3);
  });

  it.each([
    [0x0c, [0x1a, 0xf8], 1726],
    ['0c', [26, 248], 1726],
    ['0x0C', '1af8', 1726],
    [5, [0x7b], 83],
  ])('accepts PID %j with bytes %j in any of the supported spellings (→ %d, computed)', (pid, bytes, value) => {
    expect(decodePid(pid, bytes)).toMatchObject({ ok: true, pid: pidDefinition(pid)?.pid, value });
  });
});

describe('decodePid on the supported-PIDs bitmap', () => {
  it('reads BE 1F A8 13 as PIDs 01, 03–07, 0C–11, 13, 15, 1C, 1F, 20 (the OBD-II PIDs page worked example)', () => {
    expect(decodePid('00', 'BE 1F A8 13')).toEqual({
      ok: true,
      pid: '00',
      name: 'PIDs supported [01–20]',
      kind: 'supported_pids',
      unit: null,
      value: ['01', '03', '04', '05', '06', '07', '0C', '0D', '0E', '0F', '10', '11', '13', '15', '1C', '1F', '20'],
    });
  });

  it.each([
    ['80 00 00 00', ['01']],
    ['00 00 00 01', ['20']],
    ['00 00 00 00', []],
  ])('reads the bitmap %s as %j (computed: bit 7 of the first byte is PID 01)', (bytes, pids) => {
    expect(decodePid(0, bytes)).toMatchObject({ ok: true, value: pids });
  });
});

describe('decodePid refusals', () => {
  it.each([
    ['0C', '1A', 'scan.wrong_byte_count', 'bytes', 'PID 0C (Engine speed) takes 2 data bytes, got 1'],
    ['05', '7B 00', 'scan.wrong_byte_count', 'bytes', 'PID 05 (Engine coolant temperature) takes 1 data byte, got 2'],
    ['00', 'BE 1F A8', 'scan.wrong_byte_count', 'bytes', 'takes 4 data bytes, got 3'],
    ['05', [256], 'bytes.out_of_range', 'bytes[0]', 'byte 256 is not an integer 0–255'],
    ['0C', [0x1a, -1], 'bytes.out_of_range', 'bytes[1]', 'byte -1 is not an integer 0–255'],
    ['0C', '1A ZZ', 'bytes.bad_hex', 'bytes[1]', '"ZZ" is not a hex byte'],
    ['0D', '20', 'scan.unknown_pid', 'pid', 'PID 0D is not decoded here'],
    ['1G', '20', 'scan.bad_pid', 'pid', 'PID "1G" is not a hex number'],
    [256, '20', 'scan.bad_pid', 'pid', 'PID 256 is not a hex number'],
    [1.5, '20', 'scan.bad_pid', 'pid', 'PID 1.5 is not a hex number'],
  ])('refuses PID %j with bytes %j: %s at %s', (pid, bytes, code, path, message) => {
    const result = decodePid(pid, bytes as string | number[]);
    expect(result).toMatchObject({ ok: false, findings: [{ code, path }] });
    expect(!result.ok && result.findings[0].message).toContain(message);
  });

  it('addresses findings at the caller’s paths', () => {
    expect(decodePid('0C', '1A', { bytes: 'readings[3].raw' })).toMatchObject({
      ok: false,
      findings: [{ code: 'scan.wrong_byte_count', path: 'readings[3].raw' }],
    });
  });
});

describe('the PID table', () => {
  it.each(PID_DEFINITIONS.filter((d) => d.range).map((d) => [d.pid, d] as const))(
    'keeps PID %s within its stated range at byte values 00 and FF',
    (_pid, def) => {
      for (const fill of [0x00, 0xff]) {
        const decoded = def.decode(Array(def.bytes).fill(fill));
        expect(decoded.kind).toBe('measurement');
        const value = decoded.value as number;
        expect(value).toBeGreaterThanOrEqual(def.range!.min);
        expect(value).toBeLessThanOrEqual(def.range!.max);
      }
    },
  );

  it.each([
    ['05', -40, 215], // SAE J1979 formula range, computed
    ['0B', 0, 255],
    ['0C', 0, 16383.75],
    ['11', 0, 100],
    ['42', 0, 65.535],
  ])('states the range of PID %s as %d to %d (SAE J1979 formula range, computed)', (pid, min, max) => {
    expect(pidDefinition(pid)?.range).toEqual({ min, max });
  });

  it.each([['0c', '0C'], ['C', '0C'], [17, '11'], [' 0x4a ', '4A']])('normalises the PID %j to %s', (pid, text) => {
    expect(parsePid(pid)).toEqual({ ok: true, pid: text });
  });
});
