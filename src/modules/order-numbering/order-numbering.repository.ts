import { Injectable } from '@nestjs/common';
import type { Db } from '../../common/database/database.tokens';
import { PrismaRepository } from '../../common/database/prisma-repository';

export interface NumberingRow {
  prefix: string;
  width: number;
  next: number;
}

/** Prefix, then the digits zero-padded to the width and never cut when longer (the same rule as the SQL in `take`). */
export function formatOrderNumber(prefix: string, width: number, n: number): string {
  return prefix + String(n).padStart(width, '0');
}

@Injectable()
export class OrderNumberingRepository extends PrismaRepository {
  /**
   * Takes the shop's next automatic number in one statement (creating the shop's row with the defaults on its
   * first order), and says whether an order already has that number (typed by hand). The row stays locked until
   * the opening's transaction ends, so openings on every instance get distinct numbers.
   */
  async take(shopId: string, db: Db): Promise<{ number: string; used: boolean }> {
    const [row] = await db.$queryRaw<Array<{ number: string; used: boolean }>>`
      WITH taken AS (
        INSERT INTO "OrderNumbering" ("id", "shopId", "next") VALUES (gen_random_uuid(), ${shopId}::uuid, 2)
        ON CONFLICT ("shopId") DO UPDATE SET "next" = "OrderNumbering"."next" + 1
        RETURNING "prefix" || lpad(("next" - 1)::text, greatest("width", length(("next" - 1)::text)), '0') AS "number"
      )
      SELECT t."number", EXISTS (SELECT 1 FROM "RepairOrder" o WHERE o."shopId" = ${shopId}::uuid AND o."number" = t."number") AS "used"
      FROM taken t`;
    return row!;
  }

  async get(shopId: string, db: Db = this.prisma): Promise<NumberingRow> {
    const row = await db.orderNumbering.findUnique({ where: { shopId }, select: { prefix: true, width: true, next: true } });
    return row ? { ...row, next: Number(row.next) } : { prefix: 'RO-', width: 5, next: 1 };
  }

  async set(shopId: string, data: { prefix: string; width: number; next?: number }, db: Db): Promise<void> {
    const next = data.next === undefined ? undefined : BigInt(data.next);
    await db.orderNumbering.upsert({
      where: { shopId },
      create: { shopId, prefix: data.prefix, width: data.width, ...(next === undefined ? {} : { next }) },
      update: { prefix: data.prefix, width: data.width, ...(next === undefined ? {} : { next }) },
    });
  }
}
