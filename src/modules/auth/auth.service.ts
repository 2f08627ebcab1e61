import { Inject, Injectable } from '@nestjs/common';
import { APP_CONFIG, type AppConfig } from '../../config/config';
import { DomainException } from '../../common/errors/domain.exception';
import type { Actor } from '../identity/actor';
import { AuthRepository } from './auth.repository';
import { newSecret, secretHash, verifyPassword } from './secrets';

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
  async actorFor(secret: string, now = new Date()): Promise<{ actor: Actor; kind: 'page' | 'api' } | null> {
    const found = await this.repo.actorFor(secretHash(secret), now);
    if (!found) return null;
    const u = found.user;
    return { kind: found.kind, actor: { userId: u.id, shopId: u.shopId, name: u.name, role: u.role } };
  }

  async signOut(secret: string, now = new Date()): Promise<void> {
    await this.repo.revoke(secretHash(secret), now);
  }
}
