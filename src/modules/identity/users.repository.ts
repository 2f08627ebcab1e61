import { Injectable } from '@nestjs/common';
import type { Db } from '../../common/database/database.tokens';
import { PrismaRepository } from '../../common/database/prisma-repository';

@Injectable()
export class UsersRepository extends PrismaRepository {
  findInShop(shopId: string, id: string, db: Db = this.prisma) {
    return db.user.findFirst({ where: { id, shopId }, select: { id: true, name: true, role: true, active: true } });
  }

  listInShop(shopId: string) {
    return this.prisma.user.findMany({
      where: { shopId },
      orderBy: [{ role: 'asc' }, { name: 'asc' }],
      select: { id: true, name: true, email: true, role: true, active: true },
    });
  }

  shop(shopId: string) {
    return this.prisma.shop.findUniqueOrThrow({ where: { id: shopId }, select: { id: true, name: true, address: true } });
  }

  emailTaken(email: string) {
    return this.prisma.user.findUnique({ where: { email }, select: { id: true } }).then((u) => u !== null);
  }

  create(shopId: string, data: { name: string; email: string; role: 'technician' | 'foreman' | 'admin'; passwordHash: string }) {
    return this.prisma.user.create({ data: { ...data, shopId }, select: { id: true, name: true, email: true, role: true, active: true } });
  }

  /** Deactivates and ends every session and token of the person, in one transaction. */
  deactivate(id: string) {
    return this.transaction(async (tx) => {
      await tx.signIn.updateMany({ where: { userId: id, revokedAt: null }, data: { revokedAt: new Date() } });
      return tx.user.update({ where: { id }, data: { active: false }, select: { id: true, name: true, email: true, role: true, active: true } });
    });
  }
}
