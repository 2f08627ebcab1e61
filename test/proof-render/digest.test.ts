import { describe, expect, it } from 'vitest';
import { canonicalJson, proofDigest, qrPayload, sha256Hex, verifyProofDigest } from '../../src/proof-render';
import { sampleView } from './fixtures';

const bitsToDouble = (hex: string): number => Buffer.from(hex, 'hex').readDoubleBE(0);

describe('SHA-256 known answers', () => {
  it.each([
    // FIPS 180-2, appendix B.1 (one-block message "abc")
    ['abc', 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad'],
    // FIPS 180-2, appendix B.2 (two-block message of 448 bits)
    ['abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq', '248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1'],
  ])('hashes %j to the FIPS 180-2 example digest', (message, digest) => {
    expect(sha256Hex(message)).toBe(digest);
  });
});

describe('RFC 8785 canonical JSON', () => {
  // RFC 8785, appendix B: IEEE 754 bit patterns and their required serialisation.
  it.each([
    ['0000000000000000', '0'],
    ['8000000000000000', '0'],
    ['0000000000000001', '5e-324'],
    ['8000000000000001', '-5e-324'],
    ['7fefffffffffffff', '1.7976931348623157e+308'],
    ['ffefffffffffffff', '-1.7976931348623157e+308'],
    ['4340000000000000', '9007199254740992'],
    ['c340000000000000', '-9007199254740992'],
    ['4430000000000000', '295147905179352830000'],
    ['44b52d02c7e14af5', '9.999999999999997e+22'],
    ['44b52d02c7e14af6', '1e+23'],
    ['44b52d02c7e14af7', '1.0000000000000001e+23'],
    ['444b1ae4d6e2ef4e', '999999999999999700000'],
    ['444b1ae4d6e2ef4f', '999999999999999900000'],
    ['444b1ae4d6e2ef50', '1e+21'],
    ['3eb0c6f7a0b5ed8c', '9.999999999999997e-7'],
    ['3eb0c6f7a0b5ed8d', '0.000001'],
    ['41b3de4355555553', '333333333.3333332'],
    ['41b3de4355555554', '333333333.33333325'],
    ['41b3de4355555555', '333333333.3333333'],
    ['41b3de4355555556', '333333333.3333334'],
    ['41b3de4355555557', '333333333.33333343'],
    ['becbf647612f3696', '-0.0000033333333333333333'],
    ['43143ff3c1cb0959', '1424953923781206.2'],
  ])('serialises the double with bits %s as %s (RFC 8785 appendix B)', (bits, text) => {
    expect(canonicalJson(bitsToDouble(bits))).toBe(text);
  });

  it.each([
    ['7fffffffffffffff', 'NaN'],
    ['7ff0000000000000', 'Infinity'],
  ])('refuses the double with bits %s (%s), as RFC 8785 appendix B requires', (bits) => {
    expect(() => canonicalJson({ value: bitsToDouble(bits) })).toThrow(/finite/);
  });

  it('sorts property names by UTF-16 code units (RFC 8785 section 3.2.3 example)', () => {
    const input = {
      '\u20ac': 'Euro Sign',
      '\r': 'Carriage Return',
      '\ufb33': 'Hebrew Letter Dalet With Dagesh',
      '1': 'One',
      '\ud83d\ude00': 'Emoji: Grinning Face',
      '\u0080': 'Control',
      '\u00f6': 'Latin Small Letter O With Diaeresis',
    };
    // Read the order from the text: JSON.parse would move the integer-like key "1" to the front by itself.
    const textOrder = [...canonicalJson(input).matchAll(/"((?:[^"\\]|\\.)*)":/g)].map((m) => JSON.parse(`"${m[1]}"`) as string);
    expect(textOrder).toEqual(['\r', '1', '\u0080', '\u00f6', '\u20ac', '\ud83d\ude00', '\ufb33']);
  });

  it('canonicalises the sample of the RFC 8785 authors\' reference implementation (json-canonicalization README) byte for byte', () => {
    const input = JSON.parse(
      '{\n  "numbers": [1E30,4.50,6,2e-3,0.000000000000000000000000001],\n  "escaping": "\\u20ac$\\u000F\\u000aA\'\\u0042\\u0022\\u005c\\\\\\"\\/",\n  "other":  [null, true, false]\n}',
    ) as unknown;
    const expectedHex =
      '7b 22 65 73 63 61 70 69 6e 67 22 3a 22 e2 82 ac 24 5c 75 30 30 30 66 5c 6e 41 27 42 5c 22 5c 5c ' +
      '5c 5c 5c 22 2f 22 2c 22 6e 75 6d 62 65 72 73 22 3a 5b 31 65 2b 33 30 2c 34 2e 35 2c 36 2c 30 2e ' +
      '30 30 32 2c 31 65 2d 32 37 5d 2c 22 6f 74 68 65 72 22 3a 5b 6e 75 6c 6c 2c 74 72 75 65 2c 66 61 ' +
      '6c 73 65 5d 7d';
    const text = canonicalJson(input);
    expect(text).toBe('{"escaping":"€$\\u000f\\nA\'B\\"\\\\\\\\\\"/","numbers":[1e+30,4.5,6,0.002,1e-27],"other":[null,true,false]}');
    expect(Buffer.from(text, 'utf8').toString('hex')).toBe(expectedHex.replace(/ /g, ''));
  });

  it('refuses a lone surrogate, which I-JSON (RFC 7493 section 2.1) and RFC 8785 section 3.2.2.2 exclude', () => {
    expect(() => canonicalJson({ note: 'bad \ud800 text' })).toThrow(/lone surrogate/);
  });
});

describe('proof digest', () => {
  it('is the SHA-256 of the canonical JSON of the whole view', () => {
    const view = sampleView();
    expect(proofDigest(view)).toBe(sha256Hex(canonicalJson(view)));
    expect(proofDigest(view)).toMatch(/^[0-9a-f]{64}$/);
  });

  it('does not depend on the order in which the view\'s keys were written', () => {
    const view = sampleView();
    const reversed = JSON.parse(JSON.stringify(view, (_k, v: unknown) =>
      v && typeof v === 'object' && !Array.isArray(v) ? Object.fromEntries(Object.entries(v).reverse()) : v)) as typeof view;
    expect(Object.keys(reversed)[0]).toBe('cautions');
    expect(proofDigest(reversed)).toBe(proofDigest(view));
  });

  it.each([
    ['a reading as entered', (v: ReturnType<typeof sampleView>) => { v.diagnosis[3]!.reading.entered = '0.01 V'; }],
    ['a correction reason', (v: ReturnType<typeof sampleView>) => { v.verification[1]!.superseded[0]!.reason += '.'; }],
    ['the order of the diagnostic path', (v: ReturnType<typeof sampleView>) => { v.diagnosis.reverse(); }],
    ['the foreman decision', (v: ReturnType<typeof sampleView>) => { v.signOff.decisions.pop(); }],
    ['a caution', (v: ReturnType<typeof sampleView>) => { v.cautions.push('high_voltage_system'); }],
  ])('changes when %s changes', (_what, edit) => {
    const view = sampleView();
    const before = proofDigest(view);
    edit(view);
    expect(proofDigest(view)).not.toBe(before);
  });

  it.each([
    ['the lower-case hex digest', (d: string) => d, true],
    ['the upper-case hex digest', (d: string) => d.toUpperCase(), true],
    ['the QR payload', (d: string) => qrPayload(d), true],
    ['a digest with one character changed', (d: string) => `${d.slice(0, -1)}${d.endsWith('0') ? '1' : '0'}`, false],
  ])('verifies %s against the view: %s', (_what, claim, ok) => {
    const view = sampleView();
    const result = verifyProofDigest(view, claim(proofDigest(view)));
    expect(result.ok).toBe(ok);
    if (!result.ok) expect(result.findings.map((f) => f.code)).toEqual(['digest.mismatch']);
  });

  it('reports a malformed claimed digest with a coded finding', () => {
    const result = verifyProofDigest(sampleView(), 'not-a-digest');
    expect(result).toMatchObject({ ok: false, findings: [{ code: 'digest.malformed', path: '/digest' }] });
  });
});
