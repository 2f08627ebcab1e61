/**
 * The embedded database killed during writes: SIGKILL while readings are being written, then a new process on the
 * same data folder takes over the dead process's lock file, recovers, and has every reading it acknowledged.
 * Recovery replays the write-ahead log up to the last commit (PostgreSQL 15 documentation, 30.3 "Write-Ahead
 * Logging"); the embedded database is PostgreSQL compiled to WebAssembly, with the same storage code.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DATA_DIR_LOCK_FILE } from '../../src/database';
import { scratchDatabase, type ScratchDatabase } from '../support/db';
import { seedShops, TECH_A } from '../support/fixtures';
import { burst, burstUntilKilled, createOrderWithCircuit, tally } from './burst';
import { credentialsFor, ensureServiceBuild, startService, type ServiceProcess } from './service-process';
import { fixtureUser } from './users';

describe('the embedded database killed during writes', () => {
  let scratch: ScratchDatabase;
  let service: ServiceProcess | undefined;

  beforeAll(async () => {
    // Compile once before the clock of the test starts (skipped when dist/ is current).
    await ensureServiceBuild();
    scratch = await scratchDatabase('embedded', 'migrated');
    const db = await scratch.open();
    await seedShops(db.prisma);
    await db.close();
  });
  afterAll(async () => {
    await service?.kill('SIGKILL');
    await scratch?.drop();
  });

  it('reopens after SIGKILL with every acknowledged reading, answers queries, and writes again', async () => {
    const first = await startService({ dataDir: scratch.dataDir });
    service = first;
    const headers = await credentialsFor(first.url, fixtureUser(TECH_A));
    const { roId, circuitId } = await createOrderWithCircuit(first.url, headers);

    const sent = await burstUntilKilled(first, {
      headers, roId, circuitId, concurrency: 8, timeoutMs: 10_000, keyPrefix: 'embedded', killAfter: 60, maxRequests: 2000,
    });
    expect((await first.exited).signal).toBe('SIGKILL');
    const acknowledged = sent.filter((s) => s.status === 201);
    expect(acknowledged.length, JSON.stringify(tally(sent))).toBeGreaterThanOrEqual(60);
    expect(sent.filter((s) => s.status >= 300), JSON.stringify(tally(sent))).toEqual([]);

    // The dead process's lock file is still there, naming it.
    const lockPath = join(scratch.dataDir, DATA_DIR_LOCK_FILE);
    expect(existsSync(lockPath)).toBe(true);
    expect(JSON.parse(readFileSync(lockPath, 'utf8')).pid).toBe(first.pid);

    // A new process takes the stale lock over and opens the folder.
    const second = await startService({ dataDir: scratch.dataDir });
    service = second;
    expect(JSON.parse(readFileSync(lockPath, 'utf8')).pid).toBe(second.pid);
    const again = await credentialsFor(second.url, fixtureUser(TECH_A));
    const list = await fetch(`${second.url}/api/repair-orders/${roId}/measurements`, { headers: again });
    expect(list.status).toBe(200);
    const items = ((await list.json()) as { items: Array<{ id: string; clientKey?: string }> }).items;
    const ids = new Set(items.map((m) => m.id));
    expect(acknowledged.filter((s) => !ids.has(s.id!)), 'acknowledged readings missing after the restart').toEqual([]);
    expect(ids.size, 'no reading twice').toBe(items.length);

    // Consistent: the diagnosis reads the same readings, and a new reading is stored and listed.
    const diagnosis = await fetch(`${second.url}/api/repair-orders/${roId}/circuits/${circuitId}/diagnosis`, { headers: again });
    expect(diagnosis.status).toBe(200);
    const more = await burst({ url: second.url, headers: again, roId, circuitId, concurrency: 1, timeoutMs: 10_000, keyPrefix: 'after', until: (so) => so.length >= 4 });
    expect(more.map((s) => s.status)).toEqual([201, 201, 201, 201]);

    // And the process shuts down cleanly on SIGTERM, leaving no lock behind.
    const stopped = await second.kill('SIGTERM');
    expect(stopped.code, second.output().slice(-2000)).toBe(0);
    expect(existsSync(lockPath)).toBe(false);
  }, 90_000);
});
