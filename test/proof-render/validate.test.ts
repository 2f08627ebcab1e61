import { describe, expect, it } from 'vitest';
import {
  ProofViewError, renderProof, requiredCautions, tryRenderProof, validateProofView, type ProofView,
} from '../../src/proof-render';
import { convertTo } from '../../src/proof-render/units';
import { manyReadingsView, notVerifiedView, rd, sampleView } from './fixtures';

type Edit = (v: ProofView) => void;

describe('valid views', () => {
  it.each([
    ['the sample proof', sampleView],
    ['the proof with no verification', notVerifiedView],
    ['the proof with 200 readings', () => manyReadingsView(200)],
  ])('accepts %s', (_name, make) => {
    const result = validateProofView(make());
    expect(result.ok ? [] : result.findings).toEqual([]);
  });
});

describe('malformed views give coded, path-addressed findings', () => {
  it.each<[string, Edit, string, string]>([
    ['an unknown key (it would be digested but never printed)', (v) => { (v as unknown as Record<string, unknown>).extra = 1; }, 'schema.unrecognized_keys', '/'],
    ['a VIN holding the letter O', (v) => { v.vehicle.vin = '1M8GDM9AXKPO42788'; }, 'schema.invalid_format', '/vehicle/vin'],
    // 49 CFR 565.15: 1M8GDM9A1KP042788 carries 1 where the check digit must be X (listed invalid in the check-value notes)
    ['a VIN claimed valid whose check digit does not match', (v) => { v.vehicle.vin = '1M8GDM9A1KP042788'; }, 'vin.check_digit_claimed_valid', '/vehicle/vinCheck'],
    ['a VIN claimed invalid whose check digit matches', (v) => { v.vehicle.vinCheck = 'invalid'; }, 'vin.check_digit_claimed_invalid', '/vehicle/vinCheck'],
    ['a time without an offset', (v) => { v.repairOrder.openedAt = '2025-03-11T08:05:00'; }, 'schema.invalid_format', '/repairOrder/openedAt'],
    ['a reading whose SI value disagrees with its unit (253 kΩ is 253 000 Ω)', (v) => { v.diagnosis[1]!.reading = rd('253 kΩ', 253, 'kΩ', 253, 'Ω'); }, 'reading.si_mismatch', '/diagnosis/1/reading/si'],
    ['a reading whose unit does not convert to its SI unit', (v) => { v.diagnosis[1]!.reading = rd('5 V', 5, 'V', 5, 'Ω'); }, 'reading.unit_not_convertible', '/diagnosis/1/reading/siUnit'],
    ['an over-range reading with a number in si', (v) => { v.diagnosis[5]!.reading = rd('OL', null, 'Ω', 1e9, 'Ω'); }, 'reading.over_range_mismatch', '/diagnosis/5/reading'],
    ['a voltage test recorded in ohms', (v) => { v.diagnosis[1]!.reading = rd('5 Ω', 5, 'Ω', 5, 'Ω'); v.diagnosis[1]!.expected!.unit = 'Ω'; }, 'request.unit_quantity_mismatch', '/diagnosis/1/request'],
    ['an expected range without bounds', (v) => { v.diagnosis[0]!.expected = { min: null, max: null, unit: '%' }; }, 'expected.no_bounds', '/diagnosis/0/expected'],
    ['an expected range upside down', (v) => { v.diagnosis[0]!.expected = { min: 25, max: 10, unit: '%' }; }, 'expected.min_above_max', '/diagnosis/0/expected'],
    ['a NaN reading', (v) => { v.diagnosis[1]!.reading.value = Number.NaN; }, 'schema.invalid_type', '/diagnosis/1/reading/value'],
    ['steps out of order', (v) => { v.diagnosis[2]!.seq = 1; }, 'order.seq_not_increasing', '/diagnosis/2/seq'],
    ['a duplicated step id', (v) => { v.diagnosis[2]!.id = 'd1'; }, 'id.duplicate', '/diagnosis/2/id'],
    ['a step on an unknown circuit', (v) => { v.diagnosis[0]!.circuitId = 'map1'; }, 'ref.unknown_circuit', '/diagnosis/0/circuitId'],
    ['a root cause decided by an unknown step', (v) => { v.causes[0]!.decidingStepIds.push('d99'); }, 'ref.unknown_step', '/causes/0/decidingStepIds/3'],
    ['a cause not proven printed as the root cause', (v) => { v.causes[0]!.proven = false; }, 'cause.unproven_named', '/causes/0/cause'],
    ['a foreman signature on an approval of other evidence', (v) => { v.signOff.decisions[1]!.evidenceDigest = 'ab'.repeat(32); }, 'sign_off.foreman_signed_stale_approval', '/signOff/foremanSignedAt'],
    ['a check that repeats an unknown step', (v) => { v.verification[0]!.repeatsStepId = 'd99'; }, 'ref.unknown_step', '/verification/0/repeatsStepId'],
    ['a pass for a reading outside the band', (v) => { v.verification[0]!.after = rd('7.5 Ω', 7.5, 'Ω', 7.5, 'Ω'); }, 'verification.pass_disagrees', '/verification/0/pass'],
    ['a fail for a reading inside the band', (v) => { v.verification[3]!.pass = false; }, 'verification.pass_disagrees', '/verification/3/pass'],
    ['a scan value without its parameter', (v) => { delete v.diagnosis[0]!.request.pid; }, 'request.pid_missing', '/diagnosis/0/request/pid'],
    ['a meter reading without the second lead', (v) => { delete v.diagnosis[1]!.request.against; }, 'request.against_missing', '/diagnosis/1/request/against'],
    ['a correction dated before the reading it corrects', (v) => { v.diagnosis[2]!.superseded[0]!.correctedAt = '2025-03-11T09:00:00-05:00'; }, 'superseded.corrected_before_taken', '/diagnosis/2/superseded/0/correctedAt'],
    ['a foreman signature with the proof returned', (v) => { v.signOff.decisions.pop(); }, 'sign_off.foreman_signed_without_approval', '/signOff/foremanSignedAt'],
    ['a return without a comment', (v) => { delete v.signOff.decisions[0]!.comment; }, 'sign_off.returned_without_comment', '/signOff/decisions/0/comment'],
    ['decisions out of time order', (v) => { v.signOff.decisions.reverse(); }, 'order.decisions_not_chronological', '/signOff/decisions/1/at'],
    ['back-probing without its caution', (v) => { v.cautions = ['engine_in_bay', 'fused_jumpers_only']; }, 'cautions.missing', '/cautions'],
    ['a jumper without the fused-jumper caution', (v) => { v.cautions = ['engine_in_bay', 'backprobe_gently']; }, 'cautions.missing', '/cautions'],
    ['a caution listed twice', (v) => { v.cautions.push('engine_in_bay'); }, 'cautions.duplicate', '/cautions/3'],
    ['a trouble code not in SAE J2012 form', (v) => { v.troubleCodes.found[0]!.code = 'P01234'; }, 'schema.invalid_format', '/troubleCodes/found/0/code'],
    ['a note longer than the API accepts', (v) => { v.diagnosis[3]!.note = 'x '.repeat(1001); }, 'schema.too_big', '/diagnosis/3/note'],
  ])('reports %s', (_what, edit, code, path) => {
    const view = sampleView();
    edit(view);
    const result = validateProofView(view);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.findings).toContainEqual(expect.objectContaining({ code, path }));
  });

  it('makes renderProof throw a ProofViewError carrying every finding, not a crash deep in pdfkit', async () => {
    const view = sampleView();
    view.vehicle.vin = '1M8GDM9A1KP042788';
    view.cautions = [];
    const error = await renderProof(view).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ProofViewError);
    expect((error as ProofViewError).findings.map((f) => f.code)).toEqual(['vin.check_digit_claimed_valid', 'sign_off.foreman_signed_stale_approval', 'cautions.missing', 'cautions.missing']);
  });

  it.each([
    ['null', null],
    ['a string', 'proof'],
    ['an empty object', {}],
  ])('turns %s into findings through tryRenderProof', async (_what, input) => {
    const result = await tryRenderProof(input);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.findings.length).toBeGreaterThan(0);
  });

  it('refuses an unknown paper size', async () => {
    const result = await tryRenderProof(sampleView(), { paper: 'A3' as never });
    expect(result).toMatchObject({ ok: false, findings: [{ code: 'options.paper', path: '/options/paper' }] });
  });
});

describe('cautions the readings call for', () => {
  it.each<[string, Edit, string[]]>([
    ['the sample (jumper, back-probing)', () => {}, ['fused_jumpers_only', 'backprobe_gently']],
    ['a cranking test', (v) => { v.diagnosis[1]!.request.engine = 'cranking'; }, ['engine_in_bay', 'fused_jumpers_only', 'backprobe_gently']],
    ['no jumpers and no back-probing', (v) => {
      for (const t of [...v.diagnosis, ...v.verification]) { t.request.jumpers = []; if (t.request.connector === 'backprobed') t.request.connector = 'plugged'; }
    }, []],
  ])('derives them for %s', (_what, edit, expected) => {
    const view = sampleView();
    edit(view);
    expect(requiredCautions(view)).toEqual(expected);
  });
});

describe('units and VIN helpers', () => {
  it.each<[number, string, string, number, string]>([
    [253, 'kΩ', 'Ω', 253_000, 'SI prefix kilo = 10^3 (BIPM SI Brochure, table 7)'],
    [12, 'mV', 'V', 0.012, 'SI prefix milli = 10^-3 (BIPM SI Brochure, table 7)'],
    [0.6, 'µA', 'A', 0.0000006, 'SI prefix micro = 10^-6 (BIPM SI Brochure, table 7)'],
    [20, '°C', 'K', 293.15, 'T/K = t/°C + 273.15 (NIST SP 811, 4.2.1.1)'],
    [212, '°F', 'K', 373.15, 'computed from t/°C = (t/°F − 32)/1.8 (NIST SP 811, B.8)'],
    [1, 'psi', 'Pa', 6894.757, 'NIST SP 811, appendix B'],
    [29.9213, 'inHg', 'Pa', 101_325, '1 atm = 29.9213 inHg, computed from NIST SP 811 appendix B'],
  ])('converts %d %s to %d %s (%s)', (value, unit, siUnit, expected) => {
    expect(convertTo(value, unit, siUnit)).toBeCloseTo(expected, expected > 1000 ? 0 : 9);
  });
});
