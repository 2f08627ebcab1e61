import { ArgumentsHost, Catch, ExceptionFilter, HttpException, Logger } from '@nestjs/common';
import type { Request, Response } from 'express';
import { DomainException, type ErrorKind } from './domain.exception';
import { messageFor } from './not-found-wording';
import { notFoundPage } from './not-found-page';
import { currentRequestId } from '../logging/request-context';
import { isDatabaseUnavailable, isDataRejected } from '../../database/unavailable';

/** The one mapping from error kinds to HTTP statuses (pages render the same statuses as HTML). */
/** The Retry-After of a 429: the whole seconds its exception named, at least 1. */
export function retryAfter(seconds: unknown): string {
  return String(Math.max(1, Math.ceil(Number(seconds) || 1)));
}

export const HTTP_STATUS: Readonly<Record<ErrorKind, number>> = {
  invalid: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  unprocessable: 422,
  too_many_requests: 429,
  unavailable: 503,
};

interface ErrorBody {
  error: { code: string; message: string; requestId?: string; findings?: unknown[]; [k: string]: unknown };
}

/** The one place where errors become HTTP responses. Unknown errors are logged and never leak details. */
@Catch()
export class HttpErrorFilter implements ExceptionFilter {
  private readonly logger = new Logger('http');

  catch(error: unknown, host: ArgumentsHost): void {
    const response = host.switchToHttp().getResponse<Response>();
    const request = host.switchToHttp().getRequest<Request & { actor?: { role?: string } }>();
    const page = error instanceof HttpException && error.getStatus() === 404 ? notFoundPage(request) : null;
    if (page !== null) {
      response.status(404).type('html').send(page);
      return;
    }
    const reader = request.actor;
    const [status, body] = this.toResponse(error, reader);
    body.error.requestId = currentRequestId();
    // An unreachable database is an outage, not a bug: one line per request, not a stack.
    if (status === 503) this.logger.warn(`${body.error.code}: ${error instanceof Error ? error.message.trim().split('\n').pop() : String(error)}`);
    else if (status >= 500) this.logger.error(error instanceof Error ? (error.stack ?? error.message) : String(error));
    if (status === 503) response.setHeader('Retry-After', '2');
    if (status === 429) response.setHeader('Retry-After', retryAfter(body.error.retryAfterSeconds));
    response.status(status).json(body);
  }

  private toResponse(error: unknown, reader?: { role?: string }): [number, ErrorBody] {
    if (error instanceof DomainException) {
      return [
        HTTP_STATUS[error.kind],
        {
          error: {
            code: error.code,
            message: messageFor(error, reader),
            ...(error.findings.length ? { findings: error.findings } : {}),
            ...error.details,
          },
        },
      ];
    }
    if (error instanceof HttpException) return this.fromHttpException(error);
    if (isDatabaseUnavailable(error)) {
      return [503, { error: { code: 'database.unavailable', message: 'The database is not reachable; try again shortly.' } }];
    }
    if (isDataRejected(error)) {
      // Bad input, not a fault of ours: a warning (validation should still refuse it first).
      this.logger.warn(`Input refused by the database, not by validation: ${error instanceof Error ? error.message.trim().split('\n').pop() : String(error)}`);
      return [400, { error: { code: 'input.not_storable', message: 'A value in the request cannot be stored (for example a NUL character in text, or a number out of range).' } }];
    }
    return [500, { error: { code: 'internal', message: 'Something went wrong on our side; the request id identifies it in the log.' } }];
  }

  /** Framework-raised errors: body-parser (bad JSON, too large), unknown routes. */
  private fromHttpException(error: HttpException): [number, ErrorBody] {
    const status = error.getStatus();
    const cause = error.cause as { type?: string } | undefined;
    if (status === 413 || cause?.type === 'entity.too.large') {
      return [413, { error: { code: 'body.too_large', message: 'The request body is larger than this service accepts.' } }];
    }
    if (status === 404) {
      return [404, { error: { code: 'route.not_found', message: 'No such endpoint; see /api/docs.' } }];
    }
    const message = typeof error.getResponse() === 'string' ? String(error.getResponse()) : error.message;
    return [status, { error: { code: status === 400 ? 'body.malformed' : `http.${status}`, message } }];
  }
}
