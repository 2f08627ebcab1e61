import { describe, expect, it } from 'vitest';
import { checkVin, computeCheckDigit, modelYearsFor, withCheckDigit } from '../../../src/engine/vin';

// Check values: VINs checked by the method of 49 CFR 565.15 (transliteration, weights, sum mod 11); sums computed.
describe('computeCheckDigit', () => {
  it.each([
    // vin, expected digit, expected weighted sum, source
    ['1M8GDM9AXKP042788', 'X', 351, '49 CFR 565.15 method; weighted sum 351, computed'],
    ['SGZCZ43D13S812715', 'X', 384, '49 CFR 565.15 method; weighted sum 384, computed'],
    ['11111111111111111', '1', 89, 'computed from 49 CFR 565.15 weights: sum of weights 89, 89 mod 11 = 1'],
  ])('computes %s → check digit %s from a weighted sum of %i (%s)', (vin, digit, sum) => {
    expect(computeCheckDigit(vin)).toEqual({ ok: true, checkDigit: digit, sum });
  });

  it.each([
    ['1G4AH59H45G118341', '4', "the regulation's sample VIN (49 CFR 565)"],
    ['1J9RP1A36A1644345', '6', '49 CFR 565.15, computed: valid'],
  ])('computes the digit already at position 9 of %s (%s → %s)', (vin, digit) => {
    const result = computeCheckDigit(vin);
    expect(result.ok && result.checkDigit).toBe(digit);
  });

  it.each([
    ['1M8GDM9A', 'vin.wrong_length'],
    ['1M8GDM9AXKP04278O', 'vin.forbidden_letter'],
  ])('refuses to compute a check digit for the malformed %s (%s)', (vin, code) => {
    const result = computeCheckDigit(vin);
    expect(result.ok).toBe(false);
    expect(!result.ok && result.findings.map((f) => f.code)).toContain(code);
  });
});

describe('checkVin', () => {
  it.each([
    ['1M8GDM9AXKP042788', '49 CFR 565.15, computed (sum 351)'],
    ['1G4AH59H45G118341', "the regulation's sample VIN (49 CFR 565)"],
    ['1J9RP1A36A1644345', '49 CFR 565.15, computed'],
    ['11111111111111111', '49 CFR 565.15, computed'],
  ])('accepts %s as a valid North American VIN (%s)', (vin) => {
    const result = checkVin(vin);
    expect(result).toMatchObject({ ok: true, vin, checkDigit: 'valid' });
  });

  it.each([
    ['1M8GDM9A1KP042788', '1', 'X', '49 CFR 565.15, computed: invalid'],
    ['SGZCZ43D13S812715', '1', 'X', '49 CFR 565.15, computed: sum 384 needs X'],
  ])('rejects %s because position 9 is %s where 49 CFR 565 gives %s (%s)', (vin, actual, expected) => {
    const result = checkVin(vin);
    expect(result).toEqual({
      ok: false,
      findings: [
        {
          code: 'vin.check_digit_mismatch',
          path: 'vin',
          message: `position 9 is '${actual}' but the check digit computed per 49 CFR 565 is '${expected}'; check the VIN for a mistyped character`,
        },
      ],
    });
  });

  it.each([
    ['  1m8gdm9axkp042788 ', '1M8GDM9AXKP042788'],
    ['1g4ah59h45g118341', '1G4AH59H45G118341'],
  ])('trims and upper-cases %j to %s before checking', (input, vin) => {
    expect(checkVin(input)).toMatchObject({ ok: true, vin });
  });

  it.each([
    ['1M8GDM9A1KP042788', '49 CFR 565.15, computed: invalid check digit'],
    ['SGZCZ43D13S812715', '49 CFR 565.15, computed: invalid check digit'],
  ])('accepts %s outside North America with the check digit marked not applicable (%s)', (vin) => {
    expect(checkVin(vin, { outsideNorthAmerica: true })).toEqual({ ok: true, vin, checkDigit: 'not_applicable' });
  });

  it.each([
    ['1M8GDM9AXKP04278', 'vin.wrong_length', 'VIN has 16 characters; expected exactly 17'],
    ['1M8GDM9AXKP0427888', 'vin.wrong_length', 'VIN has 18 characters; expected exactly 17'],
    ['', 'vin.wrong_length', 'VIN is empty; expected 17 characters'],
    ['1M8GDM9AXKP04278I', 'vin.forbidden_letter', "letter 'I' at position 17"],
    ['OM8GDM9AXKP042788', 'vin.forbidden_letter', "letter 'O' at position 1"],
    ['1M8GDM9AXKQ042788', 'vin.forbidden_letter', "letter 'Q' at position 11"],
    ['1M8GDM9AXKP0427-8', 'vin.bad_character', 'character "-" at position 16'],
    ['1M8GDM9AXKP0427 8', 'vin.bad_character', 'character " " at position 16'],
  ])('rejects %j with %s saying "%s"', (vin, code, message) => {
    for (const outsideNorthAmerica of [false, true]) {
      const result = checkVin(vin, { outsideNorthAmerica });
      expect(result.ok).toBe(false);
      if (!result.ok) {
        const finding = result.findings.find((f) => f.code === code);
        expect(finding?.path).toBe('vin');
        expect(finding?.message).toContain(message);
      }
    }
  });

  it('reports every bad character and the length together so one correction fixes the entry', () => {
    const result = checkVin('IOQ-1');
    expect(!result.ok && result.findings.map((f) => f.code)).toEqual([
      'vin.wrong_length',
      'vin.forbidden_letter',
      'vin.forbidden_letter',
      'vin.forbidden_letter',
      'vin.bad_character',
    ]);
  });

  it.each([[null], [undefined], [12345678901234567]])('rejects the non-string %j with a coded finding', (value) => {
    const result = checkVin(value as unknown as string, { path: 'vehicle.vin' });
    expect(result).toMatchObject({ ok: false, findings: [{ code: 'vin.not_a_string', path: 'vehicle.vin' }] });
  });
});

describe('model year at position 10', () => {
  // Year-code table of 49 CFR 565.15, from memory: A = 1980 and 2010, Y = 2000 and 2030, 1–9 = 2001–2009 and 2031–2039.
  it.each([
    ['1M8GDM9AXKP042788', 'K', [1989, 2019]],
    ['1G4AH59H45G118341', '5', [2005, 2035]],
    ['1J9RP1A36A1644345', 'A', [1980, 2010]],
  ])('reads %s position 10 %s as model year %j (from memory of 49 CFR 565.15)', (vin, code, years) => {
    expect(checkVin(vin)).toMatchObject({ ok: true, modelYearCode: code, modelYearCandidates: years });
  });

  it.each([['U'], ['Z'], ['0'], ['I']])('does not treat %s as a model-year code', (code) => {
    expect(modelYearsFor(code)).toBeUndefined();
  });

  it('leaves out the model year for a VIN built outside North America', () => {
    expect(checkVin('1M8GDM9AXKP042788', { outsideNorthAmerica: true })).not.toHaveProperty('modelYearCode');
  });
});

describe('withCheckDigit', () => {
  it.each([
    ['1M8GDM9A0KP042788', '1M8GDM9AXKP042788', '49 CFR 565.15, computed: valid VIN'],
    ['1G4AH59H05G118341', '1G4AH59H45G118341', "the regulation's sample VIN"],
    ['sgzcz43d13s812715', 'SGZCZ43DX3S812715', 'computed: sum 384 mod 11 = 10 → X (49 CFR 565.15)'],
  ])('turns %s into %s (%s)', (input, expected) => {
    const result = withCheckDigit(input);
    expect(result).toEqual({ ok: true, vin: expected });
    expect(checkVin(expected)).toMatchObject({ ok: true, checkDigit: 'valid' });
  });

  it('refuses a VIN of the wrong length instead of guessing', () => {
    expect(withCheckDigit('1M8GDM9A')).toMatchObject({ ok: false, findings: [{ code: 'vin.wrong_length' }] });
  });
});
