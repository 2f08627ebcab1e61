/**
 * The shared 5 V reference model: node voltages checked against ngspice (Debian package `ngspice`, batch mode,
 * `.op`) on a three- and a four-sensor reference with faults on the trunk, a branch, a sensor and the supply, and one
 * reading checked against a series divider worked out by hand (Ohm's law, computed).
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import {
  defaultSharedReference,
  parseSpiceNodeVoltages,
  predictSharedReading,
  sampleSharedReadings,
  sharedNetlist,
  solveNodeVoltages,
  toSpice,
  type SharedFault,
  type SharedRequest,
} from '../../../src/engine/circuit';

const workdir = mkdtempSync(join(tmpdir(), 'tracebay-shared-spice-'));
afterAll(() => rmSync(workdir, { recursive: true, force: true }));

const THREE = ['tp', 'map', 'ftp'];
const FOUR = ['tp', 'map', 'ftp', 'app'];
const keyOn = (at: string, unplugged: string[] = []): SharedRequest => ({ quantity: 'dc_volts', at, unplugged, key: 'on' });

describe('the shared reference agrees with ngspice (.op, batch mode) within 1e-6 relative, 1e-9 V floor', () => {
  it.each<[string, string[], SharedFault[], SharedRequest, boolean]>([
    ['three sensors, healthy, all plugged', THREE, [], keyOn('tp'), false],
    ['three sensors, the manifold sensor shorted inside at 6 Ω', THREE, [{ kind: 'sensor_loading', sensor: 'map', ohms: 6 }], keyOn('tp'), false],
    ['three sensors, the tank branch shorted to ground, tank sensor unplugged', THREE, [{ kind: 'reference_short_ground', at: 'ftp', ohms: 2 }], keyOn('ftp', ['ftp']), false],
    ['three sensors, a weak supply (300 Ω), throttle unplugged', THREE, [{ kind: 'supply_weak', ohms: 300 }], keyOn('tp', ['tp']), false],
    ['four sensors, the trunk shorted to ground at 1 Ω', FOUR, [{ kind: 'reference_short_ground', at: 'trunk', ohms: 1 }], keyOn('app'), false],
    ['four sensors, the pedal sensor shorted inside, in the supply’s 100 mA limit', FOUR, [{ kind: 'sensor_loading', sensor: 'app', ohms: 10 }], keyOn('map'), true],
    ['four sensors, the supply set low (4.2 V), all unplugged', FOUR, [{ kind: 'supply_low', volts: 4.2 }], keyOn('tp', FOUR), false],
  ])('%s', (name, ids, faults, request, limited) => {
    const spec = defaultSharedReference(ids, { currentLimitAmps: limited ? 0.1 : undefined });
    const netlist = sharedNetlist(spec, faults, request, undefined, limited);
    const ours = solveNodeVoltages(netlist)!;
    const deck = join(workdir, `${name.replace(/[^a-z0-9]+/gi, '-')}.cir`);
    writeFileSync(deck, toSpice(netlist, { title: name, printNodeVoltages: true }));
    const spice = parseSpiceNodeVoltages(execFileSync('ngspice', ['-b', deck], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] }));
    const nodes = [...ours.keys()].filter((n) => n !== 'bn');
    expect(spice.size).toBe(nodes.length);
    for (const node of nodes) {
      const theirs = spice.get(node.toLowerCase())!; // ngspice
      expect(Math.abs(ours.get(node)! - theirs), `node ${node}`).toBeLessThanOrEqual(1e-6 * Math.abs(theirs) + 1e-9);
    }
  });

  it('reads, in the current limit, what ngspice gives for the limited circuit (100 mA into the loads)', () => {
    const spec = defaultSharedReference(FOUR, { currentLimitAmps: 0.1 });
    const faults: SharedFault[] = [{ kind: 'sensor_loading', sensor: 'app', ohms: 10 }];
    const deck = join(workdir, 'limited-reading.cir');
    writeFileSync(deck, toSpice(sharedNetlist(spec, faults, keyOn('map'), undefined, true), { printNodeVoltages: true }));
    const spice = parseSpiceNodeVoltages(execFileSync('ngspice', ['-b', deck], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] }));
    const predicted = predictSharedReading(spec, faults, keyOn('map'));
    expect(predicted.ok && predicted.value).toBeCloseTo(spice.get('n1_sh_ref')!, 6); // ngspice
  });
});

describe('the shared reference against a hand-worked divider', () => {
  it('reads the trunk shorted to ground through 4 Ω, all sensors unplugged, as the series divider gives', () => {
    const spec = defaultSharedReference(THREE);
    const reading = predictSharedReading(spec, [{ kind: 'reference_short_ground', at: 'trunk', ohms: 4 }], keyOn('tp', THREE));
    // Series loop: 1 Ω output + 0.005 Ω terminal + 0.05 Ω half trunk + 4 Ω short + 0.005 Ω chassis + 0.01 Ω module
    // ground; the meter sees the drop across the short and the chassis strap (computed, Ohm's law).
    const amps = 5 / (1 + 0.005 + 0.05 + 4 + 0.005 + 0.01);
    expect(reading.ok && reading.value).toBeCloseTo(amps * (4 + 0.005), 5); // computed
  });

  it('recovers to about 5 V only at the connector of the sensor that drags the rail down (common practice, no source)', () => {
    const spec = defaultSharedReference(FOUR);
    const faults: SharedFault[] = [{ kind: 'sensor_loading', sensor: 'ftp', ohms: 3 }];
    const read = (at: string) => {
      const r = predictSharedReading(spec, faults, keyOn(at, [at]));
      return r.ok ? r.value : NaN;
    };
    expect(read('ftp')).toBeGreaterThanOrEqual(4.8); // common practice, no source
    for (const other of ['tp', 'map', 'app']) expect(read(other)).toBeLessThan(4.5); // common practice, no source
  });

  it('gives the same draws for the same seed and spreads them over the fault’s severity range', () => {
    const input = { circuit: defaultSharedReference(THREE), faults: [{ kind: 'sensor_loading', sensor: 'tp', ohms: [1, 20] }] as SharedFault[], request: keyOn('map'), samples: 200, seed: 7 };
    const a = sampleSharedReadings(input);
    const b = sampleSharedReadings(input);
    expect(a.ok && b.ok && Array.from(a.value)).toEqual(b.ok && Array.from(b.value));
    if (a.ok) expect(a.value[199]! - a.value[0]!).toBeGreaterThan(1); // 1–20 Ω spans more than a volt (computed: 5·1/2 vs 5·20/21)
  });
});
