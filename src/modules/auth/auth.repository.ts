import { Injectable } from '@nestjs/common';
import { PrismaRepository } from '../../common/database/prisma-repository';

const ACTOR_FIELDS = { id: true, shopId: true, name: true, role: true } as const;

@Injectable()
export class AuthRepository extends PrismaRepository {
  userByEmail(email: string) {
    return this.prisma.user.findUnique({
      where: { email },
      select: { ...ACTOR_FIELDS, active: true, passwordHash: true, lockedUntil: true },
    });
  }

  /**
   * Counts a failed sign-in against the email: at `limit` consecutive failures the account locks until `lockUntil`
   * and the count restarts. One statement whatever the email names (an unknown one, an inactive or locked person
   * match no row), so a failure costs the same work whether or not the email exists.
   */
  async recordFailure(email: string, limit: number, lockUntil: Date, now: Date): Promise<void> {
    await this.prisma.$executeRaw`
      UPDATE "User" SET
        "failedSignIns" = CASE WHEN "failedSignIns" + 1 >= ${limit} THEN 0 ELSE "failedSignIns" + 1 END,
        "lockedUntil" = CASE WHEN "failedSignIns" + 1 >= ${limit} THEN ${lockUntil}::timestamptz ELSE "lockedUntil" END
      WHERE "email" = ${email} AND "active" AND ("lockedUntil" IS NULL OR "lockedUntil" <= ${now}::timestamptz)`;
  }

  recordSuccess(userId: string) {
    return this.prisma.user.update({ where: { id: userId }, data: { failedSignIns: 0, lockedUntil: null }, select: { id: true } });
  }

  createSignIn(data: { userId: string; kind: 'page' | 'api'; secretHash: string; client: string; expiresAt: Date }) {
    return this.prisma.signIn.create({ data, select: { id: true, expiresAt: true } });
  }

  /** The active user behind a live (unexpired, not revoked) session or token. */
  async actorFor(secretHash: string, now: Date) {
    const found = await this.prisma.signIn.findFirst({
      where: { secretHash, revokedAt: null, expiresAt: { gt: now }, user: { active: true } },
      select: { id: true, kind: true, expiresAt: true, user: { select: ACTOR_FIELDS } },
    });
    return found ?? null;
  }

  /** The person behind a sign-in known by id, while it is live and they are active; null otherwise. */
  liveSignIn(signInId: string, now: Date) {
    return this.prisma.user.findFirst({
      where: { active: true, signIns: { some: { id: signInId, revokedAt: null, expiresAt: { gt: now } } } },
      select: ACTOR_FIELDS,
    });
  }

  revoke(secretHash: string, now: Date) {
    return this.prisma.signIn.updateMany({ where: { secretHash, revokedAt: null }, data: { revokedAt: now } });
  }

}
