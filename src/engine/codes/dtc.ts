/**
 * Diagnostic trouble codes in the SAE J2012 five-character form (system letter, then four characters) and the
 * two-byte form a scan tool receives: bits 15–14 system (P, C, B, U), bits 13–12 first digit 0–3, then three hex
 * digits of four bits each.
 */

import { type Finding, parseBytes } from './raw-bytes';

export type { Finding };

export const DTC_SYSTEM_LETTERS = ['P', 'C', 'B', 'U'] as const;
export type DtcSystemLetter = (typeof DTC_SYSTEM_LETTERS)[number];

export type DtcSystem = 'powertrain' | 'chassis' | 'body' | 'network';
const SYSTEM_NAMES: Readonly<Record<DtcSystemLetter, DtcSystem>> = {
  P: 'powertrain',
  C: 'chassis',
  B: 'body',
  U: 'network',
};

const DTC_PATTERN = /^[PCBU][0-3][0-9A-F]{3}$/;

export type ParseDtcResult = { ok: true; code: string } | { ok: false; findings: Finding[] };

/** Checks a typed code ("p0122" → "P0122"); explains the first thing wrong with it. */
export function parseDtc(text: string, path = 'code'): ParseDtcResult {
  if (typeof text !== 'string') {
    return { ok: false, findings: [{ code: 'dtc.not_a_string', path, message: 'a trouble code must be a string such as "P0122"' }] };
  }
  const code = text.trim().toUpperCase();
  if (DTC_PATTERN.test(code)) return { ok: true, code };
  return { ok: false, findings: [{ code: 'dtc.bad_format', path, message: explainBadFormat(code) }] };
}

function explainBadFormat(code: string): string {
  const shown = JSON.stringify(code);
  const expected = 'expected a letter P, C, B or U, a digit 0–3, then three hex digits 0–9/A–F (e.g. "P0122")';
  if (code.length !== 5) return `trouble code ${shown} has ${code.length} characters; ${expected}`;
  if (!(DTC_SYSTEM_LETTERS as readonly string[]).includes(code[0])) {
    return `trouble code ${shown} starts with '${code[0]}'; ${expected}`;
  }
  if (!/[0-3]/.test(code[1])) return `trouble code ${shown} has '${code[1]}' as its second character; ${expected}`;
  const bad = [...code.slice(2)].findIndex((ch) => !/[0-9A-F]/.test(ch));
  return `trouble code ${shown} has '${code[2 + bad]}' at position ${3 + bad}; ${expected}`;
}

export type DecodeDtcResult = { ok: true; code: string | null } | { ok: false; findings: Finding[] };

/**
 * Decodes the two raw bytes of a stored code ([0xC1, 0x58] or "C1 58" → "U0158"). Both bytes zero means "no code"
 * (a padding entry in a scan-tool response) and decodes to `code: null`.
 */
export function decodeDtcBytes(bytes: readonly number[] | string, path = 'bytes'): DecodeDtcResult {
  const parsed = parseBytes(bytes, path);
  if (!parsed.ok) return parsed;
  if (parsed.bytes.length !== 2) {
    return {
      ok: false,
      findings: [{ code: 'dtc.wrong_byte_count', path, message: `a trouble code takes exactly 2 bytes, got ${parsed.bytes.length}` }],
    };
  }
  const [a, b] = parsed.bytes;
  if (a === 0 && b === 0) return { ok: true, code: null };
  const letter = DTC_SYSTEM_LETTERS[a >> 6];
  const firstDigit = (a >> 4) & 0b11;
  const hex = ((a & 0x0f) << 8) | b;
  return { ok: true, code: `${letter}${firstDigit}${hex.toString(16).toUpperCase().padStart(3, '0')}` };
}

export type EncodeDtcResult = { ok: true; bytes: [number, number] } | { ok: false; findings: Finding[] };

/** The inverse of `decodeDtcBytes`: "P0104" → [0x01, 0x04]. */
export function encodeDtc(text: string, path = 'code'): EncodeDtcResult {
  const parsed = parseDtc(text, path);
  if (!parsed.ok) return parsed;
  const { code } = parsed;
  const system = DTC_SYSTEM_LETTERS.indexOf(code[0] as DtcSystemLetter);
  const rest = parseInt(code.slice(2), 16);
  const a = (system << 6) | (Number(code[1]) << 4) | (rest >> 8);
  return { ok: true, bytes: [a, rest & 0xff] };
}

/** Powertrain, chassis, body or network, from the code's first letter; undefined for a malformed code. */
export function systemOf(code: string): DtcSystem | undefined {
  const parsed = parseDtc(code);
  return parsed.ok ? SYSTEM_NAMES[parsed.code[0] as DtcSystemLetter] : undefined;
}

/**
 * Who defines the code's meaning, kept deliberately simple: second character 0 → SAE generic, 1 → manufacturer.
 * Codes with 2 or 3 there are reported as "unclassified": J2012 splits those ranges differently per system (and
 * within P3), which this function does not attempt; look such codes up in the manufacturer's service information.
 */
export type DtcScope = 'sae_generic' | 'manufacturer' | 'unclassified';
export function scopeOf(code: string): DtcScope | undefined {
  const parsed = parseDtc(code);
  if (!parsed.ok) return undefined;
  const digit = parsed.code[1];
  return digit === '0' ? 'sae_generic' : digit === '1' ? 'manufacturer' : 'unclassified';
}
