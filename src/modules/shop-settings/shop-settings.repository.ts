import { Injectable } from '@nestjs/common';
import type { Db } from '../../common/database/database.tokens';
import { PrismaRepository } from '../../common/database/prisma-repository';
import type { Prisma } from '../../generated/prisma/client';

const SELECT = { id: true, name: true, address: true, paperSize: true, timeZone: true, publicProofCheck: true } satisfies Prisma.ShopSelect;
export type ShopSettingsRow = Prisma.ShopGetPayload<{ select: typeof SELECT }>;

@Injectable()
export class ShopSettingsRepository extends PrismaRepository {
  find(shopId: string, db: Db = this.prisma): Promise<ShopSettingsRow | null> {
    return db.shop.findUnique({ where: { id: shopId }, select: SELECT });
  }

  update(db: Db, shopId: string, data: Prisma.ShopUpdateInput): Promise<ShopSettingsRow> {
    return db.shop.update({ where: { id: shopId }, data, select: SELECT });
  }
}
