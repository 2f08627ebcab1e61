import { Inject, Injectable } from '@nestjs/common';
import { APP_CONFIG, type AppConfig } from '../../config/config';
import { DomainException } from '../../common/errors/domain.exception';
import type { Actor } from '../identity/actor';
import { AuthRepository } from './auth.repository';
import { newSecret, secretHash, verifyPassword } from './secrets';
import { SessionCache, sessionEnded, type CachedSignIn, type PendingSession } from './session-cache';

/**
 * Lock-out: NIST SP 800-63B §5.2.2 ("Rate Limiting") requires a verifier to allow no more than 100 consecutive
 * failed attempts on one account; we lock far earlier, after 10, for 15 minutes (common practice, no source).
 */
export const LOCK_AFTER_FAILURES = 10;
export const LOCK_MINUTES = 15;

export interface SignedIn {
  secret: string;
  expiresAt: Date;
  actor: Actor;
}

/** The one answer to every failed sign-in: it never says whether the email exists or the account is locked. */
const refused = () =>
  new DomainException('unauthenticated', 'sign_in.refused', 'The email or password is not right, or the account is locked for a while after too many tries.');

@Injectable()
export class AuthService {
  constructor(
    private readonly repo: AuthRepository,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    private readonly sessions: SessionCache,
  ) {}

  async signIn(email: string, password: string, kind: 'page' | 'api', client: string, now = new Date()): Promise<SignedIn> {
    const address = email.trim().toLowerCase();
    // Every refusal does the same work, whether or not the email exists: one lookup, one argon2id verification (a
    // dummy hash stands in for a missing one), one failure statement.
    const user = await this.repo.userByEmail(address);
    const matches = await verifyPassword(user?.passwordHash ?? null, password);
    if (!user || !user.active || (user.lockedUntil && user.lockedUntil > now) || !matches) {
      await this.repo.recordFailure(address, LOCK_AFTER_FAILURES, new Date(now.getTime() + LOCK_MINUTES * 60_000), now);
      throw refused();
    }
    await this.repo.recordSuccess(user.id);
    const secret = newSecret();
    const lifetime = kind === 'page' ? this.config.sessionHours * 3_600_000 : this.config.tokenDays * 86_400_000;
    const { expiresAt } = await this.repo.createSignIn({ userId: user.id, kind, secretHash: secretHash(secret), client: client.slice(0, 200), expiresAt: new Date(now.getTime() + lifetime) });
    return { secret, expiresAt, actor: { userId: user.id, shopId: user.shopId, name: user.name, role: user.role } };
  }

  /** The caller behind a session or token secret, or null when it is unknown, expired or revoked. */
  async actorFor(secret: string, now = new Date()): Promise<{ actor: Actor; kind: 'page' | 'api'; signInId: string } | null> {
    const hash = secretHash(secret);
    const found = await this.repo.actorFor(hash, now);
    if (!found) {
      this.sessions.forget(hash);
      return null;
    }
    const u = found.user;
    const actor: Actor = { userId: u.id, shopId: u.shopId, name: u.name, role: u.role };
    this.sessions.set(hash, { signInId: found.id, kind: found.kind, actor, expiresAt: found.expiresAt });
    return { kind: found.kind, actor, signInId: found.id };
  }

  /** The sign-in as this instance last found it live, not read again: only for routes that check it themselves. */
  cached(secret: string, now = new Date()): (CachedSignIn & { secretHash: string }) | undefined {
    const hash = secretHash(secret);
    const entry = this.sessions.get(hash, now);
    return entry && { ...entry, actor: { ...entry.actor }, secretHash: hash };
  }

  /** Reads a pending sign-in (see PendingSession): the person as they are now, or 401 when it ended meanwhile. */
  async confirm(pending: PendingSession, path: string, now = new Date()): Promise<Actor> {
    const u = await this.repo.liveSignIn(pending.signInId, now);
    return this.settled(pending, u && { userId: u.id, shopId: u.shopId, name: u.name, role: u.role }, path);
  }

  /** What a pending sign-in's check found (the live person, or null), applied to the cache; 401 when it ended. */
  settled(pending: PendingSession, actor: Actor | null, path: string): Actor {
    if (!actor) {
      this.sessions.forget(pending.secretHash);
      throw sessionEnded(path);
    }
    this.sessions.refresh(pending.secretHash, actor);
    return actor;
  }

  async signOut(secret: string, now = new Date()): Promise<void> {
    const hash = secretHash(secret);
    this.sessions.forget(hash);
    await this.repo.revoke(hash, now);
  }
}
