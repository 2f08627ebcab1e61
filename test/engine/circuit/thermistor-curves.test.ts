import { describe, expect, it } from 'vitest';
import { defaultCircuit, predictReading, thermistorOhms } from '../../../src/engine/circuit';
import { biasAt, THERMISTOR_BIASES, THERMISTOR_CURVES, THERMISTOR_PAIRINGS, thermistorBias, thermistorCurve } from '../../../src/engine/circuit/thermistor-curves';
import { builtInTrees } from '../../../src/engine/diagnosis';

const tree = builtInTrees()['two-wire-thermistor']!;

describe('thermistor curves and biases as data', () => {
  it('says where every curve and bias comes from', () => {
    for (const x of [...THERMISTOR_CURVES, ...THERMISTOR_BIASES]) expect(x.source, x.id).toMatch(/from memory|common practice, no source|Steinhart/);
    for (const p of THERMISTOR_PAIRINGS) expect(thermistorCurve(p.curve) && thermistorBias(p.bias), JSON.stringify(p)).toBeTruthy();
  });

  it.each(THERMISTOR_CURVES.filter((c) => c.model.kind === 'beta').map((c) => [c.id, c]))('%s follows the beta equation R25·exp(β(1/T − 1/298.15 K)) (computed)', (_id, c) => {
    const m = c.model as { kind: 'beta'; r25Ohms: number; beta: number };
    expect(thermistorOhms(c.model, 25)).toBeCloseTo(m.r25Ohms, 6);
    expect(thermistorOhms(c.model, 100)! / (m.r25Ohms * Math.exp(m.beta * (1 / 373.15 - 1 / 298.15)))).toBeCloseTo(1, 9);
  });

  it('gives the generic 10 kΩ Steinhart–Hart set about 10 kΩ at 25 °C (from memory, generic)', () => {
    expect(thermistorOhms(thermistorCurve('generic_10k_steinhart_hart')!.model, 25)).toBeCloseTo(10_000, -2);
  });

  it('switches a dual-range bias to its hot resistor above its switch point only', () => {
    const dual = thermistorBias('dual_range_10k_909')!;
    expect(biasAt(dual, 20)).toEqual({ kind: 'pull_up', ohms: 10_000 });
    expect(biasAt(dual, 90)).toEqual({ kind: 'pull_up', ohms: 909 });
  });
});

// A healthy engine hot (110–120 °C), cold and freezing must read inside an outcome of the tree's signal tests, never
// in a guard band between two: a reading there is asked again and again and never counts.
describe.each(THERMISTOR_PAIRINGS.map((p) => [`${p.curve} on ${p.bias}`, p]))('a healthy %s', (_name, p) => {
  const curve = thermistorCurve(p.curve)!;
  const bias = thermistorBias(p.bias)!;
  // Hot, it must read in the working range (not "near 0 V", which a short gives); at −30 °C some read "near the 5 V
  // rail" as an open would, which the tree's cold circuit class predicts.
  it.each([-30, 20, 110, 115, 120])('at %i °C reads inside one outcome of the signal tests', (celsius) => {
    const circuit = defaultCircuit('two_wire_thermistor', { temperatureC: celsius, bias: biasAt(bias, celsius) });
    if (circuit.sensor.kind === 'thermistor') circuit.sensor.model = structuredClone(curve.model);
    for (const id of ['signal_backprobed', 'scan_signal_plugged']) {
      const test = tree.tests.find((t) => t.id === id)!;
      const predicted = predictReading(circuit, [], test.request);
      if (!predicted.ok) throw new Error(JSON.stringify(predicted.findings));
      const inside = test.outcomes.filter((o) => o.interval && predicted.value >= o.interval.lo && predicted.value <= o.interval.hi).map((o) => o.id);
      expect(inside, `${id}: ${predicted.value.toFixed(3)} V`).toHaveLength(1);
      if (celsius >= 20) expect(inside, `${id}: ${predicted.value.toFixed(3)} V`).toEqual(['mid']);
    }
  });
});
