/** How the proof words where the leads went: the harness connectors, and the sensor's own pins with it unplugged. */
import { describe, expect, it } from 'vitest';
import { conditionLines } from '../../src/proof-render/format';
import type { MeasurementRequest } from '../../src/engine/vocabulary';

const base: MeasurementRequest = { quantity: 'ohms', at: 'signal', against: 'ground', location: 'sensor_connector', connector: 'unplugged', key: 'off', engine: 'off', jumpers: [] };

describe('the conditions of a test on the proof', () => {
  it.each<[string, Partial<MeasurementRequest>, string[]]>([
    ['ohms at the harness side of the sensor connector', {}, ['Key off; sensor connector unplugged', 'Ohms: red lead at signal, black at sensor ground']],
    [
      "ohms on the sensor's own pins, sensor unplugged",
      { location: 'sensor_pins' },
      ['Key off; sensor connector unplugged', "Ohms: leads on the sensor's own pins, sensor unplugged: red on its signal pin, black on its sensor ground pin"],
    ],
    [
      "ohms on the sensor's own pins with the module connector unplugged too",
      { location: 'sensor_pins', otherConnector: 'unplugged' },
      ['Key off; sensor connector unplugged', "Ohms: leads on the sensor's own pins, sensor unplugged: red on its signal pin, black on its sensor ground pin", 'Module connector: unplugged'],
    ],
    [
      'a lead at each end of the signal wire',
      { against: 'signal', againstLocation: 'module_connector', otherConnector: 'unplugged' },
      ['Key off; sensor connector unplugged', 'Ohms: red lead at signal at the sensor connector, black at signal at the module connector', 'Module connector: unplugged'],
    ],
  ])('words %s', (_name, change, lines) => {
    expect(conditionLines({ ...base, ...change })).toEqual(lines);
  });
});

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
