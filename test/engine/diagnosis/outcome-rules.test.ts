import { describe, expect, it } from 'vitest';
import { compileOutcomes, conditionInterval } from '../../../src/engine/diagnosis/outcome-rules';
import type { MeasurementRequest } from '../../../src/engine/vocabulary';

const request: MeasurementRequest = { quantity: 'dc_volts', at: 'reference', against: 'battery_negative', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', jumpers: [] };
const range = (lo: number, hi: number) => ({ all: [{ fact: 'value', operator: 'inRange', value: [lo, hi] }] });
const classifier = compileOutcomes([
  { id: 'none', condition: range(-1, 0.5) },
  { id: 'ok', condition: range(4.85, 5.15) },
  { id: 'high', condition: { all: [{ fact: 'value', operator: 'greaterThanInclusive', value: 5.3 }] } },
]);

// json-rules-engine's own numeric operators accept strings (see diagnosis-methods.md); ours must not.
describe('outcome rules behind json-rules-engine', () => {
  it.each<[string, unknown, string[]]>([
    ['5.00 V to "ok"', 5.0, ['ok']],
    ['0.02 V to "none"', 0.02, ['none']],
    ['12 V to "high"', 12, ['high']],
    ['an ohms overload (+Infinity) to the open-ended band', Infinity, ['high']],
    ['4.82 V (a guard band) to no outcome', 4.82, []],
    ['5.20 V (a guard band) to no outcome', 5.2, []],
    ['the string "5.01 V" to no outcome', '5.01 V', []],
    ['the string "5" to no outcome', '5', []],
  ])('classifies %s', async (_name, value, expected) => {
    expect(await classifier.classify(value as number, request)).toEqual(expected);
  });

  it('reports every outcome that fires so overlapping conditions read as indeterminate', async () => {
    const overlapping = compileOutcomes([{ id: 'a', condition: range(0, 5) }, { id: 'b', condition: range(4, 6) }]);
    expect((await overlapping.classify(4.5, request)).sort()).toEqual(['a', 'b']);
  });

  it('can condition an outcome on the measurement conditions as well as the value', async () => {
    const cranking = compileOutcomes([{ id: 'low_cranking', condition: { all: [{ fact: 'value', operator: 'lessThan', value: 1 }, { fact: 'engine', operator: 'equal', value: 'cranking' }] } }]);
    expect(await cranking.classify(0.2, request)).toEqual([]);
    expect(await cranking.classify(0.2, { ...request, engine: 'cranking' })).toEqual(['low_cranking']);
  });

  it('reads the interval of a plain range condition for guard-band checks', () => {
    expect(conditionInterval(range(4.85, 5.15))).toEqual({ lo: 4.85, hi: 5.15 });
    expect(conditionInterval({ any: [range(0, 1)] })).toBeUndefined();
  });
});
