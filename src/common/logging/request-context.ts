import { AsyncLocalStorage } from 'node:async_hooks';
import { randomUUID } from 'node:crypto';
import type { NextFunction, Request, Response } from 'express';

interface RequestContext {
  requestId: string;
}

const storage = new AsyncLocalStorage<RequestContext>();

export function currentRequestId(): string | undefined {
  return storage.getStore()?.requestId;
}

const INCOMING_ID = /^[A-Za-z0-9._-]{1,64}$/;

/**
 * Express middleware: gives every request an id (the client's `X-Request-Id` when it is sane), echoes it
 * back, and logs one line per request when the response ends.
 */
export function requestContext(log: (line: string) => void) {
  return (req: Request, res: Response, next: NextFunction): void => {
    const incoming = req.header('x-request-id');
    const requestId = incoming && INCOMING_ID.test(incoming) ? incoming : randomUUID();
    res.setHeader('X-Request-Id', requestId);
    const started = process.hrtime.bigint();
    res.on('finish', () => {
      const ms = Number(process.hrtime.bigint() - started) / 1e6;
      storage.run({ requestId }, () => log(`${req.method} ${req.originalUrl} ${res.statusCode} ${ms.toFixed(1)} ms`));
    });
    storage.run({ requestId }, next);
  };
}
