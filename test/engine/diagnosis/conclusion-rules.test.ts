/**
 * When a cause may be concluded: at or above the threshold, no reading outside what it predicts (each reading
 * checked against the prediction from the other readings), at least one reading that confirms it directly, and
 * never the "not modelled" leak, which names no repair.
 */
import { describe, expect, it } from 'vitest';
import { builtInTrees, diagnose, type Reading, type TreeRequest } from '../../../src/engine/diagnosis';
import { NONE_FITS } from '../../../src/engine/diagnosis/undecided';
import { diagnoseFully } from '../../support/diagnose-fully';

const trees = builtInTrees();
const threeWire = trees['three-wire-5v']!;
const thermistor = trees['two-wire-thermistor']!;
let clock = Date.parse('2025-03-03T09:00:00Z');
const requestOf = (tree: typeof threeWire, testId: string): TreeRequest => structuredClone(tree.tests.find((t) => t.id === testId)!.request);
const readingOn =
  (tree: typeof threeWire) =>
  (id: string, testId: string, value: Reading['value'], extra: Partial<Reading> = {}): Reading => ({
    id,
    request: requestOf(tree, testId),
    value,
    takenAt: new Date((clock += 60_000)).toISOString(),
    phase: 'diagnosis',
    ...extra,
  });
const three = readingOn(threeWire);
const thermo = readingOn(thermistor);
const probabilityOf = (d: Awaited<ReturnType<typeof diagnose>>, id: string) => d.ranked.find((h) => h.id === id)!.probability;

describe('readings that no modelled cause fits', () => {
  it('end undecided with "none of the modelled causes fits these readings" once the doubtful reading was repeated, never with "not modelled" as a conclusion', async () => {
    // 12 V on the reference, 0 V on the signal, 4.9 V on the sensor ground and 0.2 Ω signal to reference: each
    // points at another single cause (the circuit model's predictions for each fault, checked against ngspice).
    let readings = [three('c1', 'reference_backprobed', 12.1), three('c2', 'signal_backprobed', 0.0), three('c3', 'ground_drop_backprobed', 4.9), three('c4', 'signal_ohms_to_reference', 0.2)];
    let d = await diagnoseFully(threeWire, readings);
    expect(d.status).toBe('recheck');
    const doubtful = readings.find((r) => r.id === d.nextTest!.recheckOf)!;
    readings = [...readings.map((r) => (r.id === doubtful.id ? { ...r, supersededBy: 'again' } : r)), { ...doubtful, id: 'again', takenAt: new Date((clock += 60_000)).toISOString() }];
    d = await diagnoseFully(threeWire, readings);
    expect(d.ranked[0]!.id).toBe('unknown');
    expect(d.status).toBe('exhausted');
    expect(d.conclusion).toBeNull();
    expect(d.undecided!.reason).toBe('none_fits');
    expect(d.undecided!.advice).toContain(NONE_FITS);
    expect(d.undecided!.advice).toMatch(/probe points and the connector state/);
    expect(d.undecided!.leading.map((h) => h.id)).not.toContain('unknown');
    expect(d.undecided!.leading.reduce((a, h) => a + h.probability, 0)).toBeLessThanOrEqual(1 + 1e-12);
    expect(d.findings.map((f) => f.code)).toContain('diagnosis.no_modelled_cause_fits');
  });
});

describe('a conclusion', () => {
  it('lists the readings that confirm it directly (a Bayes factor above 3 against the rest, each weighed against the other readings)', async () => {
    // A shorted reference: 0 V on the reference with the sensor on and off, 0.2 Ω reference to ground.
    const d = await diagnoseFully(threeWire, [three('r1', 'reference_backprobed', 0.06), three('r2', 'reference_unplugged', 0.07), three('r3', 'reference_ohms_to_ground', 0.2)]);
    expect(d.status).toBe('concluded');
    expect(d.conclusion!.hypothesisId).toBe('reference_short_ground');
    expect(d.conclusion!.confirmedBy).toContain('r3');
    expect(d.conclusion!.confirmedBy!.every((id) => d.conclusion!.decidedBy.includes(id))).toBe(true);
  });

  it('is not a short between signal and reference when the ohmmeter finds no path between them', async () => {
    // Signal 4.87 V with the sensor unplugged (the module's bias), 0.01 V ground drop, scan 4.98 V unplugged, and
    // overload from signal to reference: a short between them would read a few ohms (Ohm's law).
    const d = await diagnoseFully(threeWire, [
      three('a', 'signal_unplugged', 4.87),
      three('b', 'ground_drop_backprobed', 0.01),
      three('c', 'scan_signal_unplugged', 4.98),
      three('d', 'signal_ohms_to_reference', 'overload'),
    ]);
    expect(probabilityOf(d, 'signal_short_reference')).toBeLessThan(0.05);
    expect(d.conclusion?.hypothesisId).not.toBe('signal_short_reference');
  });
});

describe('a key-on scan value that repeats the connected signal (a module that samples only with engine speed; common practice, no source)', () => {
  it('asks to crank and read again when the unplugged scan value equals the meter reading taken with the sensor connected', async () => {
    // A thermistor divider reads 1.4 V connected; unplugged, the module's 10 kΩ pull-up must take its input to
    // about 5 V (Ohm's law), so 1.378 V unplugged is the value it held, not a reading.
    const d = await diagnoseFully(thermistor, [thermo('m1', 'signal_backprobed', 1.396), thermo('s1', 'scan_signal_unplugged', 1.378)]);
    expect(d.status).toBe('crank_and_reread');
    expect(d.nextTest!.request.engine).toBe('cranking');
    expect(d.path.map((p) => p.verdict)).toEqual(['counted', 'frozen_scan']);
  });

  it('counts an unplugged scan value that moved away from the connected reading', async () => {
    const d = await diagnoseFully(thermistor, [thermo('m1', 'signal_backprobed', 1.396), thermo('s1', 'scan_signal_unplugged', 4.95)]);
    expect(d.path.map((p) => p.verdict)).toEqual(['counted', 'counted']);
  });
});
