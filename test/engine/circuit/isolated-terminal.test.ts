import { describe, expect, it } from 'vitest';
import { defaultCircuit, faultsFor, predictReading } from '../../../src/engine/circuit';
import type { MeasurementRequest } from '../../../src/engine/vocabulary';

const atModuleUnplugged = (quantity: 'ohms' | 'dc_volts', at: MeasurementRequest['at']): MeasurementRequest => ({
  quantity,
  at,
  against: 'battery_negative',
  location: 'module_connector',
  connector: 'unplugged',
  key: quantity === 'ohms' ? 'off' : 'on',
  engine: 'off',
  jumpers: [],
});

// Physics of an isolated conductor (no source, no path): it reads open on ohms and 0 V on a volts meter whose
// other lead is on battery negative. Common practice, no source.
describe('a probe on a terminal that an open wire leaves connected to nothing', () => {
  it.each(['reference', 'signal', 'ground'] as const)('reads over-range ohms on the %s harness terminal at the unplugged module connector', (wire) => {
    const result = predictReading(defaultCircuit('three_wire_5v'), faultsFor(`${wire}_open`)!, atModuleUnplugged('ohms', wire));
    expect(result).toMatchObject({ ok: true, overload: true, value: Number.POSITIVE_INFINITY });
  });

  it.each(['reference', 'signal', 'ground'] as const)('reads 0 V on the %s harness terminal at the unplugged module connector', (wire) => {
    const result = predictReading(defaultCircuit('three_wire_5v'), faultsFor(`${wire}_open`)!, atModuleUnplugged('dc_volts', wire));
    expect(result.ok && Math.abs(result.value)).toBeLessThan(1e-6);
  });
});
