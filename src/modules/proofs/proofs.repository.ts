import { Injectable } from '@nestjs/common';
import { PrismaRepository } from '../../common/database/prisma-repository';
import type { Prisma } from '../../generated/prisma/client';

const ISSUED = {
  repairOrderId: true,
  digest: true,
  view: true,
  issuedAt: true,
  issuedBy: { select: { id: true, name: true } },
  repairOrder: { select: { shopId: true, shop: { select: { name: true, timeZone: true, publicProofCheck: true } } } },
} satisfies Prisma.ProofIssueSelect;

@Injectable()
export class ProofsRepository extends PrismaRepository {
  /** Remembers what an issued document stated and its file's hash; the same file twice is stored once. */
  async remember(repairOrderId: string, digest: string, fileSha256: string, view: object, issuedById: string): Promise<void> {
    // In a transaction like every write, so the audit trail records who issued it and from where.
    await this.transaction((tx) =>
      tx.proofIssue.createMany({ data: [{ repairOrderId, digest, fileSha256, view: view as Prisma.InputJsonValue, issuedById }], skipDuplicates: true }),
    );
  }

  /** An issued document of the shop (or of any shop, for the public check), by evidence digest or by the hash of its file. */
  findIssued(shopId: string | null, by: { digest: string } | { fileSha256: string }) {
    return this.prisma.proofIssue.findFirst({
      where: { ...by, ...(shopId ? { repairOrder: { shopId } } : {}) },
      select: ISSUED,
      orderBy: { issuedAt: 'asc' },
    });
  }
}
