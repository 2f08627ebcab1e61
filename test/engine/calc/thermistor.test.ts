import { describe, expect, it } from 'vitest';
import {
  betaResistance,
  betaTemperature,
  steinhartHartResistance,
  steinhartHartTemperature,
  thermistorDividerVolts,
  thermistorOhmsFromDivider,
} from '../../../src/engine/calc';

// The widely published generic 10 kΩ set (from memory, generic).
const SH = { a: 1.12924e-3, b: 2.34108e-4, c: 8.7755e-8 };

describe('Steinhart–Hart (Steinhart & Hart, Deep-Sea Research 15, 1968): 1/T = A + B ln R + C (ln R)³', () => {
  // Points computed from the Steinhart & Hart (1968) equation with the generic set.
  it.each([
    [0, 32_650],
    [25, 10_000],
    [50, 3_601],
    [100, 678.4],
  ])('gives about %s °C → %s Ω (inverse by Cardano’s formula)', (t, ohms) => {
    const r = steinhartHartResistance(t, SH);
    expect(r.ok).toBe(true);
    expect(Math.abs((r.ok ? r.value : 0) - ohms) / ohms).toBeLessThan(2e-4);
  });

  it.each([
    [32_650, 0],
    [10_000, 25],
    [3_601, 50],
    [678.4, 100],
  ])('reads %s Ω as about %s °C', (ohms, t) => {
    const r = steinhartHartTemperature(ohms, SH);
    expect(r.ok && r.value).toBeCloseTo(t, 1);
  });

  it.each([-40, -10, 20, 80, 120, 150])('round-trips %s °C through resistance and back to 1e-9 °C', (t) => {
    const r = steinhartHartResistance(t, SH);
    const back = r.ok ? steinhartHartTemperature(r.value, SH) : r;
    expect(back.ok && back.value).toBeCloseTo(t, 9);
  });

  it('solves the C = 0 case as the plain logarithmic law', () => {
    const k = { a: SH.a, b: SH.b, c: 0 };
    const r = steinhartHartResistance(25, k);
    expect(r.ok && Math.log(r.value)).toBeCloseTo((1 / 298.15 - k.a) / k.b, 9);
  });

  it.each([
    ['a negative resistance', () => steinhartHartTemperature(-5, SH), 'ohms', 'input.negative_resistance'],
    ['a temperature below absolute zero', () => steinhartHartResistance(-300, SH), 'temperatureC', 'thermistor.below_absolute_zero'],
    ['a negative coefficient C', () => steinhartHartResistance(25, { ...SH, c: -1e-7 }), 'coefficients.c', 'thermistor.coefficient_c_negative'],
  ])('refuses %s', (_name, run, path, code) => {
    const r = run();
    expect(!r.ok && r.findings).toContainEqual(expect.objectContaining({ code, path }));
  });
});

describe('beta equation: R = R25·exp(β·(1/T − 1/298.15 K))', () => {
  const K = { r25Ohms: 10_000, beta: 3950 };
  it('gives R25 at 25 °C', () => {
    const r = betaResistance(25, K);
    expect(r.ok && r.value).toBeCloseTo(10_000, 6);
  });

  it('gives 33 621 Ω at 0 °C for β = 3950 K (computed from the beta equation)', () => {
    const r = betaResistance(0, K);
    expect(r.ok && r.value).toBeCloseTo(33_620.6, 0);
  });

  it.each([-30, 0, 60, 110])('round-trips %s °C', (t) => {
    const r = betaResistance(t, K);
    const back = r.ok ? betaTemperature(r.value, K) : r;
    expect(back.ok && back.value).toBeCloseTo(t, 9);
  });

  it('refuses a beta of zero', () => {
    const r = betaTemperature(10_000, { r25Ohms: 10_000, beta: 0 });
    expect(!r.ok && r.findings[0]?.path).toBe('coefficients.beta');
  });
});

describe('module pull-up divider: V = 5·Rt/(Rt + Rp), Rp = 10 kΩ (voltage-divider rule, computed)', () => {
  it.each([
    [10_000, 2.5],
    [32_650, 3.8277],
    [678.4, 0.3177],
  ])('reads %s Ω of thermistor as %s V', (rt, volts) => {
    const r = thermistorDividerVolts({ supplyVolts: 5, pullUpOhms: 10_000, thermistorOhms: rt });
    expect(r.ok && r.value).toBeCloseTo(volts, 4);
  });

  it('recovers the thermistor resistance from the divider voltage', () => {
    const r = thermistorOhmsFromDivider({ supplyVolts: 5, pullUpOhms: 10_000, volts: 3.8277 });
    expect(r.ok && r.value).toBeCloseTo(32_650, -1);
  });

  it('refuses a pull-up of 0 Ω', () => {
    const r = thermistorDividerVolts({ supplyVolts: 5, pullUpOhms: 0, thermistorOhms: 10_000 });
    expect(!r.ok && r.findings[0]).toMatchObject({ code: 'input.zero_resistance', path: 'pullUpOhms' });
  });

  it('refuses a divider voltage at the supply (an open thermistor has no finite resistance)', () => {
    const r = thermistorOhmsFromDivider({ supplyVolts: 5, pullUpOhms: 10_000, volts: 5 });
    expect(!r.ok && r.findings[0]?.code).toBe('divider.volts_outside_supply');
  });
});
