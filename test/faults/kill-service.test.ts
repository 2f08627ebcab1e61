/**
 * SIGKILL during a burst of readings: whatever the service acknowledged (2xx) must be in the database afterwards.
 * A reading is acknowledged only after its transaction committed, and PostgreSQL keeps a committed transaction
 * through the loss of any client (PostgreSQL 15 documentation, 30.1 "Reliability" and 30.3 "Write-Ahead Logging").
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { scratchDatabase, type ScratchDatabase } from '../support/db';
import { seedShops, TECH_A } from '../support/fixtures';
import { burstUntilKilled, createOrderWithCircuit, tally } from './burst';
import { credentialsFor, ensureServiceBuild, startService, type ServiceProcess } from './service-process';
import { fixtureUser } from './users';

describe('the service killed with SIGKILL during a burst of readings (PostgreSQL server)', () => {
  let scratch: ScratchDatabase;
  let service: ServiceProcess | undefined;

  beforeAll(async () => {
    // Compile once before the clock of the test starts (skipped when dist/ is current).
    await ensureServiceBuild();
    scratch = await scratchDatabase('postgresql', 'migrated');
    const db = await scratch.open({ poolSize: 2 });
    await seedShops(db.prisma);
    await db.close();
  });
  afterAll(async () => {
    await service?.kill('SIGKILL');
    await scratch?.drop();
  });

  it('keeps every reading it acknowledged, once, and a restarted service lists them all', async () => {
    const first = await startService({ databaseUrl: scratch.url });
    service = first;
    const headers = await credentialsFor(first.url, fixtureUser(TECH_A));
    const { roId, circuitId } = await createOrderWithCircuit(first.url, headers);

    // SIGKILL once 200 readings are acknowledged, with 16 more in flight.
    const sent = await burstUntilKilled(first, {
      headers, roId, circuitId, concurrency: 16, timeoutMs: 5000, keyPrefix: 'kill', killAfter: 200, maxRequests: 5000,
    });
    expect((await first.exited).signal).toBe('SIGKILL');

    const acknowledged = sent.filter((s) => s.status >= 200 && s.status < 300);
    expect(acknowledged.length, JSON.stringify(tally(sent))).toBeGreaterThanOrEqual(200);
    // Requests cut off by the kill get no answer at all; none may get an error status.
    expect(sent.filter((s) => s.status >= 300), JSON.stringify(tally(sent))).toEqual([]);

    const db = await scratch.open({ poolSize: 2, applyMigrations: false });
    const stored = await db.prisma.measurement.findMany({ where: { repairOrderId: roId }, select: { id: true, clientKey: true } });
    const storedIds = new Map(stored.map((m) => [m.clientKey, m.id]));
    const missing = acknowledged.filter((s) => storedIds.get(s.clientKey) !== s.id);
    expect(missing, 'acknowledged readings missing, or stored under another id').toEqual([]);
    expect(new Set(stored.map((m) => m.clientKey)).size, 'each client key stored once').toBe(stored.length);

    // A new service on the same database lists exactly what is stored.
    service = await startService({ databaseUrl: scratch.url });
    const again = await credentialsFor(service.url, fixtureUser(TECH_A));
    const list = await fetch(`${service.url}/api/repair-orders/${roId}/measurements`, { headers: again });
    expect(list.status).toBe(200);
    const items = ((await list.json()) as { items: Array<{ id: string }> }).items;
    expect(items.map((m) => m.id).sort()).toEqual(stored.map((m) => m.id).sort());
  }, 90_000);
});
