import { CanActivate, ExecutionContext, Inject, Injectable, SetMetadata } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import { z } from 'zod';
import { DomainException } from '../../common/errors/domain.exception';
import { ACTOR_HEADER, type RequestWithActor } from './actor';
import { UsersRepository } from './users.repository';

const PUBLIC = Symbol('public-route');
/** Marks a route that needs no actor (health, documentation). */
export const PublicRoute = () => SetMetadata(PUBLIC, true);

const UserId = z.uuid();

/** The bay pages remember who is at the tablet in this cookie; API clients send the header instead. */
export const ACTOR_COOKIE = 'tracebay_user';

function actorCookie(cookieHeader: string | undefined): string | undefined {
  for (const part of cookieHeader?.split(';') ?? []) {
    const [name, ...value] = part.trim().split('=');
    if (name === ACTOR_COOKIE) return decodeURIComponent(value.join('='));
  }
  return undefined;
}

/**
 * Identifies the caller from the `X-Tracebay-User` header (a user id), or for the pages the `tracebay_user`
 * cookie. Sign-in replaces the header with
 * sessions and tokens; until then this still makes every write record who did it and scopes every query
 * to that user's shop.
 */
@Injectable()
export class ActorGuard implements CanActivate {
  constructor(
    private readonly reflector: Reflector,
    @Inject(UsersRepository) private readonly users: UsersRepository,
  ) {}

  async canActivate(context: ExecutionContext): Promise<boolean> {
    if (this.reflector.getAllAndOverride<boolean>(PUBLIC, [context.getHandler(), context.getClass()])) return true;
    const request = context.switchToHttp().getRequest<RequestWithActor>();
    const header = request.header(ACTOR_HEADER) ?? actorCookie(request.header('cookie'));
    const finding = (message: string) =>
      new DomainException('unauthenticated', 'actor.missing', message, [
        { code: 'actor.invalid', path: `headers.${ACTOR_HEADER}`, message },
      ]);
    if (!header) throw finding('Every request names its user in the X-Tracebay-User header (a user id).');
    if (!UserId.safeParse(header).success) throw finding('X-Tracebay-User must be a user id (UUID).');
    const user = await this.users.findActive(header);
    if (!user) throw finding('X-Tracebay-User names no active user.');
    request.actor = { userId: user.id, shopId: user.shopId, name: user.name, role: user.role };
    return true;
  }
}
