/**
 * Circuit model speed: one predicted reading (validate, build, solve) and a 10 000-sample Monte Carlo band for one
 * test. Target: the Monte Carlo band well under a second.
 */
import type { BenchResult } from './run';
import { bandTable, defaultCircuit, faultsFor, predictReading, sampleReadings } from '../src/engine/circuit';
import type { MeasurementRequest } from '../src/engine/vocabulary';

const request: MeasurementRequest = {
  quantity: 'dc_volts',
  at: 'signal',
  against: 'battery_negative',
  location: 'module_connector',
  connector: 'backprobed',
  key: 'on',
  engine: 'off',
  jumpers: [],
};

function time(label: string, runs: number, fn: () => unknown): Record<string, string | number> {
  for (let i = 0; i < Math.min(3, runs); i++) fn(); // warm-up
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    fn();
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  const median = times[Math.floor(times.length / 2)]!;
  const fmt = (ms: number) => (ms < 1 ? `${(ms * 1000).toFixed(1)} µs` : `${ms.toFixed(1)} ms`);
  return { operation: label, runs, 'median per op': fmt(median), 'fastest per op': fmt(times[0]!) };
}

export default async (): Promise<BenchResult> => {
  const circuit = defaultCircuit('three_wire_5v');
  const thermistor = defaultCircuit('two_wire_thermistor');
  const faults = faultsFor('signal_open');
  const hypotheses = ['signal_open', 'signal_short_ground', 'signal_short_voltage', 'signal_short_reference', 'reference_open', 'ground_open', 'ground_high_resistance', 'sensor_internal', 'module_internal'];
  const rows = [
    time('one reading: predictReading, three-wire, signal open, 10 MΩ meter', 2000, () => predictReading(circuit, faults, request)),
    time('one reading: predictReading, two-wire thermistor, scan value', 2000, () =>
      predictReading(thermistor, [], { ...request, quantity: 'scan_value', at: undefined as never, against: undefined }),
    ),
    time('Monte Carlo band: sampleReadings, 10 000 samples, one test', 30, () => sampleReadings({ circuit, faults, request, samples: 10_000, seed: 1 })),
    time('Monte Carlo band: sampleReadings, 10 000 samples, ohms key off', 30, () =>
      sampleReadings({ circuit, faults: [], request: { ...request, quantity: 'ohms', key: 'off', connector: 'unplugged' }, samples: 10_000, seed: 1 }),
    ),
    time('likelihood table: bandTable, good + 9 hypotheses × 10 000 samples', 5, () =>
      bandTable({ circuit, request, bands: [{ id: 'low', max: 1 }, { id: 'mid', min: 1, max: 4.5 }, { id: 'high', min: 4.5 }], hypotheses, samples: 10_000, seed: 1 }),
    ),
  ];
  return {
    title: 'Circuit model (dense MNA: 24 unknowns three-wire, 19 two-wire)',
    rows,
    notes: ['Each Monte Carlo sample restamps the parameter-bound elements and refactors the compiled netlist; no netlist is rebuilt per sample.'],
  };
};
