/**
 * A healthy thermistor on a cold-soaked engine reads close to the open-circuit voltage of its pull-up: a 10 kΩ NTC
 * is some hundreds of kΩ at −40 °C, the lowest coolant temperature SAE J1979 (PID 05, A − 40 °C) can report. Such a
 * circuit must never be concluded as a thermistor open inside (or any other wire or part fault). The circuits are the
 * independent out-of-model ones (test/support/out-of-model): healthy, with the temperature and pull-up set; pull-ups
 * of 1.5–10 kΩ are the range that model draws from (common practice, no source).
 */
import { describe, expect, it } from 'vitest';
import { builtInTrees } from '../../../src/engine/diagnosis';
import { drawOomCase, type OomCase } from '../../support/out-of-model/cases';
import type { CircuitCase } from '../../support/out-of-model/circuits';
import { runOomCase } from '../../support/out-of-model/drive';

const tree = builtInTrees()['two-wire-thermistor']!;

/** A healthy circuit of the out-of-model population with its sensor at `celsius` behind a `pullUpOhms` pull-up. */
function coldCase(index: number, celsius: number, pullUpOhms: number): OomCase {
  const c = drawOomCase('two-wire-thermistor', 'no_fault_now', index, 20_261_203);
  const circuit = c.circuit as CircuitCase;
  if (circuit.sensor.kind !== 'ntc') throw new Error('a thermistor circuit has an NTC');
  return { ...c, circuit: { ...circuit, bias: { direction: 'pull_up', ohms: pullUpOhms }, sensor: { ...circuit.sensor, celsius } } };
}

describe('a healthy thermistor on a cold-soaked engine', () => {
  it.each([
    { celsius: -40, pullUpOhms: 1_500 },
    { celsius: -40, pullUpOhms: 4_000 },
    { celsius: -40, pullUpOhms: 10_000 },
    { celsius: -30, pullUpOhms: 1_500 },
    { celsius: -30, pullUpOhms: 4_000 },
    { celsius: -30, pullUpOhms: 8_000 },
    { celsius: -20, pullUpOhms: 1_600 },
  ])('is not concluded as a wire or part fault at $celsius °C behind a $pullUpOhms Ω pull-up', async ({ celsius, pullUpOhms }) => {
    for (const index of [0, 1, 2, 3]) {
      const run = await runOomCase(tree, coldCase(index, celsius, pullUpOhms));
      expect(run.healthyBlamed, `case ${index} proven as ${run.proven} after ${run.readings} readings`).toBe(false);
    }
  });
});
