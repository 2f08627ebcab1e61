import { Injectable, SetMetadata } from '@nestjs/common';
import type { Request } from 'express';
import { DomainException } from '../../common/errors/domain.exception';
import type { Actor } from '../identity/actor';

/** A sign-in (page session or API token) as last found live in the database. */
export interface CachedSignIn {
  signInId: string;
  kind: 'page' | 'api';
  actor: Actor;
  expiresAt: Date;
}

/**
 * A request let through on a cached sign-in whose liveness is still to be read: the handler reads it in its own
 * first statement (or `MeasurementsService` does it before anything else), and until then nothing is written.
 */
export interface PendingSession {
  signInId: string;
  secretHash: string;
}

export type RequestWithPendingSession = Request & { pendingSession?: PendingSession };

export const CHECKS_SESSION_ITSELF = Symbol('checks-session-itself');
/**
 * Marks a route whose handler reads the sign-in's liveness in its own first statement, so the guard may let a
 * cached sign-in through without a lookup of its own. A sign-out or deactivation on any instance is still seen
 * by that statement: the cache only spares the round trip, never the check. `reachesHandler` tells whether the
 * request's parameters pass the route's pipes: a request refused before the handler runs is looked up first, so
 * that an ended sign-in gets its 401 rather than a 400.
 */
export const ChecksSessionItself = (reachesHandler: (req: Request) => boolean) => SetMetadata(CHECKS_SESSION_ITSELF, reachesHandler);

/** The one answer to a credential that is unknown, expired, signed out, or whose person was deactivated. */
export function sessionEnded(path: string): DomainException {
  const message = 'The token or session is unknown, expired or signed out: sign in again.';
  return new DomainException('unauthenticated', 'actor.missing', message, [{ code: 'actor.invalid', path, message }]);
}

const MOST_ENTRIES = 10_000;

/** Sign-ins of this instance's recent callers, by secret hash; bounded, oldest dropped first. */
@Injectable()
export class SessionCache {
  private readonly entries = new Map<string, CachedSignIn>();

  get(secretHash: string, now: Date): CachedSignIn | undefined {
    const entry = this.entries.get(secretHash);
    if (entry && entry.expiresAt <= now) {
      this.entries.delete(secretHash);
      return undefined;
    }
    return entry;
  }

  set(secretHash: string, entry: CachedSignIn): void {
    this.entries.delete(secretHash);
    this.entries.set(secretHash, entry);
    if (this.entries.size > MOST_ENTRIES) this.entries.delete(this.entries.keys().next().value!);
  }

  /** The person as the database has them now (a rename or a new role), for the next request. */
  refresh(secretHash: string, actor: Actor): void {
    const entry = this.entries.get(secretHash);
    if (entry) entry.actor = actor;
  }

  forget(secretHash: string): void {
    this.entries.delete(secretHash);
  }
}
