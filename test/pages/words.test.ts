/**
 * What the pages print for people: probabilities that never round up across the threshold, predicted readings a
 * meter can show, values with their significant figures, and what a diagnosis may claim (proven, not proven, or
 * nothing to repair).
 */
import { describe, expect, it } from 'vitest';
import type { Diagnosis } from '../../src/engine/diagnosis';
import { conclusionCard, diagnosisStatus, statusTag } from '../../src/modules/pages/parts.view';
import { formatEntered, formatSi, leads, percent, predictedRange, requestLine } from '../../src/modules/pages/words';
import type { MeasurementRequest } from '../../src/engine/vocabulary';

describe('probabilities for people', () => {
  it.each([
    // 0.948 is short of the 95 % conclusion threshold (TRACEBAY_CONCLUDE_AT default): it must not read "95 %".
    [0.948, '94 %'],
    [0.9499, '94 %'],
    [0.95, '95 %'],
    [0.29, '29 %'],
    [0.25000000000000006, '25 %'],
    [0.995, '>99 %'],
    [0.004, '<1 %'],
    [0, '0 %'],
  ])('shows %f as %s, never rounded up', (p, shown) => {
    expect(percent(p)).toBe(shown);
  });
});

describe('values for people (significant figures and SI prefixes, NIST SP 811 spacing)', () => {
  it.each([
    [5, 'V', '5.00 V'],
    [4.87, 'V', '4.87 V'],
    [0.0021, 'V', '2.10 mV'],
    [11010, 'Ω', '11.0 kΩ'],
    [251_000, 'Ω', '251 kΩ'],
    [10_000_000, 'Ω', '10.0 MΩ'],
    [101_325, 'Pa', '101 kPa'],
  ])('shows %f %s as %s', (value, unit, shown) => {
    expect(formatSi(value, unit)).toBe(shown);
  });
});

describe('readings as entered, for people', () => {
  it.each([
    [5, 'V', false, '5.00 V'],
    [12.34, 'V', false, '12.34 V'],
    [0.75, 'V', false, '0.750 V'],
    [253, 'kΩ', false, '253 kΩ'],
    [83, '°C', false, '83.0 °C'],
    [null, 'Ω', true, 'OL (Ω)'],
  ] as const)('shows %s %s (over-range %s) as %s', (value, unit, overload, shown) => {
    expect(formatEntered(value, unit, overload)).toBe(shown);
  });
});

describe('predicted readings a technician reads at a glance', () => {
  it.each([
    ['a narrow volts band as one value', { p5: 0.001, p95: 0.004 }, 'dc_volts', '0.00 V'],
    ['a volts band as a range', { p5: 0.66, p95: 0.84 }, 'dc_volts', '0.66 V to 0.84 V'],
    ['an ohms band clamped at zero (a meter shows no negative resistance)', { p5: -0.06, p95: 0.53 }, 'ohms', '0.00 Ω to 0.530 Ω'],
    ['an ohms band up to over-range', { p5: 200_000, p95: 'overload' }, 'ohms', '200 kΩ or more, up to OL'],
    ['a scan value clamped at zero', { p5: -0.02, p95: 5.08 }, 'scan_value', '0.00 V to 5.08 V'],
  ] as const)('shows %s', (_name, band, quantity, shown) => {
    expect(predictedRange({ p5: band.p5, p95: band.p95 }, quantity)).toBe(shown);
  });

  it('says nothing where no band is modelled, rather than "no prediction"', () => {
    expect(predictedRange(null, 'dc_volts')).toBeNull();
  });
});

const scanRequest: MeasurementRequest = {
  quantity: 'scan_value',
  at: 'signal',
  location: 'sensor_connector',
  connector: 'plugged',
  key: 'on',
  engine: 'off',
  jumpers: [],
  pid: 'signal_volts',
} as MeasurementRequest;

describe('scan-tool tests', () => {
  it('are labelled as scan-tool tests, not "at the sensor connector"', () => {
    expect(leads(scanRequest).where).toMatch(/^Scan-tool test/);
    expect(requestLine(scanRequest)).toContain('scan-tool test');
    expect(requestLine(scanRequest)).not.toContain('at the sensor connector');
  });
});

function diagnosis(over: Partial<Diagnosis>): Diagnosis {
  return {
    treeId: 't',
    treeVersion: '1',
    status: 'testing',
    ranked: [
      { id: 'signal_open', label: 'Signal wire open', part: 'signal', probability: 0.6 },
      { id: 'sensor_internal', label: 'Sensor faulty inside', part: 'sensor', probability: 0.3 },
      { id: 'unknown', label: 'Something not modelled', part: 'unknown', probability: 0.1 },
    ],
    nextTest: null,
    path: [],
    conclusion: null,
    undecided: null,
    logZ: 0,
    logEvidenceVsChance: 0,
    findings: [],
    ...over,
  } as Diagnosis;
}

describe('what the pages claim about a diagnosis', () => {
  it('names a proven cause and its repair', () => {
    const d = diagnosis({
      status: 'concluded',
      conclusion: { hypothesisId: 'signal_open', label: 'Signal wire open', probability: 0.97, repair: { part: 'signal', action: 'Repair the signal wire.' }, decidedBy: [], reachedThreshold: true },
    });
    const text = conclusionCard(d).value;
    expect(text).toContain('Cause found');
    expect(text).toContain('Repair the signal wire.');
  });

  it('calls an exhausted diagnosis "not proven", names the leading causes and offers no repair', () => {
    const d = diagnosis({
      status: 'exhausted',
      conclusion: { hypothesisId: 'signal_open', label: 'Signal wire open', probability: 0.6, repair: { part: 'signal', action: 'Repair the signal wire.' }, decidedBy: [], reachedThreshold: false },
    });
    const text = conclusionCard(d).value;
    expect(text).toContain('Not proven');
    expect(text).toContain('Signal wire open');
    expect(text).toContain('Sensor faulty inside');
    expect(text).not.toContain('Repair the signal wire.');
    expect(diagnosisStatus(d).value).toContain('Not proven');
  });

  it('uses the diagnosis’s own leading causes and advice when it gives them', () => {
    const d = { ...diagnosis({ status: 'exhausted' }), undecided: { leading: [{ id: 'x', label: 'Cause X', probability: 0.5 }], advice: 'Wiggle the harness.' } };
    const text = conclusionCard(d).value;
    expect(text).toContain('Cause X');
    expect(text).toContain('Wiggle the harness.');
  });

  it('offers advice, not a repair, when the circuit tests good now', () => {
    const d = diagnosis({
      status: 'concluded',
      conclusion: { hypothesisId: 'no_fault_now', label: 'No fault now', probability: 0.96, repair: { part: 'none', action: 'Look for an intermittent with a wiggle test.' }, decidedBy: [], reachedThreshold: true },
    });
    const text = conclusionCard(d).value;
    expect(text).toContain('Nothing to repair now');
    expect(text).not.toContain('Repair:');
  });

  it('labels each badge with what it is about', () => {
    expect(statusTag('open').value).toContain('Order</span> Open');
    expect(diagnosisStatus(diagnosis({})).value).toContain('Circuit</span> Testing');
  });
});
