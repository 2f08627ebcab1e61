import { createParamDecorator, type ExecutionContext } from '@nestjs/common';
import type { Request } from 'express';

/** Who is calling: every write records it, and every query is scoped to the actor's shop. */
export interface Actor {
  userId: string;
  shopId: string;
  name: string;
  role: 'technician' | 'foreman' | 'admin';
}

export type RequestWithActor = Request & { actor?: Actor };

export const CurrentActor = createParamDecorator((_: unknown, ctx: ExecutionContext): Actor => {
  const actor = ctx.switchToHttp().getRequest<RequestWithActor>().actor;
  if (!actor) throw new Error('CurrentActor used on a route without the actor guard');
  return actor;
});
