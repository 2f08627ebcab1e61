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

/**
 * Which repair orders a caller may see: the shop's, and for a technician only the ones they opened or are
 * assigned to. Anything outside it is answered as not found.
 */
export interface OrderScope {
  shopId: string;
  /** Set for technicians: their own and assigned orders only. */
  technicianId?: string;
}

export function orderScope(actor: Actor): OrderScope {
  return actor.role === 'technician' ? { shopId: actor.shopId, technicianId: actor.userId } : { shopId: actor.shopId };
}

export const CurrentActor = createParamDecorator((_: unknown, ctx: ExecutionContext): Actor => {
  const actor = ctx.switchToHttp().getRequest<RequestWithActor>().actor;
  if (!actor) throw new Error('CurrentActor used on a route without the actor guard');
  return actor;
});
