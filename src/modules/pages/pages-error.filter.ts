import { ArgumentsHost, Catch, ExceptionFilter, HttpException, Logger } from '@nestjs/common';
import type { Response } from 'express';
import { DomainException } from '../../common/errors/domain.exception';
import { HTTP_STATUS, retryAfter } from '../../common/errors/http-error.filter';
import { messageFor } from '../../common/errors/not-found-wording';
import type { RequestWithActor } from '../identity/actor';
import { SESSION_COOKIE } from '../auth/credentials';
import { errorPage } from './layout.view';


/**
 * Errors on page routes become pages, not JSON: not signed in (or signed out, expired, deactivated) goes to the
 * sign-in page; anything else is shown in the page shell with the service's own message.
 */
@Catch()
export class PagesErrorFilter implements ExceptionFilter {
  private readonly logger = new Logger('pages');

  catch(error: unknown, host: ArgumentsHost): void {
    const request = host.switchToHttp().getRequest<RequestWithActor>();
    const response = host.switchToHttp().getResponse<Response>();
    if (error instanceof DomainException && error.kind === 'unauthenticated') {
      if (request.header('cookie')?.includes(`${SESSION_COOKIE}=`)) response.clearCookie(SESSION_COOKIE, { path: '/' });
      const next = request.method === 'GET' && request.originalUrl !== '/' ? `?next=${encodeURIComponent(request.originalUrl)}` : '';
      response.redirect(303, `/sign-in${next}`);
      return;
    }
    let status = 500;
    let message = 'Something went wrong on our side. Try again; if it keeps happening, tell the shop admin.';
    if (error instanceof DomainException) {
      status = HTTP_STATUS[error.kind];
      message = messageFor(error, request.actor);
      if (status === 429) response.setHeader('Retry-After', retryAfter(error.details.retryAfterSeconds));
    } else if (error instanceof HttpException) {
      status = error.getStatus();
      message = status === 404 ? 'There is no such page.' : error.message;
    } else {
      this.logger.error(error instanceof Error ? (error.stack ?? error.message) : String(error));
    }
    response.status(status).type('html').send(errorPage(status, message, request.actor).value);
  }
}
