import { CanActivate, ExecutionContext, Inject, Injectable, SetMetadata } from '@nestjs/common';
import type { Response } from 'express';
import { APP_CONFIG, type AppConfig } from '../../config/config';
import { readBody } from '../../common/http/read-body';
import { Reflector } from '@nestjs/core';
import { DomainException } from '../../common/errors/domain.exception';
import { AuthService } from '../auth/auth.service';
import { bearerToken, CSRF_FIELD, CSRF_HEADER, readCookie, SESSION_COOKIE } from '../auth/credentials';
import { csrfTokenFor, sameToken } from '../auth/secrets';
import { CHECKS_SESSION_ITSELF, sessionEnded, type PendingSession } from '../auth/session-cache';
import type { RequestWithActor } from './actor';

const PUBLIC = Symbol('public-route');
/** Marks a route that needs no actor (health, documentation, sign-in). */
export const PublicRoute = () => SetMetadata(PUBLIC, true);

export type RequestWithCredential = RequestWithActor & {
  credential?: { via: 'bearer' | 'session'; secret: string; signInId: string };
  /** Set when the sign-in came from the cache unread (see ChecksSessionItself). */
  pendingSession?: PendingSession;
};

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * Identifies the caller from an API bearer token (`Authorization: Bearer …`) or the pages' session cookie, both
 * looked up by their SHA-256 in the database (so every instance of the service agrees). A state-changing request
 * carried by the session cookie must also carry the session's CSRF token (header or form field): the browser
 * sends the cookie on its own, the token only a page of ours can know. Bearer tokens are never sent by a browser
 * on its own, so they need none.
 */
@Injectable()
export class ActorGuard implements CanActivate {
  constructor(
    private readonly reflector: Reflector,
    private readonly auth: AuthService,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  async canActivate(context: ExecutionContext): Promise<boolean> {
    const request = context.switchToHttp().getRequest<RequestWithCredential>();
    const response = context.switchToHttp().getResponse<Response>();
    if (this.reflector.getAllAndOverride<boolean>(PUBLIC, [context.getHandler(), context.getClass()])) {
      await readBody(request, response, this.config.bodyLimit);
      return true;
    }
    const bearer = bearerToken(request);
    const session = bearer ? undefined : readCookie(request, SESSION_COOKIE);
    const secret = bearer ?? session;
    const unauthenticated = (message: string) =>
      new DomainException('unauthenticated', 'actor.missing', message, [
        { code: 'actor.invalid', path: bearer || !session ? 'headers.authorization' : `cookies.${SESSION_COOKIE}`, message },
      ]);
    if (!secret) {
      if (request.header('authorization')) throw unauthenticated('The Authorization header must be “Bearer <token>” with a token from POST /api/auth/sign-in.');
      throw unauthenticated('Sign in first: send “Authorization: Bearer <token>” (from POST /api/auth/sign-in), or sign in on the pages.');
    }
    // A route that reads the sign-in in its own first statement takes it from the cache here; a write sent with an
    // Idempotency-Key does not, since its key is claimed (written) before the handler runs.
    const reachesHandler = this.reflector.getAllAndOverride<((req: RequestWithCredential) => boolean) | undefined>(CHECKS_SESSION_ITSELF, [context.getHandler(), context.getClass()]);
    const itself = reachesHandler !== undefined && request.header('idempotency-key') === undefined && reachesHandler(request);
    const cached = itself ? this.auth.cached(secret) : undefined;
    const found = cached ?? (await this.auth.actorFor(secret));
    if (!found) throw sessionEnded(bearer || !session ? 'headers.authorization' : `cookies.${SESSION_COOKIE}`);
    // Only now, with the caller known, is the body read.
    await readBody(request, response, this.config.bodyLimit);
    if (session && !SAFE_METHODS.has(request.method)) {
      const body = request.body as Record<string, unknown> | undefined;
      const sent = request.header(CSRF_HEADER) ?? (typeof body?.[CSRF_FIELD] === 'string' ? (body[CSRF_FIELD] as string) : undefined);
      if (!sameToken(sent, csrfTokenFor(session))) {
        throw new DomainException('forbidden', 'csrf.missing', 'This change came without the page’s CSRF token: reload the page and try again.', [
          { code: 'csrf.invalid', path: `headers.${CSRF_HEADER}`, message: 'A change made with the session cookie carries the session’s CSRF token in the X-CSRF-Token header or the _csrf form field.' },
        ]);
      }
    }
    request.actor = found.actor;
    request.credential = { via: bearer ? 'bearer' : 'session', secret, signInId: found.signInId };
    if (cached) request.pendingSession = { signInId: cached.signInId, secretHash: cached.secretHash };
    return true;
  }
}
