import { describe, expect, it } from 'vitest';
import { referenceUnderLoad, referenceVerdict, resistanceFromDrop, voltageDropVerdict } from '../../../src/engine/calc';

describe('reference under load and voltage-drop verdicts (limits: common practice, no source)', () => {
  it.each([
    ['judges 5.00 V a good reference', 5.0, 'pass'],
    ['judges 4.90 V still within 5.00 ± 0.10 V', 4.9, 'pass'],
    ['judges 4.85 V low', 4.85, 'low'],
    ['judges 5.15 V high', 5.15, 'high'],
  ])('%s', (_name, volts, verdict) => {
    const r = referenceVerdict(volts);
    expect(r.ok && r.value).toBe(verdict);
  });

  it('accepts configurable reference limits', () => {
    const r = referenceVerdict(4.85, { nominalVolts: 5, toleranceVolts: 0.2, recoveryVolts: 4.8 });
    expect(r.ok && r.value).toBe('pass');
  });

  it.each([
    ['passes a 0.05 V sensor-ground drop', 0.05, undefined, 'pass'],
    ['fails a 0.25 V sensor-ground drop', 0.25, undefined, 'excessive'],
    ['passes 0.25 V under a configured 0.3 V limit', 0.25, 0.3, 'pass'],
  ])('%s', (_name, drop, limit, verdict) => {
    const r = voltageDropVerdict(drop, limit);
    expect(r.ok && r.value).toBe(verdict);
  });

  it('computes a 1 Ω reference source from 5.00 V falling to 2.50 V across a 1 Ω load (computed from R = Rload·(Vopen/Vloaded − 1))', () => {
    const r = referenceUnderLoad({ openVolts: 5, loadedVolts: 2.5, loadOhms: 1 });
    expect(r.ok && r.value.sourceOhms).toBeCloseTo(1, 10);
  });

  it.each([
    ['calls a reference that recovers to 4.95 V after the load healthy', 4.95, 'healthy'],
    ['calls a reference that recovers to exactly 4.8 V healthy', 4.8, 'healthy'],
    ['calls a reference that stays at 1.2 V shorted or weak', 1.2, 'shorted_or_weak'],
  ])('%s', (_name, releasedVolts, recovery) => {
    const r = referenceUnderLoad({ openVolts: 5, loadedVolts: 0.4, loadOhms: 0.1, releasedVolts });
    expect(r.ok && r.value.recovery).toBe(recovery);
  });

  it('reports a loaded reading above the open reading on its own path', () => {
    const r = referenceUnderLoad({ openVolts: 5, loadedVolts: 5.5, loadOhms: 10 });
    expect(!r.ok && r.findings[0]).toMatchObject({ code: 'loading.reading_above_open', path: 'loadedVolts' });
  });

  it('finds 200 Ω from a 0.2 V drop at 1 mA (Ohm’s law)', () => {
    const r = resistanceFromDrop(0.2, 0.001);
    expect(r.ok && r.value).toBeCloseTo(200, 9);
  });

  it('refuses a drop limit of zero', () => {
    const r = voltageDropVerdict(0.05, 0);
    expect(!r.ok && r.findings[0]?.code).toBe('drop.limit_not_positive');
  });
});
