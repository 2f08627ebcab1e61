/**
 * Password hashing and the secrets behind sessions and API tokens. Only hashes are stored: the password's
 * argon2id string, and the SHA-256 of each 32-byte random session or token secret (a random 256-bit secret needs
 * no slow hash: it cannot be guessed from a dictionary).
 */
import { hash, verify, Algorithm } from '@node-rs/argon2';
import { createHash, createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import { normalisePassword } from './password-rules';

/**
 * argon2id with 19 MiB of memory, 2 passes, 1 lane: the minimum the OWASP Password Storage Cheat Sheet
 * recommends for argon2id (RFC 9106 §4 recommends argon2id; its second option, 64 MiB / 3 passes / 4 lanes,
 * is for hosts with more memory per sign-in than a shop server on 2 cores).
 */
const ARGON2ID = { algorithm: Algorithm.Argon2id, memoryCost: 19_456, timeCost: 2, parallelism: 1, outputLen: 32 } as const;

export function hashPassword(password: string): Promise<string> {
  return hash(normalisePassword(password), ARGON2ID);
}

/**
 * An argon2id hash (same parameters as ARGON2ID) of a random password that was thrown away: verified when the email
 * is unknown or has no password, so that answer costs the same hashing as a real one. Fixed here rather than made
 * at start-up, so that no first unknown email pays for making it.
 */
export const DUMMY_HASH = '$argon2id$v=19$m=19456,t=2,p=1$5i6MM15Aq6nG2sFZCygyHw$ZEIVwootvbzRI5JdOq3u+50GxyKd6by4+URnf6hwbGA';

/** The PHC parameter string of our hashes (`m=…,t=…,p=…`), for checking the dummy against ARGON2ID. */
export const ARGON2ID_PARAMS = `m=${ARGON2ID.memoryCost},t=${ARGON2ID.timeCost},p=${ARGON2ID.parallelism}`;

export async function verifyPassword(stored: string | null, password: string): Promise<boolean> {
  try {
    const ok = await verify(stored ?? DUMMY_HASH, normalisePassword(password));
    return ok && stored !== null;
  } catch {
    return false;
  }
}

/** A new session or token secret: 32 random bytes, base64url. */
export function newSecret(): string {
  return randomBytes(32).toString('base64url');
}

/** What is stored for a secret: SHA-256, hex. */
export function secretHash(secret: string): string {
  return createHash('sha256').update(secret, 'utf8').digest('hex');
}

/** The CSRF token of a page session: derived from its secret, so it needs no storage and dies with the session. */
export function csrfTokenFor(sessionSecret: string): string {
  return createHmac('sha256', sessionSecret).update('tracebay csrf v1').digest('base64url');
}

export function sameToken(a: string | undefined, b: string): boolean {
  if (typeof a !== 'string') return false;
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}
