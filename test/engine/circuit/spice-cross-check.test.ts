/**
 * Cross-check against an outside simulator: ngspice (Debian package `ngspice`, batch mode, `.op` analysis) solves
 * the SPICE export of the very netlist our solver stamps, for 40 seeded random circuits with random faults,
 * connector states, jumpers and meters. Every node voltage must agree within 1e-6 relative, with an absolute floor
 * of 1e-9 V for nodes near zero (where a relative bound means nothing).
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import {
  sampleDifferences,
  circuitNetlist,
  defaultCircuit,
  faultsFor,
  HYPOTHESIS_IDS,
  meterWith,
  type Netlist,
  mulberry32,
  parseSpiceNodeVoltages,
  solveNodeVoltages,
  predictReading,
  toSpice,
  type FaultSpec,
  type Random,
  type WireRole,
} from '../../../src/engine/circuit';
import type { MeasurementRequest, Point } from '../../../src/engine/vocabulary';
import { pointNode } from '../../../src/engine/circuit/measure';
import type { Result } from '../../../src/engine/calc';

const RELATIVE = 1e-6;
const ABSOLUTE_FLOOR_VOLTS = 1e-9;
const CIRCUITS = 48;

const pick = <T>(random: Random, items: readonly T[]): T => items[Math.floor(random() * items.length)]!;
const between = (random: Random, lo: number, hi: number) => lo + (hi - lo) * random();

function randomFault(random: Random, wires: WireRole[], sensor: string): FaultSpec {
  const wire = pick(random, wires);
  const other = pick(random, wires.filter((w) => w !== wire));
  const internal = sensor === 'potentiometer' ? ['open_track', 'worn_spot', 'stuck'] : sensor === 'pressure' ? ['open_track', 'stuck', 'shorted'] : ['open_track', 'stuck', 'shorted'];
  const kinds: Array<() => FaultSpec> = [
    () => ({ kind: 'open', wire }),
    () => ({ kind: 'short_to_ground', wire, ohms: between(random, 0.01, 50) }),
    () => ({ kind: 'short_to_voltage', wire, ohms: between(random, 0.05, 100) }),
    () => ({ kind: 'short_between', wires: [wire, other], ohms: between(random, 0.01, 1000) }),
    () => ({ kind: 'high_resistance', wire, ohms: between(random, 1, 50_000) }),
    () => {
      const variant = pick(random, internal) as 'stuck' | 'worn_spot' | 'shorted' | 'open_track';
      const stuckValue = sensor === 'thermistor' ? between(random, -30, 110) : between(random, 0.05, 0.95);
      return { kind: 'sensor_internal', variant, value: variant === 'stuck' ? stuckValue : between(random, 0.5, 2e6) };
    },
    () => ({ kind: 'module_internal', variant: pick(random, ['dead_regulator', 'weak_regulator', 'dead_input'] as const), ohms: between(random, 10, 1000) }),
  ];
  return pick(random, kinds)();
}

function randomCase(seed: number) {
  const random = mulberry32(seed);
  const kind = random() < 0.3 ? 'two_wire_thermistor' : 'three_wire_5v';
  const circuit = defaultCircuit(kind, {
    sensor: random() < 0.5 ? 'pressure' : 'potentiometer',
    position: random(),
    pressureKpa: between(random, 15, 110),
    temperatureC: between(random, -30, 120),
    wireOhms: between(random, 0.02, 2),
    regulatorVolts: between(random, 4.9, 5.1),
    bias:
      kind === 'two_wire_thermistor'
        ? { kind: 'pull_up', ohms: between(random, 1000, 20_000) }
        : pick(random, [{ kind: 'pull_up', ohms: between(random, 100e3, 1e6) }, { kind: 'pull_down', ohms: between(random, 100e3, 1e6) }, { kind: 'none' }] as const),
  });
  const wires = circuit.wires.map((w) => w.role);
  const faults = Array.from({ length: Math.floor(random() * 3) }, () => randomFault(random, wires, circuit.sensor.kind));
  const points: Point[] = [...wires, 'battery_negative', 'battery_positive', 'chassis_ground'];
  const at = pick(random, points);
  const against = pick(random, points.filter((p) => p !== at));
  const key = random() < 0.8 ? 'on' : 'off';
  const request: MeasurementRequest = {
    quantity: pick(random, ['dc_volts', 'dc_volts', 'amps', 'scan_value'] as const),
    at,
    against,
    location: pick(random, ['sensor_connector', 'module_connector'] as const),
    connector: pick(random, ['plugged', 'unplugged', 'backprobed'] as const),
    key,
    engine: key === 'on' ? pick(random, ['off', 'cranking', 'running'] as const) : 'off',
    jumpers:
      random() < 0.3
        ? [{ from: pick(random, wires), to: 'battery_negative', via: pick(random, [{ kind: 'resistor', ohms: between(random, 100, 1e6) }, { kind: 'voltage_source', volts: between(random, 0, 5) }, { kind: 'fused_jumper' }] as const) }]
        : [],
  };
  if (request.quantity === 'scan_value') request.key = 'on';
  return { circuit, faults, request, meterOhms: between(random, 1e6, 20e6) };
}

function ngspiceVersion(): string {
  try {
    return execFileSync('ngspice', ['--version'], { encoding: 'utf8' }).split('\n').find((l) => l.includes('ngspice')) ?? 'ngspice';
  } catch {
    throw new Error('ngspice is not installed: apt-get update && apt-get install -y ngspice');
  }
}


function crossCheck(name: string, built: Result<Netlist>): void {
  if (!built.ok) throw new Error(`${name} did not build: ${JSON.stringify(built.findings)}`);
  const ours = solveNodeVoltages(built.value);
  expect(ours, 'our solver found the system singular').toBeDefined();
  const deck = join(workdir, `${name}.cir`);
  writeFileSync(deck, toSpice(built.value, { title: name, printNodeVoltages: true }));
  const spice = parseSpiceNodeVoltages(execFileSync('ngspice', ['-b', deck], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] }));
  const nodes = [...ours!.keys()].filter((n) => n !== 'bn');
  expect(spice.size, 'ngspice printed every node').toBe(nodes.length);
  for (const node of nodes) {
    const theirs = spice.get(node.toLowerCase());
    expect(theirs, `ngspice value for ${node}`).toBeDefined();
    const mine = ours!.get(node)!;
    const allowed = RELATIVE * Math.abs(theirs!) + ABSOLUTE_FLOOR_VOLTS;
    expect(Math.abs(mine - theirs!), `node ${node}: ours ${mine}, ngspice ${theirs}`).toBeLessThanOrEqual(allowed);
  }
}

const workdir = mkdtempSync(join(tmpdir(), 'tracebay-spice-'));
afterAll(() => rmSync(workdir, { recursive: true, force: true }));

describe('node voltages agree with ngspice (.op, batch mode) within 1e-6 relative, 1e-9 V floor', () => {
  it('finds ngspice on the path', () => {
    expect(ngspiceVersion()).toMatch(/ngspice/);
  });

  it.each(Array.from({ length: CIRCUITS }, (_, i) => [1000 + i]))('agrees with ngspice on seeded random circuit %i', (seed) => {
    const c = randomCase(seed);
    crossCheck(`case-${seed}`, circuitNetlist(c.circuit, c.faults, c.request, meterWith({ inputOhms: c.meterOhms })));
  });

  // The trade's requests and the newer model parts: a lead at each end, the other connector unplugged, the module's
  // own draw through a resistive ground, the regulator in its current limit, a poor terminal, a skewed sensor.
  const drawing = (): ReturnType<typeof defaultCircuit> => ({ ...defaultCircuit('three_wire_5v'), module: { ...defaultCircuit('three_wire_5v').module, supplyAmps: 0.5 } });
  const keyOn: MeasurementRequest = { quantity: 'dc_volts', at: 'signal', against: 'battery_negative', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', jumpers: [] };
  it.each<[string, Partial<MeasurementRequest>, FaultSpec[]]>([
    ['a loaded drop along the sensor ground, sensor pin to module pin', { at: 'ground', against: 'ground', againstLocation: 'module_connector', otherConnector: 'backprobed' }, faultsFor('ground_high_resistance')],
    ['a ground offset from the module’s own draw', { at: 'ground' }, [{ kind: 'module_ground_resistance', ohms: 0.8 }]],
    ['the reference in current limit under a 33 Ω load', { at: 'reference', connector: 'unplugged', jumpers: [{ from: 'reference', to: 'ground', via: { kind: 'resistor', ohms: 33 } }] }, []],
    ['a corroded ground terminal at the sensor', {}, [{ kind: 'poor_terminal', connector: 'sensor_connector', wire: 'ground', ohms: 150 }]],
    ['a skewed sensor with the module unplugged at the far end', { otherConnector: 'unplugged' }, [{ kind: 'sensor_internal', variant: 'skewed', value: 0.2 }]],
    [
      'a loaded drop along the 5 V reference, module pin to sensor pin',
      { at: 'reference', against: 'reference', location: 'module_connector', againstLocation: 'sensor_connector', otherConnector: 'backprobed' },
      faultsFor('reference_high_resistance'),
    ],
  ])('agrees with ngspice on %s', (name, change, faults) => {
    crossCheck(`trade-${name.replace(/[^a-z0-9]+/gi, '-')}`, circuitNetlist(drawing(), faults, { ...keyOn, ...change }));
  });

  // The engine's states and the sensor's input moved: the battery the regulator sees, the wiper where the pedal puts it.
  const dropsOut = (minInputVolts: number, cranking = 10): ReturnType<typeof defaultCircuit> => {
    const c = drawing();
    return { ...c, battery: { ...c.battery, volts: { ...c.battery.volts, cranking } }, module: { ...c.module, regulator: { ...c.module.regulator, minInputVolts } } };
  };
  it.each<[string, ReturnType<typeof defaultCircuit>, Partial<MeasurementRequest>, FaultSpec[]]>([
    ['the throttle pressed fully and held', drawing(), { sensorInput: 'moved' }, []],
    ['a sensor stuck where it rests, throttle pressed', drawing(), { sensorInput: 'moved' }, [{ kind: 'sensor_internal', variant: 'stuck', atRest: true }]],
    ['a manifold pressure sensor at idle', { ...drawing(), sensor: defaultCircuit('three_wire_5v', { sensor: 'pressure' }).sensor }, { engine: 'running', sensorInput: 'moved' }, []],
    ['the reference while cranking on a battery that falls to 5.5 V', dropsOut(6, 5.5), { at: 'reference', engine: 'cranking' }, []],
    ['the reference while cranking on a supply that drops out at 11.5 V', dropsOut(11.5), { at: 'reference', engine: 'cranking' }, []],
  ])('agrees with ngspice on %s', (name, circuit, change, faults) => {
    crossCheck(`state-${name.replace(/[^a-z0-9]+/gi, '-')}`, circuitNetlist(circuit, faults, { ...keyOn, ...change }));
  });

  // Ohms: the ohmmeter's test current as a SPICE current source between the leads; V/I must be our reading.
  it.each<[string, Partial<MeasurementRequest>, FaultSpec[], ('three_wire_5v' | 'two_wire_thermistor')?]>([
    ['end-to-end continuity of a signal wire with 10 kΩ in it', { at: 'signal', against: 'signal', againstLocation: 'module_connector' }, faultsFor('signal_high_resistance')],
    ['a wire-to-wire short, both connectors unplugged', { at: 'signal', against: 'reference' }, [{ kind: 'short_between', wires: ['signal', 'reference'], ohms: 2000 }]],
    ['a signal wire chafed onto the sensor ground wire, both connectors unplugged', { at: 'signal', against: 'ground' }, [{ kind: 'short_between', wires: ['signal', 'ground'], ohms: 470 }]],
    ['end-to-end continuity of a broken reference', { at: 'reference', against: 'reference', againstLocation: 'module_connector' }, faultsFor('reference_open')],
    ['a thermistor through its wires from the module connector, sensor plugged', { at: 'signal', against: 'ground', location: 'module_connector', otherConnector: 'plugged' }, [], 'two_wire_thermistor'],
    ['a thermistor alone at its own pins, sensor unplugged', { at: 'signal', against: 'ground', location: 'sensor_pins' }, [], 'two_wire_thermistor'],
    ['a thermistor at its own pins with a broken signal wire behind it', { at: 'signal', against: 'ground', location: 'sensor_pins', otherConnector: 'plugged' }, faultsFor('signal_open'), 'two_wire_thermistor'],
    ['a potentiometer track at its own pins, sensor unplugged', { at: 'reference', against: 'ground', location: 'sensor_pins' }, []],
  ])('agrees with ngspice on the ohms reading of %s', (name, change, faults, kind: 'three_wire_5v' | 'two_wire_thermistor' = 'three_wire_5v') => {
    const request: MeasurementRequest = { ...keyOn, quantity: 'ohms', key: 'off', connector: 'unplugged', otherConnector: 'unplugged', ...change };
    const built = circuitNetlist(defaultCircuit(kind), faults, request);
    if (!built.ok) throw new Error(JSON.stringify(built.findings));
    const at = pointNode(request.at, request.location);
    const against = pointNode(request.against!, request.againstLocation ?? request.location);
    built.value.add({ id: 'ohmmeter', kind: 'isource', nodes: [against, at], value: 1e-4 });
    // The unplugged harness floats on leak resistors (ngspice adds its own gmin), so compare what the meter shows:
    // the voltage between the leads over the test current.
    const deck = join(workdir, `ohms-${name.replace(/[^a-z0-9]+/gi, '-')}.cir`);
    writeFileSync(deck, toSpice(built.value, { title: name, printNodeVoltages: true }));
    const spice = parseSpiceNodeVoltages(execFileSync('ngspice', ['-b', deck], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] }));
    const theirs = (spice.get(at.toLowerCase())! - spice.get(against.toLowerCase())!) / 1e-4;
    const predicted = predictReading(defaultCircuit(kind), faults, request);
    expect(predicted.ok).toBe(true);
    if (predicted.ok && !Number.isFinite(predicted.value)) expect(Math.abs(theirs)).toBeGreaterThan(60e6);
    else if (predicted.ok) expect(Math.abs(predicted.value - theirs)).toBeLessThanOrEqual(RELATIVE * Math.abs(theirs) + 1e-6);
  });

  // A comparison of two readings: the scan value (what the module sees) against the meter at the sensor. With 10 kΩ in
  // the signal wire of a pulled-up input, the bias current drops across it, so the two differ by about I_bias × 10 kΩ.
  it('agrees with ngspice and the divider on the scan-versus-meter gap that 10 kΩ in the signal wire makes', () => {
    const circuit = defaultCircuit('three_wire_5v', { bias: { kind: 'pull_up', ohms: 250_000 } });
    const faults = faultsFor('signal_high_resistance');
    const scanRequest: MeasurementRequest = { quantity: 'scan_value', at: 'signal', location: 'sensor_connector', connector: 'plugged', key: 'on', engine: 'off', jumpers: [], pid: 'signal_volts' };
    const built = circuitNetlist(circuit, faults, scanRequest);
    crossCheck('comparison-scan-vs-meter', built);
    if (!built.ok) return;
    const deck = join(workdir, 'comparison.cir');
    writeFileSync(deck, toSpice(built.value, { title: 'comparison', printNodeVoltages: true }));
    const spice = parseSpiceNodeVoltages(execFileSync('ngspice', ['-b', deck], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] }));
    // ngspice: the module pin (m_signal) against the wiper side of the harness (s_signal), no meter attached.
    const gapSpice = spice.get('m_signal')! - spice.get('s_signal')!;
    const scan = predictReading(circuit, faults, scanRequest);
    const meter = predictReading(circuit, faults, { ...scanRequest, quantity: 'dc_volts', against: 'battery_negative', connector: 'backprobed', pid: undefined });
    if (!scan.ok || !meter.ok) throw new Error('no reading');
    // The divider (computed): Thevenin of the wiper, 750 Ω over a 5 kΩ track at 0.15 (637.5 Ω) plus 50 Ω wiper and
    // 10 kΩ in the wire, pulled up through 250 kΩ: I = (5 − 0.75) / (250 000 + 10 000 + 687.5) ≈ 16.3 µA; the gap
    // I × 10 000 Ω ≈ 0.163 V.
    const bias = (5 - 0.75) / (250_000 + 10_000 + 687.5);
    expect(gapSpice).toBeCloseTo(bias * 10_000, 2);
    // The scan value is the converter's 10-bit reading of the module side (4.9 mV steps), the meter reads the sensor side.
    expect(scan.value - meter.value).toBeCloseTo(gapSpice, 2);
    expect(scan.value - meter.value).toBeGreaterThan(0.14);
    // The paired Monte Carlo of the comparison test, every spread pinned at nominal: the same gap, to one
    // converter step (4.9 mV).
    const pinned = sampleDifferences({
      circuit, faults, request: scanRequest, compare: { ...scanRequest, quantity: 'dc_volts', against: 'battery_negative', connector: 'backprobed', pid: undefined },
      samples: 4, seed: 1, spreads: { wireOhms: [0.1, 0.1], biasOhms: [250_000, 250_000], regulatorVolts: [5, 5], batteryVolts: 0, sensorTolerance: 0, meterError: false },
    });
    if (!pinned.ok) throw new Error(JSON.stringify(pinned.findings));
    expect(Math.abs(pinned.values[0]! - gapSpice)).toBeLessThan(0.0049);
  });

  // Every hypothesis's faults once, so each fault kind and variant meets ngspice at least once.
  it.each(HYPOTHESIS_IDS.map((id) => [id]))('agrees with ngspice on a KOEO back-probe with %s', (id) => {
    const circuit = defaultCircuit('three_wire_5v', { sensor: id.includes('shorted') ? 'pressure' : 'potentiometer' });
    const request: MeasurementRequest = { quantity: 'dc_volts', at: 'signal', against: 'ground', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', jumpers: [] };
    crossCheck(`hypothesis-${id}`, circuitNetlist(circuit, faultsFor(id), request));
  });
});
