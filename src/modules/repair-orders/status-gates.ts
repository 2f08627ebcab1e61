import { Injectable } from '@nestjs/common';
import type { RepairOrderStatus } from '../../generated/prisma/client';
import type { Actor } from '../identity/actor';

export interface GatedOrder {
  id: string;
  number: string;
  status: RepairOrderStatus;
  version: number;
}

/** A condition a status move must meet beyond the status machine; throws a domain exception when it is not met. */
export type StatusGate = (actor: Actor, order: GatedOrder, to: RepairOrderStatus) => Promise<void>;

/**
 * Conditions other modules put on status moves (the evidence a proof needs before "verified" and "closed"),
 * registered at start-up, so that this module does not depend on theirs.
 */
@Injectable()
export class StatusGates {
  private readonly gates: StatusGate[] = [];

  register(gate: StatusGate): void {
    this.gates.push(gate);
  }

  async check(actor: Actor, order: GatedOrder, to: RepairOrderStatus): Promise<void> {
    for (const gate of this.gates) await gate(actor, order, to);
  }
}
