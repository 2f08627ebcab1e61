import { Injectable, type CallHandler, type ExecutionContext, type NestInterceptor } from '@nestjs/common';
import type { Observable } from 'rxjs';
import { setContextActor } from '../../common/logging/request-context';
import type { RequestWithActor } from '../identity/actor';

/** Once authentication has named the caller, the request context carries it to every transaction (and so to the trail). */
@Injectable()
export class AuditContextInterceptor implements NestInterceptor {
  intercept(context: ExecutionContext, next: CallHandler): Observable<unknown> {
    if (context.getType() === 'http') {
      const actor = context.switchToHttp().getRequest<RequestWithActor>().actor;
      if (actor) setContextActor(actor);
    }
    return next.handle();
  }
}
