import { Injectable } from '@nestjs/common';
import { DomainException } from '../../common/errors/domain.exception';
import type { Db } from '../../common/database/database.tokens';
import type { Actor } from '../identity/actor';
import type { SetOrderNumbering } from './order-numbering.dto';
import { formatOrderNumber, OrderNumberingRepository, type NumberingRow } from './order-numbering.repository';

/** Numbers typed by hand that an automatic number may run into before the opening gives up (503). */
const MAX_SKIPS = 100;

const view = (row: NumberingRow) => ({ ...row, nextNumber: formatOrderNumber(row.prefix, row.width, row.next) });

@Injectable()
export class OrderNumberingService {
  constructor(private readonly numbering: OrderNumberingRepository) {}

  /** The next automatic number, taken inside the opening's transaction; numbers already typed by hand are skipped. */
  async take(shopId: string, db: Db): Promise<string> {
    for (let skipped = 0; skipped <= MAX_SKIPS; skipped++) {
      const { number, used } = await this.numbering.take(shopId, db);
      if (!used) return number;
    }
    throw new DomainException('conflict', 'repair_order.numbering_exhausted', `The next ${MAX_SKIPS} automatic numbers are all taken by typed ones; set the numbering further on (PUT /api/shop/order-numbering).`);
  }

  async get(actor: Actor) {
    return view(await this.numbering.get(actor.shopId));
  }

  async set(actor: Actor, input: SetOrderNumbering) {
    if (actor.role === 'technician') {
      throw new DomainException('forbidden', 'order_numbering.foreman_only', 'Only a foreman (or an admin) sets how repair orders are numbered.');
    }
    return this.numbering.transaction(async (tx) => {
      await this.numbering.set(actor.shopId, input, tx);
      return view(await this.numbering.get(actor.shopId, tx));
    });
  }
}
