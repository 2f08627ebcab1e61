import type { Finding } from '../findings';

export type ParseBytesResult = { ok: true; bytes: number[] } | { ok: false; findings: Finding[] };

/** Bytes as numbers 0–255 or as hex text ("C1 58", "c158", "0xC1,0x58"). Findings point at each bad byte. */
export function parseBytes(
  bytes: readonly number[] | string,
  path: string,
): ParseBytesResult {
  if (typeof bytes === 'string') {
    const tokens = bytes
      .trim()
      .split(/[\s,]+/)
      .filter((t) => t.length > 0)
      .map((t) => t.replace(/^0x/i, ''));
    const split = tokens.length === 1 && tokens[0].length > 2 && tokens[0].length % 2 === 0 ? tokens[0].match(/../g)! : tokens;
    const findings: Finding[] = [];
    const out: number[] = [];
    split.forEach((t, i) => {
      if (/^[0-9a-f]{1,2}$/i.test(t)) out.push(parseInt(t, 16));
      else findings.push({ code: 'bytes.bad_hex', path: `${path}[${i}]`, message: `${JSON.stringify(t)} is not a hex byte 00–FF` });
    });
    return findings.length > 0 ? { ok: false, findings } : { ok: true, bytes: out };
  }
  if (!Array.isArray(bytes)) {
    return { ok: false, findings: [{ code: 'bytes.not_a_list', path, message: 'bytes must be a list of numbers 0–255 or hex text like "1A F8"' }] };
  }
  const findings: Finding[] = [];
  bytes.forEach((b, i) => {
    if (typeof b !== 'number' || !Number.isInteger(b) || b < 0 || b > 255) {
      findings.push({ code: 'bytes.out_of_range', path: `${path}[${i}]`, message: `byte ${JSON.stringify(b)} is not an integer 0–255` });
    }
  });
  return findings.length > 0 ? { ok: false, findings } : { ok: true, bytes: [...bytes] };
}

export type { Finding };
