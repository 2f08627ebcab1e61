import { AsyncLocalStorage } from 'node:async_hooks';
import { randomUUID } from 'node:crypto';
import type { NextFunction, Request, Response } from 'express';

/** Where a request came from, as recorded in the audit trail. */
export interface RequestClient {
  ip: string | null;
  userAgent: string | null;
  /** The tablet's or script's own id, from the `X-Tracebay-Client` header when sent. */
  clientId: string | null;
}

interface RequestContext {
  /** Always the server's own: the audit trail stores it, so a client cannot write someone else's id there. */
  requestId: string;
  /** The client's `X-Request-Id` when sane, logged beside ours to join the two logs; never stored as the id. */
  clientRequestId?: string;
  client?: RequestClient;
  /** Set once the caller is known (after authentication). */
  actor?: { userId: string; shopId: string };
  /** The idempotency record this request's writes belong to, if it carries a key. */
  idempotencyId?: string;
}

const storage = new AsyncLocalStorage<RequestContext>();

export function currentRequestId(): string | undefined {
  return storage.getStore()?.requestId;
}

/** Who, from where and under which idempotency record the current request writes; undefined outside a request. */
export function currentWriteContext(): Readonly<RequestContext> | undefined {
  return storage.getStore();
}

/** Records the authenticated caller on the current request, for the audit trail. */
export function setContextActor(actor: { userId: string; shopId: string }): void {
  const store = storage.getStore();
  if (store) store.actor = { userId: actor.userId, shopId: actor.shopId };
}

export function setContextIdempotency(id: string | undefined): void {
  const store = storage.getStore();
  if (store) store.idempotencyId = id;
}

const INCOMING_ID = /^[A-Za-z0-9._-]{1,64}$/;
export const CLIENT_ID_HEADER = 'x-tracebay-client';

export function currentClientRequestId(): string | undefined {
  return storage.getStore()?.clientRequestId;
}

/**
 * Express middleware: gives every request the server's own id (answered in `X-Request-Id`), keeps the client's
 * `X-Request-Id` beside it when sane (answered in `X-Client-Request-Id`), and logs one line per request when the
 * response ends.
 */
export function requestContext(log: (line: string) => void) {
  return (req: Request, res: Response, next: NextFunction): void => {
    const incoming = req.header('x-request-id');
    const clientRequestId = incoming && INCOMING_ID.test(incoming) ? incoming : undefined;
    const requestId = randomUUID();
    res.setHeader('X-Request-Id', requestId);
    if (clientRequestId) res.setHeader('X-Client-Request-Id', clientRequestId);
    const clientId = req.header(CLIENT_ID_HEADER);
    const client: RequestClient = {
      ip: req.ip ?? req.socket.remoteAddress ?? null,
      userAgent: req.header('user-agent')?.slice(0, 512) ?? null,
      clientId: clientId && INCOMING_ID.test(clientId) ? clientId : null,
    };
    const started = process.hrtime.bigint();
    res.on('finish', () => {
      const ms = Number(process.hrtime.bigint() - started) / 1e6;
      const theirs = clientRequestId ? ` client-request-id=${clientRequestId}` : '';
      storage.run({ requestId }, () => log(`${req.method} ${req.originalUrl} ${res.statusCode} ${ms.toFixed(1)} ms${theirs}`));
    });
    storage.run({ requestId, clientRequestId, client }, next);
  };
}
