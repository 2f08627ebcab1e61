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

/** A hash of a password nobody has, verified when the email is unknown so that answer takes as long as a real one. */
let decoy: Promise<string> | undefined;

export async function verifyPassword(stored: string | null, password: string): Promise<boolean> {
  const target = stored ?? (await (decoy ??= hashPassword(randomBytes(16).toString('hex'))));
  try {
    const ok = await verify(target, normalisePassword(password));
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
