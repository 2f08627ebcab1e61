import { Injectable } from '@nestjs/common';
import { PrismaRepository } from '../../common/database/prisma-repository';

/**
 * Fixed-window counters in the database, so every instance draws on the same budget. Counting is one
 * INSERT … ON CONFLICT DO UPDATE, atomic under concurrency; the window is cut by the database clock.
 */
@Injectable()
export class RateLimitsRepository extends PrismaRepository {
  /** Counts one request in `bucket`'s current window: the count so far and the seconds until the window ends. */
  async hit(bucket: string, windowSeconds: number): Promise<{ hits: number; resetSeconds: number }> {
    const rows = await this.prisma.$queryRaw<{ hits: number; resetSeconds: number }[]>`
      WITH w AS (
        SELECT to_timestamp(floor(EXTRACT(EPOCH FROM clock_timestamp()) / ${windowSeconds}::int) * ${windowSeconds}::int) AS start
      )
      INSERT INTO "RateLimitHit" ("bucket", "windowStart", "hits")
      SELECT ${bucket}, w.start, 1 FROM w
      ON CONFLICT ("bucket", "windowStart") DO UPDATE SET "hits" = "RateLimitHit"."hits" + 1
      RETURNING "hits",
        EXTRACT(EPOCH FROM ("windowStart" + make_interval(secs => ${windowSeconds}::int) - clock_timestamp()))::float8 AS "resetSeconds"`;
    const row = rows[0]!;
    return { hits: Number(row.hits), resetSeconds: Number(row.resetSeconds) };
  }

  /** Drops windows that ended more than a day ago. */
  async purgeOld(): Promise<void> {
    await this.prisma.$executeRaw`DELETE FROM "RateLimitHit" WHERE "windowStart" < CURRENT_TIMESTAMP - INTERVAL '1 day'`;
  }
}
