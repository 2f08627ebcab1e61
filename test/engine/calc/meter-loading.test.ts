import { describe, expect, it } from 'vitest';
import {
  biasOhmsFromReading,
  meterReading,
  parallelOhms,
  resistancesAgree,
  sourceOhmsFromLoadedReading,
  sourceOhmsFromTwoLoads,
} from '../../../src/engine/calc';

describe('meter loading (textbook voltage divider: reading = V·Rm/(Rm + Rs))', () => {
  // Check values computed from the voltage-divider rule (Horowitz & Hill, The Art of Electronics, 3rd ed., ch. 1; from memory).
  it.each([
    ['5 V behind 1 MΩ reads 4.5455 V on a 10 MΩ meter', 5, 1e6, 10e6, 4.5455],
    ['5 V behind 10 kΩ reads 4.9950 V on a 10 MΩ meter', 5, 10e3, 10e6, 4.995],
    ['5 V behind 0 Ω reads the full 5 V', 5, 0, 10e6, 5],
  ])('%s', (_name, sourceVolts, sourceOhms, meterOhms, expected) => {
    const r = meterReading({ sourceVolts, sourceOhms, meterOhms });
    expect(r.ok && r.value).toBeCloseTo(expected, 4);
  });

  it('reveals about 267 kΩ of bias behind a 5 V input read as 4.87 V on 10 MΩ (common practice, no source)', () => {
    const r = biasOhmsFromReading({ openVolts: 5, readVolts: 4.87, meterOhms: 10e6 });
    expect(r.ok && r.value).toBeCloseTo(266_940, -1);
  });

  it('finds that 267 kΩ agrees with an ohms reading of 253 kΩ within 10 % (common practice, no source)', () => {
    const r = resistancesAgree(266_940, 253_000, 0.1);
    expect(r.ok && r.value.agree).toBe(true);
    expect(r.ok && r.value.relativeDifference).toBeCloseTo(0.0522, 3);
  });

  it('finds 267 kΩ and 200 kΩ not within 10 %', () => {
    const r = resistancesAgree(266_940, 200_000, 0.1);
    expect(r.ok && r.value.agree).toBe(false);
  });

  it('inverts the divider: 4.5455 V on 10 MΩ from 5 V means 1 MΩ of source (computed from Rs = Rm·(V/reading − 1))', () => {
    const r = sourceOhmsFromLoadedReading({ openVolts: 5, readVolts: 5 * (10 / 11), loadOhms: 10e6 });
    expect(r.ok && r.value).toBeCloseTo(1e6, 3);
  });

  it('finds 256 kΩ from 5.00 V on 10 MΩ and 4.00 V with 1 MΩ across the leads (computed from two divider equations)', () => {
    const r = sourceOhmsFromTwoLoads({ volts1: 5, load1Ohms: 10e6, volts2: 4, load2Ohms: parallelOhms(10e6, 1e6) });
    expect(r.ok && r.value).toBeCloseTo(256_410, -1);
  });

  it.each([
    ['a meter of 0 Ω', { openVolts: 5, readVolts: 4.87, meterOhms: 0 }, 'meterOhms', 'input.zero_resistance'],
    ['a negative meter resistance', { openVolts: 5, readVolts: 4.87, meterOhms: -1 }, 'meterOhms', 'input.negative_resistance'],
    ['a reading above the open-circuit voltage', { openVolts: 5, readVolts: 5.2, meterOhms: 10e6 }, 'readVolts', 'loading.reading_above_open'],
    ['a zero reading', { openVolts: 5, readVolts: 0, meterOhms: 10e6 }, 'readVolts', 'loading.reading_zero_or_reversed'],
    ['a missing reading', { openVolts: 5, meterOhms: 10e6 }, 'readVolts', 'input.not_a_number'],
  ])('refuses %s with a coded finding on its path', (_name, input, path, code) => {
    const r = biasOhmsFromReading(input as never);
    expect(r.ok).toBe(false);
    expect(!r.ok && r.findings).toContainEqual(expect.objectContaining({ code, path }));
  });

  it.each([
    ['a negative source resistance', { sourceVolts: 5, sourceOhms: -10, meterOhms: 10e6 }, 'sourceOhms'],
    ['a meter of 0 Ω', { sourceVolts: 5, sourceOhms: 10, meterOhms: 0 }, 'meterOhms'],
  ])('refuses a meter-reading input with %s', (_name, input, path) => {
    const r = meterReading(input);
    expect(!r.ok && r.findings.map((f) => f.path)).toEqual([path]);
  });
});
