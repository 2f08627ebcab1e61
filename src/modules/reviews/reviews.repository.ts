import { Inject, Injectable } from '@nestjs/common';
import { DATABASE, type Db, type OpenDatabase } from '../../common/database/database.tokens';
import type { Prisma } from '../../generated/prisma/client';

const include = { by: { select: { id: true, name: true } } } satisfies Prisma.ReviewInclude;
export type ReviewRow = Prisma.ReviewGetPayload<{ include: typeof include }>;

@Injectable()
export class ReviewsRepository {
  readonly prisma;

  constructor(@Inject(DATABASE) database: OpenDatabase) {
    this.prisma = database.prisma;
  }

  transaction<T>(work: (tx: Prisma.TransactionClient) => Promise<T>): Promise<T> {
    return this.prisma.$transaction(work);
  }

  create(db: Db, data: Prisma.ReviewUncheckedCreateInput): Promise<ReviewRow> {
    return db.review.create({ data, include });
  }

  listForOrder(repairOrderId: string, db: Db = this.prisma): Promise<ReviewRow[]> {
    return db.review.findMany({ where: { repairOrderId }, include, orderBy: [{ at: 'asc' }, { seq: 'asc' }] });
  }
}
