import { Injectable } from '@nestjs/common';
import type { Db } from '../../common/database/database.tokens';
import { PrismaRepository } from '../../common/database/prisma-repository';
import type { Prisma } from '../../generated/prisma/client';

const include = { by: { select: { id: true, name: true } } } satisfies Prisma.ReviewInclude;
export type ReviewRow = Prisma.ReviewGetPayload<{ include: typeof include }>;

@Injectable()
export class ReviewsRepository extends PrismaRepository {
  create(db: Db, data: Prisma.ReviewUncheckedCreateInput): Promise<ReviewRow> {
    return db.review.create({ data, include });
  }

  listForOrder(repairOrderId: string, db: Db = this.prisma): Promise<ReviewRow[]> {
    return db.review.findMany({ where: { repairOrderId }, include, orderBy: [{ at: 'asc' }, { seq: 'asc' }] });
  }
}
