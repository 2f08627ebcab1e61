/** Expected bands on the proof in the same form as the readings beside them. */
import { describe, expect, it } from 'vitest';
import { formatRange } from '../../src/proof-render/format';

describe('expected bands on the proof', () => {
  it.each([
    // The issue's own case: a band stored in ohms printed beside a reading of "251 kΩ".
    [{ min: 10_000, max: 1_000_000, unit: 'Ω' }, '10.0 kΩ – 1.00 MΩ'],
    [{ min: null, max: 5_000, unit: 'Ω' }, '≤ 5.00 kΩ'],
    [{ min: 0, max: 5, unit: 'Ω' }, '0 – 5 Ω'],
    [{ min: 200, max: 300, unit: 'kΩ' }, '200 – 300 kΩ'],
    [{ min: 0.4, max: 4.6, unit: 'V' }, '0.4 – 4.6 V'],
  ] as const)('prints %j as %s', (range, printed) => {
    expect(formatRange(range)).toBe(printed);
  });
});
