/**
 * The out-of-model case generator (test/support/out-of-model) is a second circuit model, independent of
 * src/engine/circuit. These checks hold it to an outside simulator and to closed forms: node voltages agree with
 * ngspice (batch mode, `.op`), a divider and a meter-loaded bias agree with Ohm's law (computed), the NTC curve
 * passes through its fit points (Steinhart & Hart 1968, points from memory), the scan value is clamped to the
 * ADC's 0–5 V full scale, the meter stays inside its stated accuracy, and every request of the built-in trees
 * gets an answer on every cause (the shared 5 V reference included).
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { builtInTrees } from '../../../src/engine/diagnosis';
import type { MeasurementRequest } from '../../../src/engine/vocabulary';
import { OOM_CAUSES, answerOomRequest, drawOomCase, singleCircuit, type OomCase, type OomTreeId } from '../../support/out-of-model/cases';
import { buildNet, type CircuitCase } from '../../support/out-of-model/circuits';
import { instrumentReading, METER, trueValue } from '../../support/out-of-model/instruments';
import { NTC_CURVES, ntcCelsius, ntcOhms } from '../../support/out-of-model/ntc';
import { buildSharedNet, type SharedCase } from '../../support/out-of-model/shared-reference';

const TREES = Object.keys(OOM_CAUSES) as OomTreeId[];
const SEED = 77;
const trees = builtInTrees();

/** Every request the built-in tree asks for, with the crank-and-reread form of key-on scan tests. */
function treeRequests(treeId: OomTreeId): MeasurementRequest[] {
  return trees[treeId]!.tests.flatMap((t) => [t.request, ...(t.crankRequest ? [t.crankRequest] : [])]);
}

const backprobe = (at: 'reference' | 'signal' | 'ground'): MeasurementRequest => ({ quantity: 'dc_volts', at, against: 'battery_negative', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', jumpers: [] });
const unplugged = (at: 'reference' | 'signal' | 'ground'): MeasurementRequest => ({ ...backprobe(at), connector: 'unplugged' });
const scan = (over: Partial<MeasurementRequest> = {}): MeasurementRequest => ({ quantity: 'scan_value', at: 'signal', location: 'sensor_connector', connector: 'plugged', key: 'on', engine: 'off', jumpers: [], pid: 'signal_volts', ...over });

const workdir = mkdtempSync(join(tmpdir(), 'tracebay-oom-spice-'));
afterAll(() => rmSync(workdir, { recursive: true, force: true }));

function ngspice(deck: string, name: string): Map<string, number> {
  const file = join(workdir, `${name}.cir`);
  writeFileSync(file, deck);
  const out = execFileSync('ngspice', ['-b', file], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
  const volts = new Map<string, number>();
  for (const line of out.split('\n')) {
    const m = /^\s*([A-Za-z0-9_]+)\s*=\s*([-+0-9.eE]+)\s*$/.exec(line);
    if (m) volts.set(m[1]!.toLowerCase(), Number(m[2]));
  }
  return volts;
}

/** Cases × requests for the cross-check: every cause of both trees, each with three of its tree's requests. */
const crossChecks = TREES.flatMap((tree) =>
  OOM_CAUSES[tree].flatMap((cause, k) => {
    const requests = treeRequests(tree);
    return [0, 1, 2].map((j) => ({ tree, cause, request: requests[(3 * k + 5 * j) % requests.length]! }));
  }),
);

describe('the out-of-model circuits agree with ngspice (.op, batch mode) within 1e-6 relative, 1e-9 V floor', () => {
  it.each(crossChecks.map((x, i) => [x.tree, x.cause, i, x]))('%s: %s, request %i', (_tree, _cause, i, x) => {
    const c = drawOomCase(x.tree, x.cause, i as number, SEED);
    const meter = x.request.quantity === 'dc_volts' ? c.instruments.meterInputOhms : undefined;
    const net = x.tree === 'shared-reference' ? buildSharedNet(c.circuit as SharedCase, x.request, 'source', meter) : buildNet(singleCircuit(c), x.request, 'source', meter);
    const ours = net.solve().volts;
    const theirs = ngspice(net.toSpice(`oom ${x.tree} ${x.cause}`), `case-${i}`);
    for (const [node, mine] of ours) {
      if (node === '0') continue;
      const spice = theirs.get(node);
      expect(spice, `ngspice printed ${node}`).toBeDefined();
      expect(Math.abs(mine - spice!), `node ${node}: ours ${mine}, ngspice ${spice}`).toBeLessThanOrEqual(1e-6 * Math.abs(spice!) + 1e-9);
    }
  });
});

/** A plain healthy three-wire circuit with round part values, for closed-form checks. */
function plainCase(over: Partial<CircuitCase> = {}): OomCase & { circuit: CircuitCase } {
  const c = drawOomCase('three-wire-5v', 'no_fault_now', 0, SEED);
  const circuit: CircuitCase = {
    ...singleCircuit(c),
    supply: { volts: 5, outOhms: 1e-3, limitAmps: 1 },
    railLoadOhms: 1e6,
    bias: { direction: 'pull_up', ohms: 100e3 },
    adcInputOhms: 1e15,
    moduleGroundOhms: 1e-6,
    moduleAmps: 0,
    wires: { reference: { ohms: 1e-4, faultAt: 0.5 }, signal: { ohms: 1e-4, faultAt: 0.5 }, ground: { ohms: 1e-4, faultAt: 0.5 } },
    terminalOhms: 1e-4,
    sensor: { kind: 'potentiometer', ohms: 5_000, position: 0.3, wiperOhms: 1e-3 },
    strapOhms: 1e-6,
    feed: { batteryFed: false, feedOhms: 0.1, loadOhms: 1e6 },
    faults: [],
    ...over,
  };
  return { ...c, circuit, instruments: { ...c.instruments, meterInputOhms: 10e6, voltsGain: 0, scanNeedsEngineSpeed: false } };
}

describe('the out-of-model circuits agree with closed forms (computed)', () => {
  it('puts a loaded potentiometer wiper at the divider of its two track halves, the bias and the meter', () => {
    const c = plainCase();
    // Position 0.3: 3.5 kΩ from reference to wiper, 1.5 kΩ from wiper to ground. Current law at the wiper:
    // (5 − V)/3500 + (5 − V)/100e3 = V/1500 + V/10e6, solved for V (computed).
    const g = 1 / 3500 + 1 / 1500 + 1 / 100e3 + 1 / 10e6;
    const expected = (5 / 3500 + 5 / 100e3) / g;
    expect(trueValue(c.circuit, c.instruments, backprobe('signal'))).toBeCloseTo(expected, 5);
  });

  it('reads a pulled-up input through a 10 MΩ meter as the divider of bias and meter', () => {
    const c = plainCase();
    // 5 V · 10 MΩ / (10 MΩ + 100 kΩ) = 4.9505 V (computed).
    expect(trueValue(c.circuit, c.instruments, unplugged('signal'))).toBeCloseTo((5 * 10e6) / (10e6 + 100e3), 5);
  });

  it('limits a hard-shorted reference to the regulator current through the short', () => {
    const c = plainCase({ supply: { volts: 5, outOhms: 0.1, limitAmps: 0.1 }, faults: [{ kind: 'shunt', wire: 'reference', to: 'chassis', ohms: 2 }] });
    // 0.1 A into 2 Ω (plus wire and strap, under 1 mΩ): 0.2 V (computed).
    expect(trueValue(c.circuit, c.instruments, unplugged('reference'))).toBeCloseTo(0.2, 2);
  });

  it.each(NTC_CURVES.map((curve) => [curve.id, curve]))('%s: the NTC curve returns the temperature of its own resistance', (_id, curve) => {
    for (const celsius of [-30, -20, 0, 25, 60, 100, 120]) expect(ntcCelsius(curve, ntcOhms(curve, celsius))).toBeCloseTo(celsius, 6);
  });

  it.each(['no_fault_now', 'signal_open', 'signal_short_ground', 'ground_open', 'module_internal'])(
    "reads a thermistor at its own pins, unplugged, as its curve plus the test leads, whatever the harness does (%s)",
    (cause) => {
      const c = drawOomCase('two-wire-thermistor', cause, 0, SEED);
      const circuit = singleCircuit(c);
      if (circuit.sensor.kind !== 'ntc') throw new Error('expected a thermistor');
      const pins: MeasurementRequest = { quantity: 'ohms', at: 'signal', against: 'ground', location: 'sensor_pins', connector: 'unplugged', key: 'off', engine: 'off', jumpers: [] };
      // The thermistor alone between its pins: R(T) from its own curve, plus the leads (computed).
      const expected = ntcOhms(circuit.sensor.curve, circuit.sensor.celsius) + c.instruments.leadOhms;
      expect(trueValue(circuit, c.instruments, pins)).toBeCloseTo(expected, 3);
    },
  );

  it('passes the generic 10 kΩ curve through its fit point of 10 kΩ at 25 °C (from memory)', () => {
    expect(ntcOhms(NTC_CURVES[1]!, 25)).toBeCloseTo(10_000, 3);
  });
});

describe('the scan tool reads as the module sees it', () => {
  it('shows about 12 V on the meter but 5.000 V on the scan tool for a signal shorted to battery voltage', () => {
    const c = plainCase({ faults: [{ kind: 'shunt', wire: 'signal', to: 'feed', ohms: 0.5 }], feed: { batteryFed: true, feedOhms: 0.1, loadOhms: 100 } });
    const meter = instrumentReading(c.circuit, c.instruments, backprobe('signal'), 1, 0) as number;
    expect(meter).toBeGreaterThan(11);
    // A 10-bit ADC over 0–5 V clamps at full scale: code 1023 = 5.000 V (computed).
    expect(instrumentReading(c.circuit, c.instruments, scan(), 1, 0)).toBe(5);
  });

  it('keeps the last engine-running value key on, engine off, on a module that refreshes only with engine speed', () => {
    const c = plainCase();
    const frozen = { ...c, instruments: { ...c.instruments, scanNeedsEngineSpeed: true } };
    const lsb = 5 / 1023;
    const plugged = instrumentReading(frozen.circuit, frozen.instruments, scan(), 1, 0) as number;
    const unpluggedScan = instrumentReading(frozen.circuit, frozen.instruments, scan({ connector: 'unplugged' }), 1, 1) as number;
    // One count of jitter, plus the display's rounding to 1 mV.
    expect(Math.abs(plugged - unpluggedScan)).toBeLessThanOrEqual(lsb + 0.0005 + 1e-9);
    // Cranking refreshes it: unplugged, the pull-up takes the input to about 5 V.
    expect(instrumentReading(frozen.circuit, frozen.instruments, scan({ connector: 'unplugged', engine: 'cranking' }), 1, 0)).toBeGreaterThan(4.9);
  });
});

describe('the meter stays within its stated accuracy (common practice, no source)', () => {
  it.each([
    ['DC volts, ±(0.5 % + 2 counts)', backprobe('signal'), METER.volts],
    ['ohms, ±(1 % + 2 counts)', { ...unplugged('signal'), quantity: 'ohms', key: 'off', against: 'battery_negative' } as MeasurementRequest, METER.ohms],
  ] as const)('%s', (_name, request, spec) => {
    for (let i = 0; i < 200; i++) {
      const c = drawOomCase('three-wire-5v', 'no_fault_now', i, SEED);
      const truth = trueValue(singleCircuit(c), c.instruments, request);
      const shown = instrumentReading(singleCircuit(c), c.instruments, request, c.noiseSeed, 0);
      if (shown === 'overload') continue;
      let range = 0.6;
      while (Math.abs(truth) >= range * 0.999) range *= 10;
      expect(Math.abs(shown - truth)).toBeLessThanOrEqual((spec.percent / 100) * Math.abs(truth) + spec.counts * (range / METER.counts) + 1e-12);
    }
  });
});

describe('every request of the built-in trees gets an answer on every cause', () => {
  it.each(TREES.flatMap((tree) => OOM_CAUSES[tree].map((cause) => [tree, cause])))('%s: %s', (tree, cause) => {
    for (let i = 0; i < 3; i++) {
      const c = drawOomCase(tree as OomTreeId, cause as string, i, SEED);
      for (const request of treeRequests(tree as OomTreeId)) {
        const value = answerOomRequest(c, request, 0);
        expect(value === 'overload' || Number.isFinite(value), JSON.stringify(request)).toBe(true);
      }
    }
  });
});
