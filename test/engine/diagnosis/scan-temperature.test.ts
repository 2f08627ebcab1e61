/**
 * Scan-temperature plausibility: SAE J1979 mode 01 PID 05 (ECT) and 0F (IAT) read A − 40 °C, so −40…215 °C
 * (SAE J1979, mode 01 scaling). At the floor or the top the value is the signature of an open or a short; with the
 * conditions the technician gives, a key-on value far from them is implausible (thresholds: common practice, no source).
 */
import { describe, expect, it } from 'vitest';
import { builtInTrees, diagnose, scanTemperatureFindings, type Reading, type ScanConditions, type TreeRequest } from '../../../src/engine/diagnosis';

const scan = (pid: string, over: Partial<TreeRequest> = {}): TreeRequest => ({
  quantity: 'scan_value', at: 'signal', location: 'sensor_connector', connector: 'plugged', key: 'on', engine: 'off', jumpers: [], pid, ...over,
});
const reading = (value: number, unit = '°C', pid = '05', over: Partial<Reading> = {}, request: Partial<TreeRequest> = {}): Reading => ({
  id: 'r1', request: scan(pid, request), value, unit, takenAt: '2026-12-01T08:00:00Z', phase: 'diagnosis', ...over,
});
const codes = (readings: Reading[], conditions?: ScanConditions) => scanTemperatureFindings(readings, conditions).map((x) => x.finding.code);

describe('a scan temperature against the PID’s range and the stated conditions', () => {
  it.each<[string, Reading, ScanConditions | undefined, string[]]>([
    // A − 40 with A = 00 gives −40 °C, the floor (SAE J1979 mode 01 PID 05 scaling).
    ['ECT at −40 °C, the PID’s floor', reading(-40), undefined, ['scan_temperature.at_floor']],
    // −40 °F is −40 °C (computed).
    ['IAT at −40 °F, the same floor in °F', reading(-40, '°F', '0F'), undefined, ['scan_temperature.at_floor']],
    // A = FF gives 215 °C, the top (SAE J1979 mode 01 PID 05 scaling).
    ['ECT at 215 °C, the PID’s top', reading(215), undefined, ['scan_temperature.at_top']],
    ['ECT at −39 °C, one step above the floor', reading(-39), undefined, []],
    ['ECT at 20 °C with no conditions given', reading(20), undefined, []],
    // Cold soak: within 8 °C of the ambient (common practice, no source).
    ['ECT at 20 °C on a cold-soaked engine, air at 15 °C', reading(20), { ambientC: 15, coldSoaked: true }, []],
    ['ECT at 60 °C on a cold-soaked engine, air at 15 °C', reading(60), { ambientC: 15, coldSoaked: true }, ['scan_temperature.far_from_ambient_cold_soaked']],
    ['IAT at −20 °C on a cold-soaked engine, air at 15 °C', reading(-20, '°C', '0F'), { ambientC: 15, coldSoaked: true }, ['scan_temperature.far_from_ambient_cold_soaked']],
    // 140 °F is 60 °C (computed).
    ['ECT at 140 °F on a cold-soaked engine, air at 15 °C', reading(140, '°F'), { ambientC: 15, coldSoaked: true }, ['scan_temperature.far_from_ambient_cold_soaked']],
    ['ECT at 60 °C with the engine running, air at 15 °C, cold-soaked before the start', reading(60, '°C', '05', {}, { engine: 'running' }), { ambientC: 15, coldSoaked: true }, []],
    // Not cold-soaked: never more than 8 °C below the air (common practice, no source).
    ['ECT at 85 °C on a warm engine, air at 15 °C', reading(85), { ambientC: 15 }, []],
    ['ECT at −10 °C on a warm engine, air at 15 °C', reading(-10), { ambientC: 15 }, ['scan_temperature.below_ambient']],
    ['ECT at −40 °C with the air at 15 °C: only the floor is named', reading(-40), { ambientC: 15, coldSoaked: true }, ['scan_temperature.at_floor']],
    ['a signal-volts scan value, not a temperature', reading(4.9, 'V', 'signal_volts'), { ambientC: 15, coldSoaked: true }, []],
    ['a PID that is no temperature (0C, engine speed)', reading(-40, '°C', '0C'), undefined, []],
    ['a corrected reading', reading(-40, '°C', '05', { supersededBy: 'r2' }), undefined, []],
    ['an ambient of 90 °C, refused and ignored', reading(60), { ambientC: 90, coldSoaked: true }, []],
  ])('for %s flags %j', (_name, r, conditions, expected) => {
    expect(codes([r], conditions)).toEqual(expected);
  });

  it('addresses the finding to the reading’s value and marks it a warning', () => {
    const [x] = scanTemperatureFindings([reading(20, '°C', '05', { id: 'a' }), reading(-40, '°C', '05', { id: 'b' })]);
    expect(x).toMatchObject({ readingId: 'b', finding: { code: 'scan_temperature.at_floor', path: 'readings[1].value', severity: 'warning' } });
    expect(x!.finding.message).toMatch(/open circuit/);
  });
});

describe('the diagnosis explains an implausible scan temperature', () => {
  const tree = builtInTrees()['two-wire-thermistor']!;

  it('lists the finding and adds it to the reading’s note in the path', async () => {
    const d = await diagnose(tree, [reading(60, '°C', '05', { id: 'ect' })], { conditions: { ambientC: 15, coldSoaked: true } });
    expect(d.findings.map((f) => f.code)).toContain('scan_temperature.far_from_ambient_cold_soaked');
    expect(d.path.find((p) => p.readingId === 'ect')!.note).toMatch(/cold-soaked engine/);
  });

  it.each<[string, ScanConditions, string]>([
    ['an ambient that is no number', { ambientC: 'warm' as never }, 'options.conditions.ambientC'],
    ['an ambient of 70 °C', { ambientC: 70 }, 'options.conditions.ambientC'],
    ['a cold soak that is no yes or no', { coldSoaked: 'yes' as never }, 'options.conditions.coldSoaked'],
  ])('names %s as an invalid option at its path', async (_name, conditions, path) => {
    const d = await diagnose(tree, [], { conditions });
    expect(d.findings).toContainEqual(expect.objectContaining({ code: 'options.invalid', path }));
  });
});
