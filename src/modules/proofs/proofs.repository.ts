import { Injectable } from '@nestjs/common';
import { PrismaRepository } from '../../common/database/prisma-repository';
import type { Prisma } from '../../generated/prisma/client';

@Injectable()
export class ProofsRepository extends PrismaRepository {
  /** Remembers what an issued document stated; the same digest twice is stored once. */
  async remember(repairOrderId: string, digest: string, view: object, issuedById: string): Promise<void> {
    await this.prisma.proofIssue.createMany({ data: [{ repairOrderId, digest, view: view as Prisma.InputJsonValue, issuedById }], skipDuplicates: true });
  }

  /** An issued document of the shop, by digest. */
  findIssued(shopId: string, digest: string) {
    return this.prisma.proofIssue.findFirst({
      where: { digest, repairOrder: { shopId } },
      select: { repairOrderId: true, digest: true, view: true, issuedAt: true, issuedBy: { select: { id: true, name: true } } },
      orderBy: { issuedAt: 'asc' },
    });
  }

  /** The name of a foreman of the shop, for a proof nobody has reviewed yet. */
  async foremanName(shopId: string): Promise<string | null> {
    const foreman = await this.prisma.user.findFirst({ where: { shopId, role: 'foreman', active: true }, orderBy: { name: 'asc' }, select: { name: true } });
    return foreman?.name ?? null;
  }
}
