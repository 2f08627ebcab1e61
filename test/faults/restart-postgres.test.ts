/**
 * PostgreSQL restarted during a burst of readings. While the server is down the service answers 503 with a
 * Retry-After hint (RFC 9110, 15.6.4 "503 Service Unavailable" and 10.2.3 "Retry-After"), never a 500 and never
 * silence; it reconnects by itself once the server is back, and every acknowledged reading is stored.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase } from '../../src/database';
import { seedShops, TECH_A } from '../support/fixtures';
import { burst, createOrderWithCircuit, tally, type Sent } from './burst';
import { startPrivatePostgres, type PrivatePostgres } from './private-postgres';
import { credentialsFor, ensureServiceBuild, PROJECT_ROOT, startService, type ServiceProcess } from './service-process';
import { fixtureUser } from './users';

const MIGRATIONS = resolve(PROJECT_ROOT, 'prisma', 'migrations');

describe('PostgreSQL restarted during a burst of readings (a private server on its own port)', () => {
  let pg: PrivatePostgres | undefined;
  let service: ServiceProcess | undefined;
  const scratchDir = mkdtempSync(join(tmpdir(), 'tracebay-restart-'));

  beforeAll(async () => {
    // Compile once before the clock of the test starts (skipped when dist/ is current).
    await ensureServiceBuild();
    pg = await startPrivatePostgres();
    const db = await openDatabase({ databaseUrl: pg.url, dataDir: scratchDir, migrationsDir: MIGRATIONS, poolSize: 2 });
    await seedShops(db.prisma);
    await db.close();
  });
  afterAll(async () => {
    await service?.kill('SIGKILL');
    pg?.destroy();
    rmSync(scratchDir, { recursive: true, force: true });
  });

  it('answers 503 with Retry-After during the outage, reconnects by itself and keeps every acknowledged reading', async () => {
    const server = pg!;
    service = await startService({ databaseUrl: server.url });
    const headers = await credentialsFor(service.url, fixtureUser(TECH_A));
    const { roId, circuitId } = await createOrderWithCircuit(service.url, headers);

    let phase: 'before' | 'outage' | 'after' = 'before';
    let outage: Promise<void> | undefined;
    let backAt = 0;
    const acked = (so: readonly Sent[]) => so.filter((s) => s.status === 201).length;
    const sent = await burst({
      url: service.url, headers, roId, circuitId,
      concurrency: 8, timeoutMs: 10_000, keyPrefix: 'restart', pauseMs: 5,
      until: (so) => {
        if (phase === 'before' && acked(so) >= 100) {
          phase = 'outage';
          // Down for about two seconds, then back; the burst goes on throughout.
          outage = (async () => {
            await server.stop();
            await new Promise((r) => setTimeout(r, 2000));
            await server.start();
            backAt = so.length;
            phase = 'after';
          })();
        }
        return phase === 'after' && acked(so.slice(backAt)) >= 100;
      },
    });
    await outage;
    const summary = JSON.stringify(tally(sent));

    // Every request got an answer within its timeout, and only these two answers.
    expect(sent.filter((s) => s.status === 0), summary).toEqual([]);
    expect(sent.filter((s) => s.status !== 201 && s.status !== 503), summary).toEqual([]);
    const unavailable = sent.filter((s) => s.status === 503);
    expect(unavailable.length, `the outage was seen: ${summary}`).toBeGreaterThan(0);
    for (const s of unavailable) {
      expect(s.errorCode).toBe('database.unavailable');
      expect(Number(s.retryAfter), 'Retry-After in seconds').toBeGreaterThan(0);
    }
    // Reconnected: the tail of the burst was acknowledged again.
    expect(acked(sent.slice(backAt)), summary).toBeGreaterThanOrEqual(100);

    const db = await openDatabase({ databaseUrl: server.url, dataDir: scratchDir, migrationsDir: MIGRATIONS, poolSize: 2, applyMigrations: false });
    try {
      const stored = await db.prisma.measurement.findMany({ where: { repairOrderId: roId }, select: { id: true, clientKey: true } });
      const storedIds = new Map(stored.map((m) => [m.clientKey, m.id]));
      const missing = sent.filter((s) => s.status === 201 && storedIds.get(s.clientKey) !== s.id);
      expect(missing, 'acknowledged readings missing').toEqual([]);
    } finally {
      await db.close();
    }
    const health = await fetch(`${service.url}/api/health`);
    expect(health.status).toBe(200);
  }, 90_000);
});
