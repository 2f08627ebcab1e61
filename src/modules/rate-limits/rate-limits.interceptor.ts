import { Inject, Injectable, type CallHandler, type ExecutionContext, type NestInterceptor } from '@nestjs/common';
import { WRITE_METHODS } from '../../common/http-methods';
import type { Observable } from 'rxjs';
import { APP_CONFIG, type AppConfig } from '../../config/config';
import { TooManyRequestsException } from '../../common/errors/domain.exception';
import type { Actor, RequestWithActor } from '../identity/actor';
import type { PendingSession } from '../auth/session-cache';
import { RateLimitsRepository } from './rate-limits.repository';

/**
 * The sign-in routes (the API's and the pages' form), matched by path so the limit holds whoever implements them.
 * Both draw on the same budgets: alternating between them gains an attacker nothing.
 */
export const SIGN_IN_PATHS: ReadonlySet<string> = new Set(['/api/auth/sign-in', '/sign-in']);

export interface Budget {
  bucket: string;
  limit: number;
  windowSeconds: number;
  code: string;
  what: string;
}

/**
 * Request budgets shared by every instance through the database: writes per user, and sign-in attempts per
 * client address and per email address. Over budget → 429 with `Retry-After`.
 */
@Injectable()
export class RateLimitsInterceptor implements NestInterceptor {
  constructor(
    private readonly counters: RateLimitsRepository,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  async intercept(context: ExecutionContext, next: CallHandler): Promise<Observable<unknown>> {
    if (context.getType() !== 'http') return next.handle();
    const req = context.switchToHttp().getRequest<RequestWithActor & { pendingSession?: PendingSession }>();
    // A caller let through on a cached sign-in is counted by the handler, in the statement that checks the sign-in.
    if (!WRITE_METHODS.has(req.method) || req.pendingSession) return next.handle();
    const budgets = this.budgetsFor(req).filter((b) => b.limit > 0);
    if (budgets.length === 0) return next.handle();
    this.housekeep();
    for (const budget of budgets) {
      const { hits, resetSeconds } = await this.counters.hit(bucketOf(budget), budget.windowSeconds);
      refuseOver(budget, hits, resetSeconds);
    }
    return next.handle();
  }

  /** Now and then, on a counted request: drops windows long over. */
  housekeep(): void {
    if (Math.random() < 0.005) void this.counters.purgeOld().catch(() => {});
  }

  /** The write budget of a person, or undefined when writes are not limited. */
  writeBudget(actor: Actor): Budget | undefined {
    const limits = this.config.rateLimits;
    const budget = { bucket: `write:user:${actor.userId}`, limit: limits.writesPerUser, windowSeconds: limits.writeWindowSeconds, code: 'rate_limit.writes', what: 'writes by this user' };
    return budget.limit > 0 ? budget : undefined;
  }

  /** Counts one write of a caller the interceptor let through uncounted (see above); 429 when over budget. */
  async countWrite(actor: Actor): Promise<void> {
    const budget = this.writeBudget(actor);
    if (!budget) return;
    this.housekeep();
    const { hits, resetSeconds } = await this.counters.hit(bucketOf(budget), budget.windowSeconds);
    refuseOver(budget, hits, resetSeconds);
  }

  private budgetsFor(req: RequestWithActor): Budget[] {
    const limits = this.config.rateLimits;
    // Routing ignores case and a trailing slash, so the match does too.
    if (SIGN_IN_PATHS.has(req.path.toLowerCase().replace(/\/+$/, ''))) {
      const ip = req.ip ?? req.socket.remoteAddress ?? 'unknown';
      const email = typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase().slice(0, 254) : undefined;
      return [
        { bucket: `sign-in:ip:${ip}`, limit: limits.signInsPerIp, windowSeconds: limits.signInWindowSeconds, code: 'rate_limit.sign_in', what: 'sign-in attempts from this address' },
        ...(email
          ? [{ bucket: `sign-in:email:${email}`, limit: limits.signInsPerEmail, windowSeconds: limits.signInWindowSeconds, code: 'rate_limit.sign_in', what: 'sign-in attempts for this account' }]
          : []),
      ];
    }
    if (!req.actor) return [];
    const write = this.writeBudget(req.actor);
    return write ? [write] : [];
  }
}

/** The window length is part of the bucket: instances configured alike share it, others keep apart. */
export function bucketOf(budget: Budget): string {
  return `${budget.bucket}/${budget.windowSeconds}s`;
}

/** 429 with `Retry-After` once a budget's count passed its limit. */
export function refuseOver(budget: Budget, hits: number, resetSeconds: number): void {
  if (hits <= budget.limit) return;
  const wait = Math.max(1, Math.ceil(resetSeconds));
  throw new TooManyRequestsException(
    budget.code,
    `Too many ${budget.what}: at most ${budget.limit} in ${budget.windowSeconds} s. Try again in ${wait < 120 ? `${wait} s` : `${Math.ceil(wait / 60)} min`}.`,
    wait,
  );
}
