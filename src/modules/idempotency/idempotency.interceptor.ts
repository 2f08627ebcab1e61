import { Inject, Injectable, type CallHandler, type ExecutionContext, type NestInterceptor } from '@nestjs/common';
import { WRITE_METHODS } from '../../common/http-methods';
import { createHash } from 'node:crypto';
import type { Request, Response } from 'express';
import { catchError, concatMap, from, of, type Observable } from 'rxjs';
import { APP_CONFIG, type AppConfig } from '../../config/config';
import { ConflictException, DomainException, InvalidInputException } from '../../common/errors/domain.exception';
import { setContextIdempotency } from '../../common/logging/request-context';
import type { RequestWithActor } from '../identity/actor';
import { IdempotencyRepository, type StoredKey } from './idempotency.repository';

export const IDEMPOTENCY_HEADER = 'idempotency-key';
/** Set on a response that is the stored answer to an earlier request with the same key. */
export const REPLAYED_HEADER = 'Idempotent-Replayed';

const KEY = /^[\x21-\x7e]{1,255}$/;
/** A first request silent for this long, with no write committed, is taken to have died with its instance. */
const ABANDONED_AFTER_SECONDS = 120;
const POLL_MS = 50;

/** SHA-256 of method, path (with query) and body: what "the same request" means for a key. */
export function requestHash(req: Request): string {
  const body = Buffer.isBuffer(req.body) ? req.body : Buffer.from(req.body === undefined ? '' : JSON.stringify(req.body), 'utf8');
  return createHash('sha256').update(`${req.method}\n${req.originalUrl}\n`).update(body).digest('hex');
}

/**
 * Writes sent with an `Idempotency-Key` run once per (shop, user, key): the first response is stored and a retry
 * gets it back (`Idempotent-Replayed: true`) without running again; the same key on another request is refused
 * (422); a duplicate arriving while the first still runs waits for it, then gets 409 (the status codes of the IETF
 * httpapi draft "The Idempotency-Key HTTP Header Field"). The records live in the database, so this holds across
 * instances.
 */
@Injectable()
export class IdempotencyInterceptor implements NestInterceptor {
  constructor(
    private readonly keys: IdempotencyRepository,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  async intercept(context: ExecutionContext, next: CallHandler): Promise<Observable<unknown>> {
    if (context.getType() !== 'http') return next.handle();
    const req = context.switchToHttp().getRequest<RequestWithActor>();
    const res = context.switchToHttp().getResponse<Response>();
    const key = req.header(IDEMPOTENCY_HEADER);
    // Keys are per user: a route anyone may call (sign-in) has nobody to keep them for.
    if (!WRITE_METHODS.has(req.method) || key === undefined || !req.actor) return next.handle();
    if (!KEY.test(key)) {
      throw new InvalidInputException([
        { code: 'idempotency.key_invalid', path: `headers.${IDEMPOTENCY_HEADER}`, message: 'expected 1 to 255 visible ASCII characters' },
      ]);
    }
    const claim = {
      shopId: req.actor.shopId,
      userId: req.actor.userId,
      key,
      requestHash: requestHash(req),
      method: req.method,
      path: req.originalUrl,
      keepHours: this.config.idempotency.keepHours,
    };
    if (Math.random() < 0.01) void this.keys.purgeExpired().catch(() => {});

    const deadline = Date.now() + this.config.idempotency.waitMs;
    for (;;) {
      const id = await this.keys.claim(claim);
      if (id) return this.runFirst(id, res, next);
      const stored = await this.keys.find(claim.shopId, claim.userId, key);
      if (!stored) continue; // expired or freed between the two statements: claim again
      if (stored.requestHash !== claim.requestHash) {
        throw new DomainException(
          'unprocessable',
          'idempotency.key_reused',
          `Idempotency-Key "${key}" was first used for another request (${stored.state === 'done' ? 'answered' : 'still running'}); send a new key for a new request.`,
          [{ code: 'idempotency.key_reused', path: `headers.${IDEMPOTENCY_HEADER}`, message: 'already used with a different method, path or body' }],
        );
      }
      if (stored.state === 'done') return of(this.replay(stored, res));
      if (stored.state === 'interrupted') throw interrupted(key);
      if (stored.ageSeconds > ABANDONED_AFTER_SECONDS) {
        if (stored.committed) throw interrupted(key);
        if (await this.keys.takeOver(stored.id, ABANDONED_AFTER_SECONDS)) return this.runFirst(stored.id, res, next);
        continue;
      }
      if (Date.now() >= deadline) {
        throw new ConflictException('idempotency.in_progress', `A request with Idempotency-Key "${key}" is still running; retry shortly to get its result.`, {
          retryAfterSeconds: 1,
        });
      }
      await new Promise((r) => setTimeout(r, POLL_MS));
    }
  }

  /** Runs the handler as the key's first request; its writes mark the record committed in their own transaction. */
  private runFirst(id: string, res: Response, next: CallHandler): Observable<unknown> {
    setContextIdempotency(id);
    return next.handle().pipe(
      concatMap((value) => {
        const body = storable(value);
        if (body === undefined) return from(this.keys.fail(id).then(() => value));
        return from(this.keys.complete(id, res.statusCode, body).then(() => value));
      }),
      // The request's own error is the answer, even if releasing the key fails too (the database went away).
      catchError((error: unknown) => from(this.keys.fail(id).then(() => Promise.reject(error), () => Promise.reject(error)))),
    );
  }

  private replay(stored: StoredKey, res: Response): unknown {
    res.status(stored.status ?? 200);
    res.setHeader(REPLAYED_HEADER, 'true');
    return stored.responseBody === null || stored.responseBody === '' ? undefined : JSON.parse(stored.responseBody);
  }
}

function interrupted(key: string): DomainException {
  return new ConflictException(
    'idempotency.interrupted',
    `The first request with Idempotency-Key "${key}" wrote its change and then failed before answering; reload the record instead of retrying.`,
  );
}

/** JSON text of a plain result; undefined for what cannot be stored and replayed (files, streams). */
function storable(value: unknown): string | undefined {
  if (value === undefined || value === null) return '';
  if (Buffer.isBuffer(value) || typeof (value as { pipe?: unknown }).pipe === 'function' || typeof (value as { getStream?: unknown }).getStream === 'function') {
    return undefined;
  }
  return JSON.stringify(value);
}
