/**
 * The evidence digest: SHA-256 (FIPS 180-4) over the UTF-8 bytes of the RFC 8785 canonical JSON of the view.
 * Anyone holding the view JSON can recompute it with any RFC 8785 implementation and compare it with the printed one.
 */
import { createHash } from 'node:crypto';
import canonicalize from 'canonicalize';
import type { ProofView } from './view';
import type { Finding } from './findings';

/** Text carried by the QR code: upper case only, so the symbol uses the compact alphanumeric mode. */
export const QR_PREFIX = 'TRACEBAY-PROOF/1 SHA-256:';

/**
 * RFC 8785 canonical JSON. Rejects what I-JSON (RFC 7493) forbids and JSON cannot carry: NaN, ±Infinity, lone
 * surrogates (RFC 8785 §3.2.2.2), and values that are not plain data (undefined at top level, functions).
 */
export function canonicalJson(value: unknown): string {
  assertPlainJson(value, '');
  const text = canonicalize(value);
  if (text === undefined) throw new Error('canonical JSON: value has no JSON form');
  return text;
}

function assertPlainJson(value: unknown, path: string): void {
  if (value === null || typeof value === 'boolean') return;
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw new Error(`canonical JSON: ${path || '(root)'} is ${value}; only finite numbers are allowed`);
    return;
  }
  if (typeof value === 'string') {
    if (hasLoneSurrogate(value)) throw new Error(`canonical JSON: ${path || '(root)'} holds a lone surrogate`);
    return;
  }
  if (Array.isArray(value)) {
    value.forEach((v, i) => assertPlainJson(v, `${path}/${i}`));
    return;
  }
  if (typeof value === 'object' && Object.getPrototypeOf(value) === Object.prototype) {
    for (const [k, v] of Object.entries(value)) {
      if (hasLoneSurrogate(k)) throw new Error(`canonical JSON: key under ${path || '(root)'} holds a lone surrogate`);
      if (v !== undefined) assertPlainJson(v, `${path}/${k}`);
    }
    return;
  }
  throw new Error(`canonical JSON: ${path || '(root)'} is ${typeof value}, not plain JSON data`);
}

/** In u-mode a paired surrogate is one code point, so \p{Surrogate} only matches a lone one. */
export function hasLoneSurrogate(text: string): boolean {
  return /\p{Surrogate}/u.test(text);
}

export function sha256Hex(data: string | Uint8Array): string {
  return createHash('sha256').update(typeof data === 'string' ? Buffer.from(data, 'utf8') : data).digest('hex');
}

/** Lower-case hex SHA-256 of the canonical JSON of the whole view (nothing left out). */
export function proofDigest(view: ProofView): string {
  return sha256Hex(canonicalJson(view));
}

/**
 * SHA-256 of the evidence alone: everything the document states but the sign-off (and who signed), so that an
 * approval can name the evidence it was given on, and a later reading, repair or status change makes it stale.
 */
export function evidenceDigest(view: ProofView): string {
  const { signOff: _signOff, foreman: _foreman, ...evidence } = view;
  return sha256Hex(canonicalJson(evidence));
}

/** A digest as people give it: 64 hex characters in either case, after "sha256:" or the QR prefix or not. */
export function parseDigest(text: string): string | null {
  const trimmed = text.trim();
  const upper = trimmed.toUpperCase();
  const hex = upper.startsWith(QR_PREFIX) ? trimmed.slice(QR_PREFIX.length) : upper.startsWith('SHA256:') || upper.startsWith('SHA-256:') ? trimmed.slice(trimmed.indexOf(':') + 1) : trimmed;
  const clean = hex.trim().toLowerCase();
  return /^[0-9a-f]{64}$/.test(clean) ? clean : null;
}

/** The string encoded in the QR code for a digest. */
export function qrPayload(digestHex: string, publicBase?: string): string {
  // Upper case keeps the symbol in the compact alphanumeric mode; host names and our routes ignore case.
  if (publicBase) return `${publicBase.replace(/\/+$/, '')}/PROOFS/${digestHex}`.toUpperCase();
  return `${QR_PREFIX}${digestHex.toUpperCase()}`;
}

/** The public address of a proof, as printed. */
export function publicProofUrl(digestHex: string, publicBase: string): string {
  return `${publicBase.replace(/\/+$/, '')}/proofs/${digestHex}`;
}

export type DigestCheck =
  | { ok: true; digest: string }
  | { ok: false; digest: string | null; findings: Finding[] };

/**
 * Compare a claimed digest (hex, either case, or the QR payload) with the one recomputed from a view. The view is
 * not schema-validated here: the digest covers whatever JSON was handed over, which is what a verifier holds.
 */
export function verifyProofDigest(view: unknown, claimed: string): DigestCheck {
  const findings: Finding[] = [];
  const trimmed = claimed.trim();
  const hex = (trimmed.toUpperCase().startsWith(QR_PREFIX) ? trimmed.slice(QR_PREFIX.length) : trimmed).toLowerCase();
  if (!/^[0-9a-f]{64}$/.test(hex)) {
    findings.push({ code: 'digest.malformed', path: '/digest', message: 'expected 64 hexadecimal characters (a SHA-256 digest), optionally after the QR prefix' });
  }
  let digest: string | null = null;
  try {
    digest = sha256Hex(canonicalJson(view));
  } catch (error) {
    findings.push({ code: 'digest.view_not_json', path: '/view', message: (error as Error).message });
  }
  if (digest !== null && findings.length === 0 && digest !== hex) {
    findings.push({ code: 'digest.mismatch', path: '/digest', message: `the view hashes to ${digest}, not ${hex}: the document and this view differ` });
  }
  return findings.length === 0 && digest !== null ? { ok: true, digest } : { ok: false, digest, findings };
}
