import { Inject, Injectable } from '@nestjs/common';
import { DATABASE, type Db, type OpenDatabase } from '../../common/database/database.tokens';

@Injectable()
export class UsersRepository {
  private readonly db: Db;

  constructor(@Inject(DATABASE) database: OpenDatabase) {
    this.db = database.prisma;
  }

  findActive(id: string) {
    return this.db.user.findFirst({ where: { id, active: true }, select: { id: true, shopId: true, name: true, role: true } });
  }

  findInShop(shopId: string, id: string, db: Db = this.db) {
    return db.user.findFirst({ where: { id, shopId }, select: { id: true, name: true, role: true, active: true } });
  }

  listInShop(shopId: string) {
    return this.db.user.findMany({
      where: { shopId },
      orderBy: [{ role: 'asc' }, { name: 'asc' }],
      select: { id: true, name: true, email: true, role: true, active: true },
    });
  }

  shop(shopId: string) {
    return this.db.shop.findUniqueOrThrow({ where: { id: shopId }, select: { id: true, name: true, address: true } });
  }
}
