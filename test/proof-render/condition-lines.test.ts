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
