import { Injectable } from '@nestjs/common';
import type { Db } from '../../common/database/database.tokens';
import { PrismaRepository } from '../../common/database/prisma-repository';
import type { CircuitKind, Prisma } from '../../generated/prisma/client';

const summary = {
  id: true,
  shopId: true,
  treeId: true,
  version: true,
  circuitKind: true,
  label: true,
  createdAt: true,
  createdBy: { select: { id: true, name: true } },
} satisfies Prisma.FaultTreeSelect;

@Injectable()
export class FaultTreesRepository extends PrismaRepository {
  /** The stored row of a tree version; created once (a tree version is never changed). */
  async ensure(
    db: Db,
    data: { shopId: string | null; treeId: string; version: string; circuitKind: CircuitKind; label: string; document: object; createdById: string | null },
  ) {
    const where = { shopId: data.shopId, treeId: data.treeId, version: data.version };
    // Insert-if-absent in one statement, so two requests binding the same version at once both succeed.
    const { count } = await db.faultTree.createMany({ data: [data], skipDuplicates: true });
    return { row: (await db.faultTree.findFirst({ where, select: summary }))!, created: count === 1 };
  }

  /** The shop's own tree versions, newest first. */
  listForShop(shopId: string) {
    return this.prisma.faultTree.findMany({ where: { shopId }, select: summary, orderBy: [{ createdAt: 'desc' }, { id: 'asc' }] });
  }

  /** The newest version of a shop tree id. */
  latestForShop(shopId: string, treeId: string, db: Db = this.prisma) {
    return db.faultTree.findFirst({ where: { shopId, treeId }, select: summary, orderBy: [{ createdAt: 'desc' }, { id: 'asc' }] });
  }

  /** A stored version visible to the shop (its own or a built-in one), with the document. */
  findVisible(shopId: string, id: string, db: Db = this.prisma) {
    return db.faultTree.findFirst({ where: { id, OR: [{ shopId }, { shopId: null }] }, select: { ...summary, document: true } });
  }
}
