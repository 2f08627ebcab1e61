import { Injectable } from '@nestjs/common';
import { randomUUID } from 'node:crypto';
import { PrismaRepository } from '../../common/database/prisma-repository';

export interface StoredKey {
  id: string;
  requestHash: string;
  state: 'in_progress' | 'done' | 'interrupted';
  status: number | null;
  responseBody: string | null;
  committed: boolean;
  /** Seconds since the first request claimed the key (by the database clock, shared by every instance). */
  ageSeconds: number;
}

interface Claim {
  shopId: string;
  userId: string;
  key: string;
  requestHash: string;
  method: string;
  path: string;
  keepHours: number;
}

/**
 * The idempotency records. Claiming is one INSERT … ON CONFLICT DO NOTHING, so of two requests with the same
 * key (on any instance) exactly one claims it.
 */
@Injectable()
export class IdempotencyRepository extends PrismaRepository {
  /** Claims the key: its new record id, or null when a live record holds the key already. */
  async claim(c: Claim): Promise<string | null> {
    // A record past its keeping time no longer holds the key.
    await this.prisma.$executeRaw`DELETE FROM "IdempotencyKey" WHERE "shopId" = ${c.shopId}::uuid AND "userId" = ${c.userId}::uuid AND "key" = ${c.key} AND "expiresAt" < CURRENT_TIMESTAMP`;
    const rows = await this.prisma.$queryRaw<{ id: string }[]>`
      INSERT INTO "IdempotencyKey" ("id", "shopId", "userId", "key", "requestHash", "method", "path", "state", "expiresAt")
      VALUES (${randomUUID()}::uuid, ${c.shopId}::uuid, ${c.userId}::uuid, ${c.key}, ${c.requestHash}, ${c.method}, ${c.path}, 'in_progress',
              CURRENT_TIMESTAMP + make_interval(secs => ${c.keepHours * 3600}))
      ON CONFLICT ("shopId", "userId", "key") DO NOTHING
      RETURNING "id"::text AS "id"`;
    return rows[0]?.id ?? null;
  }

  async find(shopId: string, userId: string, key: string): Promise<StoredKey | null> {
    const rows = await this.prisma.$queryRaw<(Omit<StoredKey, 'committed' | 'ageSeconds'> & { committedAt: Date | null; ageSeconds: number })[]>`
      SELECT "id"::text AS "id", "requestHash", "state", "status", "responseBody", "committedAt",
             EXTRACT(EPOCH FROM (CURRENT_TIMESTAMP - "createdAt"))::float8 AS "ageSeconds"
      FROM "IdempotencyKey" WHERE "shopId" = ${shopId}::uuid AND "userId" = ${userId}::uuid AND "key" = ${key}`;
    const row = rows[0];
    if (!row) return null;
    const { committedAt, ...rest } = row;
    return { ...rest, committed: committedAt !== null, ageSeconds: Number(row.ageSeconds) };
  }

  /**
   * Takes over a record whose first request never finished and never committed a write (its instance died):
   * compare-and-set on the claim time, so only one retry takes it.
   */
  async takeOver(id: string, olderThanSeconds: number): Promise<boolean> {
    const changed = await this.prisma.$executeRaw`
      UPDATE "IdempotencyKey" SET "createdAt" = CURRENT_TIMESTAMP
      WHERE "id" = ${id}::uuid AND "state" = 'in_progress' AND "committedAt" IS NULL
        AND "createdAt" < CURRENT_TIMESTAMP - make_interval(secs => ${olderThanSeconds})`;
    return changed === 1;
  }

  async complete(id: string, status: number, responseBody: string): Promise<void> {
    await this.prisma.$executeRaw`UPDATE "IdempotencyKey" SET "state" = 'done', "status" = ${status}, "responseBody" = ${responseBody} WHERE "id" = ${id}::uuid`;
  }

  /**
   * The first request failed. If it wrote nothing the key is freed for a retry; if a write of it committed
   * first, the record stays, marked interrupted, so a retry cannot write again.
   */
  async fail(id: string): Promise<void> {
    await this.prisma.$executeRaw`DELETE FROM "IdempotencyKey" WHERE "id" = ${id}::uuid AND "committedAt" IS NULL`;
    await this.prisma.$executeRaw`UPDATE "IdempotencyKey" SET "state" = 'interrupted' WHERE "id" = ${id}::uuid`;
  }

  /** Drops records past their keeping time (now and then, from any instance). */
  async purgeExpired(): Promise<void> {
    await this.prisma.$executeRaw`DELETE FROM "IdempotencyKey" WHERE "expiresAt" < CURRENT_TIMESTAMP`;
  }
}
