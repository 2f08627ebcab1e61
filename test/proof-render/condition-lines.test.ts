import { describe, expect, it } from 'vitest';
import { conditionLines } from '../../src/proof-render/format';
import type { MeasurementRequest } from '../../src/engine/vocabulary';

const signal: MeasurementRequest = { quantity: 'dc_volts', at: 'signal', against: 'battery_negative', location: 'sensor_connector', connector: 'backprobed', key: 'on', engine: 'off', jumpers: [] };

describe('the proof’s conditions of a reading', () => {
  it.each<[string, Partial<MeasurementRequest>, string | undefined]>([
    ['the throttle pressed fully and held, key on engine off', { sensorInput: 'moved' }, 'Input: Press the throttle fully and hold'],
    ['a pressure sensor with the engine idling', { engine: 'running', sensorInput: 'moved' }, 'Input: Engine running at idle (manifold vacuum)'],
    ['the input at rest, said or not', { sensorInput: 'at_rest' }, undefined],
    ['an old request without the field', {}, undefined],
  ])('words %s', (_name, change, line) => {
    const lines = conditionLines({ ...signal, ...change });
    const input = lines.find((l) => l.startsWith('Input:'));
    expect(input).toBe(line);
  });
});
