import { describe, expect, it } from 'vitest';
import { compareWithChart, type ChartModel } from '../../../src/engine/calc';
import { thermistorCurve } from '../../../src/engine/circuit';

const chart = (id: string): ChartModel => thermistorCurve(id)!.model;
const SH_10K = chart('generic_10k_steinhart_hart');

describe("a reading at the sensor's pins against its chart", () => {
  it.each<[string, string, number, number]>([
    // Steinhart & Hart (Deep-Sea Research 15, 1968) with the widely published 10 kΩ set (from memory): computed,
    // within 0.1 % of published 10 kΩ tables from 0 to 100 °C.
    ['the 10 kΩ Steinhart–Hart chart', 'generic_10k_steinhart_hart', 25, 10_000],
    ['the 10 kΩ Steinhart–Hart chart', 'generic_10k_steinhart_hart', 0, 32_650],
    ['the 10 kΩ Steinhart–Hart chart', 'generic_10k_steinhart_hart', 50, 3_601],
    ['the 10 kΩ Steinhart–Hart chart', 'generic_10k_steinhart_hart', 100, 678.4],
    // Beta form R = R25·exp(β(1/T − 1/298.15 K)): computed.
    ['the β 3950 chart', 'generic_10k_beta_3950', 25, 10_000],
    ['the β 3950 chart', 'generic_10k_beta_3950', 0, 33_620.6],
    ['the β 3950 chart', 'generic_10k_beta_3950', 100, 697.52],
    ['the 2.2 kΩ β 3500 chart', 'generic_2k2_beta_3500', -20, 17_728.9],
    ['the 2.2 kΩ β 3500 chart', 'generic_2k2_beta_3500', 90, 269.09],
    ['the β 3435 chart', 'generic_10k_beta_3435', -40, 248_276.5],
  ])('gives %s %s °C → %s Ω as the expected resistance', (_name, id, celsius, ohms) => {
    const r = compareWithChart({ ohms, temperatureC: celsius, model: chart(id) });
    if (!r.ok) throw new Error(JSON.stringify(r.findings));
    expect(Math.abs(r.value.expectedOhms - ohms) / ohms).toBeLessThan(2e-4);
    expect(r.value.verdict).toBe('within');
    expect(r.value.readingTemperatureC).toBeCloseTo(celsius, 1);
  });

  it.each<[string, number | 'overload', number, string, string]>([
    // 10 kΩ chart at 25 °C, ±5 % and ±3 °C (common practice, no source): R(28 °C) ≈ 8 777 Ω (computed) × 0.95 ≈ 8 338 Ω,
    // R(22 °C) ≈ 11 420 Ω (computed) × 1.05 ≈ 11 991 Ω.
    ['a reading just inside the band’s low edge', 8_350, 25, 'within', 'chart.within'],
    ['a reading just outside the band’s low edge', 8_320, 25, 'below', 'chart.below'],
    ['a reading just inside the band’s high edge', 11_980, 25, 'within', 'chart.within'],
    ['a reading just outside the band’s high edge', 12_010, 25, 'above', 'chart.above'],
    ['a partly shorted sensor reading 3.6 kΩ cold', 3_601, 25, 'below', 'chart.below'],
    ['a sensor reading 32.65 kΩ on a warm day', 32_650, 25, 'above', 'chart.above'],
    ['an open sensor (OL)', 'overload', 20, 'above', 'chart.above'],
    ['a dead short (0 Ω)', 0, 20, 'below', 'chart.below'],
  ])('calls %s %s', (_name, ohms, celsius, verdict, code) => {
    const r = compareWithChart({ ohms, temperatureC: celsius, model: SH_10K });
    if (!r.ok) throw new Error(JSON.stringify(r.findings));
    expect(r.value.verdict).toBe(verdict);
    expect(r.value.finding).toMatchObject({ code, path: 'ohms' });
  });

  it('widens the band by the chart tolerance and the temperature spread given (NTC: warmer is lower)', () => {
    const r = compareWithChart({ ohms: 10_000, temperatureC: 25, model: SH_10K, tolerancePercent: 1, temperatureSpreadC: 0 });
    if (!r.ok) throw new Error('no result');
    expect(r.value.lowOhms).toBeCloseTo(r.value.expectedOhms * 0.99, 6);
    expect(r.value.highOhms).toBeCloseTo(r.value.expectedOhms * 1.01, 6);
  });

  it('names the reading’s own temperature on the chart when it is off: 3 601 Ω is about 50 °C (computed)', () => {
    const r = compareWithChart({ ohms: 3_601, temperatureC: 20, model: SH_10K });
    expect(r.ok && r.value.readingTemperatureC).toBeCloseTo(50, 1);
    expect(r.ok && r.value.finding.message).toMatch(/50 °C/);
  });

  it.each<[string, Record<string, unknown>, string, string]>([
    ['a negative reading', { ohms: -5 }, 'ohms', 'input.negative_resistance'],
    ['a temperature below the PID floor of −40 °C (SAE J1979)', { temperatureC: -41 }, 'temperatureC', 'input.out_of_range'],
    ['a temperature that is not a number', { temperatureC: Number.NaN }, 'temperatureC', 'input.not_a_number'],
    ['a tolerance of 80 %', { tolerancePercent: 80 }, 'tolerancePercent', 'input.out_of_range'],
    ['an unknown chart form', { model: { kind: 'table' } }, 'model.kind', 'chart.unknown_model'],
    ['a beta of zero', { model: { kind: 'beta', r25Ohms: 10_000, beta: 0 } }, 'model.beta', 'thermistor.beta_not_positive'],
  ])('refuses %s with a coded finding on the field', (_name, change, path, code) => {
    const r = compareWithChart({ ohms: 10_000, temperatureC: 25, model: SH_10K, ...change } as never);
    expect(r.ok).toBe(false);
    expect(!r.ok && r.findings).toContainEqual(expect.objectContaining({ path, code }));
  });
});
