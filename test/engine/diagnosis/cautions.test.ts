import { describe, expect, it } from 'vitest';
import { mulberry32 } from '../../../src/engine/circuit';
import { builtInDocuments, builtInTrees, cautionsInContext, diagnose, loadTree, requiredCautions, type Reading, type TreeRequest, type WorkContext } from '../../../src/engine/diagnosis';
import { cautionKind } from '../../../src/engine/diagnosis/cautions';
import { driveToEnd } from '../../../src/engine/diagnosis/drive';
import { drawCase } from '../../../src/engine/diagnosis/simulate';

// Which cautions a piece of work needs is common practice, no source; the wording is our own.
const trees = builtInTrees();
const threeWire = trees['three-wire-5v']!;
const base: TreeRequest = { quantity: 'dc_volts', at: 'signal', against: 'battery_negative', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', jumpers: [] };
const req = (change: Partial<TreeRequest>): TreeRequest => ({ ...base, ...change });
const scan = (change: Partial<TreeRequest>): TreeRequest => {
  const { against: _a, ...rest } = base;
  return { ...rest, quantity: 'scan_value', pid: 'signal_volts', connector: 'unplugged', ...change };
};

describe('the cautions a request needs', () => {
  it.each<[string, TreeRequest, WorkContext, string[], string[]]>([
    ['a signal-to-ground jumper names the reference-to-ground danger', scan({ jumpers: [{ from: 'signal', to: 'ground', via: { kind: 'resistor', ohms: 1000 } }] }), {}, ['signal_cavity_only', 'fused_jumper_only'], []],
    ['a signal-to-chassis jumper too', scan({ jumpers: [{ from: 'chassis_ground', to: 'signal', via: { kind: 'fused_jumper' } }] }), {}, ['signal_cavity_only'], []],
    ['a reference-to-signal jumper does not (no ground in it)', scan({ jumpers: [{ from: 'reference', to: 'signal', via: { kind: 'resistor', ohms: 1000 } }] }), {}, ['no_battery_on_reference'], ['signal_cavity_only']],
    ['a lead on battery positive warns of sparks at the posts', req({ at: 'battery_positive', against: 'battery_negative' }), {}, ['no_sparks_at_battery'], []],
    ['a volts lead on battery negative alone does not', req({}), {}, [], ['no_sparks_at_battery']],
    ['an amps reading at a battery post does', req({ quantity: 'amps', at: 'battery_negative', against: 'chassis_ground' }), {}, ['no_sparks_at_battery'], []],
    ['the fuel-tank pressure sensor brings fuel vapour care', req({}), { sensor: 'FTP' }, ['fuel_vapour'], []],
    ['also when named in words', req({}), { sensor: 'fuel tank pressure, rear' }, ['fuel_vapour'], []],
    ['and on the shared reference at the tank sensor', req({ at: 'reference', sensor: 'tank' }), {}, ['fuel_vapour'], []],
    ['not on a manifold pressure sensor', req({}), { sensor: 'MAP' }, [], ['fuel_vapour']],
    ['a cranking engine: ventilation, parking brake, belts and fans', scan({ engine: 'cranking' }), {}, ['engine_turning'], []],
    ['a running engine too', req({ engine: 'running' }), {}, ['engine_turning'], []],
    ['a high-voltage vehicle, on every test', req({ quantity: 'ohms', key: 'off', connector: 'unplugged' }), { highVoltageSystem: true }, ['high_voltage_system'], []],
    ['no high-voltage caution on a vehicle without one', req({}), { highVoltageSystem: false }, [], ['high_voltage_system']],
    [
      'a wire ohmed end to end: both connectors unplugged key off, and care at the module connector',
      req({ quantity: 'ohms', key: 'off', at: 'signal', against: 'signal', connector: 'unplugged', againstLocation: 'module_connector', otherConnector: 'unplugged' }),
      {},
      ['unplug_key_off', 'module_connector', 'ohms_unpowered'],
      ['backprobe_gently'],
    ],
    [
      'a drop along the ground back-probes both connectors',
      req({ at: 'ground', against: 'ground', againstLocation: 'module_connector', otherConnector: 'backprobed' }),
      {},
      ['backprobe_gently', 'module_connector'],
      ['unplug_key_off'],
    ],
    ['a reading at the sensor alone needs no module-connector care', req({}), {}, [], ['module_connector']],
    [
      "ohms on the sensor's own pins: pin care and hands off the thermistor, key off, no module-connector care",
      req({ quantity: 'ohms', key: 'off', at: 'signal', against: 'ground', location: 'sensor_pins', connector: 'unplugged' }),
      {},
      ['sensor_pins', 'unplug_key_off', 'ohms_unpowered'],
      ['module_connector', 'backprobe_gently'],
    ],
    [
      "the sensor's pins with the module connector unplugged as well bring its care back",
      req({ quantity: 'ohms', key: 'off', at: 'signal', against: 'ground', location: 'sensor_pins', connector: 'unplugged', otherConnector: 'unplugged' }),
      {},
      ['sensor_pins', 'module_connector'],
      [],
    ],
  ])('%s', (_name, request, context, present, absent) => {
    const ids = requiredCautions(request, context);
    for (const id of present) expect(ids).toContain(id);
    for (const id of absent) expect(ids).not.toContain(id);
  });

  it('words the signal-to-ground caution as the danger it is', () => {
    const test = threeWire.tests.find((t) => t.id === 'jumper_signal_to_ground')!;
    const text = test.cautions.find((c) => c.id === 'signal_cavity_only')!.text;
    expect(text).toMatch(/signal cavity only/);
    expect(text).toMatch(/never join the 5 V reference to ground/);
    expect(text).toMatch(/fused jumper or a resistor of 1 kΩ or more/);
  });

  it('puts the high-voltage caution first and keeps the test’s own cautions', () => {
    const test = threeWire.tests.find((t) => t.id === 'jumper_signal_to_ground')!;
    const shown = cautionsInContext(test.cautions, test.request, { sensor: 'FTP 1', highVoltageSystem: true });
    expect(shown[0]!.id).toBe('high_voltage_system');
    expect(shown[0]!.text).toMatch(/qualified/);
    expect(shown[0]!.text).toMatch(/service information's procedure to disable/);
    expect(shown.map((c) => c.id)).toEqual(expect.arrayContaining([...test.cautions.map((c) => c.id), 'fuel_vapour']));
  });
});

describe('the resistor jumper where it does the job', () => {
  it('asks for a 1 kΩ resistor jumper on the three-wire tree, and still counts a reading taken with a fused jumper', async () => {
    for (const id of ['jumper_reference_to_signal', 'jumper_signal_to_ground']) {
      const test = threeWire.tests.find((t) => t.id === id)!;
      expect(test.request.jumpers.map((j) => j.via)).toEqual([{ kind: 'resistor', ohms: 1000 }]);
    }
    const jumper = threeWire.tests.find((t) => t.id === 'jumper_signal_to_ground')!;
    const fused = { ...jumper.request, jumpers: [{ from: 'signal' as const, to: 'ground' as const, via: { kind: 'fused_jumper' as const } }] };
    const at = (m: number) => new Date(Date.parse('2026-03-02T08:00:00Z') + m * 60_000).toISOString();
    const readings: Reading[] = [
      { id: 'a', request: threeWire.tests.find((t) => t.id === 'signal_unplugged')!.request, value: 4.87, takenAt: at(1), phase: 'diagnosis' },
      { id: 'b', request: threeWire.tests.find((t) => t.id === 'ground_drop_backprobed')!.request, value: 0.01, takenAt: at(2), phase: 'diagnosis' },
      { id: 'c', request: fused, value: 0.01, takenAt: at(3), phase: 'diagnosis' },
    ];
    const d = await diagnose(threeWire, readings);
    expect(d.path.find((e) => e.readingId === 'c')).toMatchObject({ verdict: 'counted', testId: 'jumper_signal_to_ground' });
  });
});

// Over every cause of both simulated trees: each test the engine asks for carries every caution its request needs.
// Trees named by id in the title: the whole tree there overruns the worker's message.
describe.each(Object.values(trees).filter((t) => t.circuitKind !== 'shared_5v_reference').map((t) => [t.id, t] as const))('cautions over every cause of the %s tree', (_id, tree) => {
  const causes = tree.hypotheses.filter((h) => !h.unknown).map((h) => h.id);
  it.each(causes.map((id, i) => [id, 3000 + i] as const))('%s (seed %i)', async (cause, seed) => {
    const c = drawCase(tree, mulberry32(seed), { hypothesisId: cause });
    const result = await driveToEnd(tree, c);
    expect(result.asked.length).toBeGreaterThan(0);
    for (const next of result.asked) {
      const ids = next.cautions.map((x) => x.id);
      expect(ids, next.id).toEqual(expect.arrayContaining(requiredCautions(next.request)));
      if (next.request.engine !== 'off') expect(ids).toContain('engine_turning');
      const shown = cautionsInContext(next.cautions, next.request, { sensor: 'FTP', highVoltageSystem: true }).map((x) => x.id);
      expect(shown[0]).toBe('high_voltage_system');
      expect(shown).toContain('fuel_vapour');
    }
  });
});

// Which conditions need the running-engine caution is common practice, no source.
describe('the running-engine cautions on every test of every built-in tree', () => {
  const documents = builtInDocuments();
  const loaded = Object.values(trees);
  it.each(loaded.flatMap((tree) => tree.tests.map((t) => [`${tree.id} / ${t.id}`, t] as const)))('%s: engine cranking or running carries them, and its cranking re-read too', (_name, test) => {
    const ids = test.cautions.map((c) => c.id);
    if (test.request.engine !== 'off') expect(ids).toContain('engine_turning');
    if (test.crankRequest) expect(test.crankCautions.map((c) => c.id)).toContain('engine_turning');
    expect(cautionKind('engine_turning')!.text).toMatch(/ventilated.*parking brake.*park or neutral.*hands, leads and clothing clear of belts and fans/);
  });

  it.each(documents.flatMap((doc) => doc.tests.filter((t) => t.request.engine !== 'off').map((t) => [`${doc.id} / ${t.id}`, t] as const)))('%s lists the caution in the tree itself', (_name, test) => {
    expect(test.cautions).toContain('engine_turning');
  });

  it.each<[string, 'cranking' | 'running']>([
    ['a test with the engine cranking', 'cranking'],
    ['a test with the engine running', 'running'],
  ])('refuses %s that does not list them, with a coded finding at its cautions', (_name, engine) => {
    const doc = structuredClone(documents.find((d) => d.id === 'three-wire-5v')!);
    const i = doc.tests.findIndex((t) => t.id === 'signal_backprobed');
    doc.tests[i]!.request = { ...doc.tests[i]!.request, engine };
    doc.tests[i]!.cautions = doc.tests[i]!.cautions.filter((c) => c !== 'engine_turning');
    const result = loadTree(doc);
    expect(result.ok).toBe(false);
    expect(result.findings.find((f) => f.code === 'tree.running_engine_caution_missing')).toMatchObject({ path: `tests[${i}].cautions`, severity: 'error' });
    // A tree stored before the rule still loads, warned, with the caution added.
    const stored = loadTree(doc, { stored: true });
    expect(stored.ok).toBe(true);
    if (stored.ok) expect(stored.tree.tests[i]!.cautions.map((c) => c.id)).toContain('engine_turning');
  });
});
