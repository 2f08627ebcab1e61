import { describe, expect, it } from 'vitest';
import {
  bandProbabilities,
  bandTable,
  defaultCircuit,
  faultsFor,
  sampleReadings,
  type SampleInput,
} from '../../../src/engine/circuit';
import type { MeasurementRequest } from '../../../src/engine/vocabulary';

const circuit = defaultCircuit('three_wire_5v');
const koeo = (overrides: Partial<MeasurementRequest> = {}): MeasurementRequest => ({
  quantity: 'dc_volts',
  at: 'reference',
  against: 'battery_negative',
  location: 'sensor_connector',
  connector: 'backprobed',
  key: 'on',
  engine: 'off',
  jumpers: [],
  ...overrides,
});
const input = (overrides: Partial<SampleInput> = {}): SampleInput => ({ circuit, faults: [], request: koeo(), samples: 4000, seed: 7, ...overrides });

function sample(overrides: Partial<SampleInput> = {}) {
  const r = sampleReadings(input(overrides));
  if (!r.ok) throw new Error(JSON.stringify(r.findings));
  return r;
}

describe('Monte Carlo tolerance bands', () => {
  it('gives the very same values for the same seed', () => {
    expect(Array.from(sample().values)).toEqual(Array.from(sample().values));
  });

  it('gives different values for another seed', () => {
    expect(Array.from(sample({ seed: 8 }).values)).not.toEqual(Array.from(sample().values));
  });

  it('returns the values sorted, with ordered percentiles', () => {
    const r = sample();
    for (let i = 1; i < r.values.length; i++) expect(r.values[i]!).toBeGreaterThanOrEqual(r.values[i - 1]!);
    const p = r.percentiles;
    expect([p.p1, p.p5, p.p25, p.p50, p.p75, p.p95, p.p99]).toEqual([...[p.p1, p.p5, p.p25, p.p50, p.p75, p.p95, p.p99]].sort((a, b) => a - b));
  });

  // Regulator drawn from 4.9–5.1 V, plus the meter's ±(0.5 % + 2 digits) ≈ ±0.027 V: the reference stays near
  // 4.9–5.1 V (expectation 5.00 ± 0.10 V: common practice, no source).
  it('keeps a good circuit’s reference reading within 4.9–5.1 V apart from the meter’s own error', () => {
    const r = sample();
    expect(r.percentiles.p1).toBeGreaterThan(4.87);
    expect(r.percentiles.p99).toBeLessThan(5.13);
    expect(r.percentiles.p50).toBeCloseTo(5.0, 1);
    const bands = bandProbabilities(r.values, [{ id: 'in_spec', min: 4.9, max: 5.1 }]);
    expect(bands.in_spec).toBeGreaterThan(0.85);
  });

  // Signal open, read at the module connector with a 10 MΩ meter: the module side of the break is the 5 V rail
  // behind the bias only, so the meter reads Vreg·10 MΩ/(10 MΩ + Rb). Rb 200–300 kΩ and Vreg 4.9–5.1 V give
  // 4.9·10/10.3 = 4.757 V … 5.1·10/10.2 = 5.0 V, centred on 5·10/10.25 = 4.878 V: "near 4.87 V" (common practice).
  it('reads near 4.87 V at the module input on an open signal with pull-up bias and a 10 MΩ meter', () => {
    const r = sample({ faults: faultsFor('signal_open'), request: koeo({ at: 'signal', location: 'module_connector' }) });
    expect(r.percentiles.p50).toBeGreaterThan(4.85);
    expect(r.percentiles.p50).toBeLessThan(4.9);
    expect(r.percentiles.p1).toBeGreaterThan(4.73);
    expect(r.percentiles.p99).toBeLessThan(5.03);
  });

  it('sums band shares and the other share to one, overload counted in an open-ended band', () => {
    const values = new Float64Array([0.1, 0.2, 2.5, 4.9, 5.0, Number.POSITIVE_INFINITY]);
    const p = bandProbabilities(values, [
      { id: 'low', max: 0.5 },
      { id: 'mid', min: 1, max: 4 },
      { id: 'high', min: 4.95 },
    ]);
    expect(p).toEqual({ low: 2 / 6, mid: 1 / 6, high: 2 / 6, other: 1 / 6 });
  });

  it('builds a likelihood table whose rows each sum to one', () => {
    const t = bandTable({
      circuit,
      request: koeo(),
      bands: [
        { id: 'low', max: 4.5 },
        { id: 'ok', min: 4.5, max: 5.5 },
        { id: 'high', min: 5.5 },
      ],
      hypotheses: ['reference_open', 'reference_short_voltage', 'module_internal_regulator'],
      samples: 1000,
      seed: 3,
    });
    expect(t.ok).toBe(true);
    const rows = t.ok ? t.rows : [];
    expect(rows.map((r) => r.hypothesis)).toEqual(['good', 'reference_open', 'reference_short_voltage', 'module_internal_regulator']);
    const p = Object.fromEntries(rows.map((r) => [r.hypothesis, r.ok ? r.probabilities : {}]));
    expect(p.good!.ok).toBeGreaterThan(0.99);
    expect(p.reference_open!.low).toBeGreaterThan(0.99);
    expect(p.reference_short_voltage!.high).toBeGreaterThan(0.99);
    for (const r of rows) if (r.ok) expect(Object.values(r.probabilities).reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
  });

  it('marks a hypothesis that has no meaning on a two-wire circuit instead of guessing', () => {
    const t = bandTable({
      circuit: defaultCircuit('two_wire_thermistor'),
      request: koeo({ at: 'signal' }),
      bands: [{ id: 'any' }],
      hypotheses: ['reference_open', 'signal_open'],
      samples: 100,
      seed: 1,
    });
    const rows = t.ok ? t.rows : [];
    expect(rows.find((r) => r.hypothesis === 'reference_open')).toMatchObject({ ok: false });
    expect(rows.find((r) => r.hypothesis === 'signal_open')).toMatchObject({ ok: true });
  });

  it.each([
    ['zero samples', { samples: 0 }, 'samples'],
    ['a fractional seed', { seed: 1.5 }, 'seed'],
    ['a reversed bias spread', { spreads: { biasOhms: [300e3, 200e3] as [number, number] } }, 'spreads.biasOhms'],
  ])('refuses %s', (_name, overrides, path) => {
    const r = sampleReadings(input(overrides));
    expect(!r.ok && r.findings.map((f) => f.path)).toContain(path);
  });

  it('refuses bands with a duplicate id', () => {
    const t = bandTable({ circuit, request: koeo(), bands: [{ id: 'a' }, { id: 'a' }], hypotheses: [], samples: 10, seed: 1 });
    expect(!t.ok && t.findings[0]).toMatchObject({ code: 'bands.duplicate_id', path: 'bands[1].id' });
  });
});
