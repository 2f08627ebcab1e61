import { describe, expect, it } from 'vitest';
import { groupActivation, groupCauseCircuit, groupTestOf, groupTree, pointsAtReference, whereGroupTestIsTaken, type DiagnosisSummary } from '../../../src/engine/diagnosis/shared-reference-order';
import type { MeasurementRequest } from '../../../src/engine/vocabulary';

const circuits = ['TP', 'MAP', 'FTP'].map((s, i) => ({ id: `00000000-0000-4000-8000-00000000000${i + 1}`, label: `${s} sensor`, sensor: s, kind: 'three_wire_5v' }));
const tree = groupTree(circuits);
const reference: MeasurementRequest = { quantity: 'dc_volts', at: 'reference', against: 'battery_negative', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', jumpers: [] };
const summary = (ranked: Array<[string, number]>): DiagnosisSummary => ({ status: 'testing', ranked: ranked.map(([id, probability]) => ({ id, label: id, part: 'x', probability })), nextTest: null });

describe('which readings of a group’s circuits answer its shared-reference tests', () => {
  it.each<[string, number, Partial<MeasurementRequest>, string | undefined]>([
    ['the reference back-probed at the first circuit', 0, {}, 'reference_plugged'],
    ['the reference back-probed at another circuit (its branch drop differs)', 1, {}, undefined],
    ['the reference with only the second sensor unplugged', 1, { connector: 'unplugged' }, 'reference_c2_unplugged'],
    ['the reference with every sensor unplugged', 2, { connector: 'unplugged', sensor: 'all' }, 'reference_all_unplugged'],
    ['ohms to battery negative, all unplugged, key off', 0, { quantity: 'ohms', connector: 'unplugged', key: 'off', sensor: 'all' }, 'reference_ohms_all_unplugged'],
    ['the signal wire', 0, { at: 'signal' }, undefined],
    ['the reference with a jumper fitted', 0, { jumpers: [{ from: 'reference', to: 'battery_negative', via: { kind: 'resistor', ohms: 1000 } }] }, undefined],
    ['the reference with the engine running', 0, { engine: 'running' }, undefined],
  ])('%s', (_name, k, change, test) => {
    expect(groupTestOf(tree, k, { ...reference, ...change })).toBe(test);
  });

  it('takes a test where its sensor is, and the "all" tests at the first circuit', () => {
    expect(whereGroupTestIsTaken(circuits, { ...reference, sensor: 'c3' })).toEqual({ circuit: circuits[2], sensor: 'FTP' });
    expect(whereGroupTestIsTaken(circuits, { ...reference, sensor: 'all' })).toEqual({ circuit: circuits[0], sensor: 'all' });
    expect(groupCauseCircuit(circuits, 'c2_sensor_loading_reference')).toBe(circuits[1]!.id);
    expect(groupCauseCircuit(circuits, 'module_regulator')).toBeNull();
  });
});

describe('when the order view moves to a shared reference', () => {
  const quiet = summary([['sensor_internal', 0.4], ['reference_short_ground', 0.1]]);
  const pointing = summary([['reference_short_ground', 0.35], ['reference_supply_failed', 0.3]]);
  it.each<[string, Array<[DiagnosisSummary, number?]>, string[], number, boolean]>([
    ['two circuits whose causes point at the reference', [[pointing], [pointing], [quiet]], [], 0, true],
    ['two circuits whose plugged reference reads below 4.5 V (common practice, no source)', [[quiet, 1.4], [quiet, 1.5], [quiet]], [], 0, true],
    ['one circuit pointing, with a sensor reference-voltage code on the order', [[pointing], [quiet], [quiet]], ['P0641'], 0, true],
    ['one circuit pointing, no code', [[pointing], [quiet], [quiet]], [], 0, false],
    ['a shared-reference reading taken', [[quiet], [quiet], [quiet]], [], 1, true],
    ['a healthy 4.9 V reference on two circuits', [[quiet, 4.9], [quiet, 4.95], [quiet]], [], 0, false],
  ])('%s', (_name, members, codes, readings, active) => {
    const got = groupActivation(members.map(([diagnosis, referenceVolts], i) => ({ circuit: circuits[i]!, diagnosis, referenceVolts })), codes, readings);
    expect(got.active).toBe(active);
    expect(got.why.length > 0).toBe(active);
  });

  it('reads a circuit as pointing at its reference from half the weight on reference causes', () => {
    expect(pointsAtReference(summary([['reference_open', 0.25], ['reference_short_ground', 0.25]]))).toBe(true);
    expect(pointsAtReference(summary([['reference_open', 0.2], ['signal_open', 0.6]]))).toBe(false);
  });
});
