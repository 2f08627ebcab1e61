/**
 * A second (third, …) instance of the service on the database of a running test API, as a shop group runs
 * several behind a load balancer. Requests reach an instance through the test API's own `call` (so however it
 * signs users in keeps working), redirected on loopback to the instance's port.
 */
import { AsyncLocalStorage } from 'node:async_hooks';
import { mkdtempSync, rmSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { INestApplication } from '@nestjs/common';
import { createApp } from '../../src/app/create-app';
import type { OpenDatabase } from '../../src/common/database/database.tokens';
import { AppLogger } from '../../src/common/logging/app-logger';
import { loadConfig } from '../../src/config/config';
import { openDatabase } from '../../src/database';
import type { TestApi } from './http';

export interface Instance {
  url: string;
  call: TestApi['call'];
  close(): Promise<void>;
}

const route = new AsyncLocalStorage<{ from: string; to: string }>();
let installed = false;

/** Sends the test API's requests to another instance while `route` says so (per async call chain, so calls in parallel keep apart). */
function installRouting(): void {
  if (installed) return;
  installed = true;
  const original = globalThis.fetch;
  globalThis.fetch = ((input: Parameters<typeof fetch>[0], init?: RequestInit) => {
    const r = route.getStore();
    if (r && typeof input === 'string' && input.startsWith(r.from)) return original(r.to + input.slice(r.from.length), init);
    return original(input, init);
  }) as typeof fetch;
}

/**
 * Starts another instance of the service on `api`'s database with its own configuration (`env`, e.g. low rate
 * limits). On PostgreSQL it opens its own connection pool to the same database, as another process would; the
 * embedded database has one connection, so there the instance shares it.
 */
export async function startInstance(api: TestApi, env: Record<string, string> = {}): Promise<Instance> {
  installRouting();
  const config = loadConfig({ PORT: '0', TRACEBAY_DEMO: 'false', LOG_LEVEL: 'error', ...env });
  let database: OpenDatabase;
  let dataDir: string | undefined;
  let ownDatabase = false;
  if (api.db.url) {
    dataDir = mkdtempSync(join(tmpdir(), 'tracebay-instance-'));
    database = await openDatabase({ databaseUrl: api.db.url, dataDir, migrationsDir: config.migrationsDir, applyMigrations: false, poolSize: 4 });
    ownDatabase = true;
  } else {
    database = api.db;
  }
  let app: INestApplication;
  try {
    app = await createApp(config, database, new AppLogger('error'));
    await app.listen(0, '127.0.0.1');
  } catch (error) {
    if (ownDatabase) await database.close();
    throw error;
  }
  const { port } = app.getHttpServer().address() as AddressInfo;
  const url = `http://127.0.0.1:${port}`;
  return {
    url,
    call: (method, path, options) => route.run({ from: api.url, to: url }, () => api.call(method, path, options)),
    async close() {
      await app.close();
      if (ownDatabase) await database.close();
      if (dataDir) rmSync(dataDir, { recursive: true, force: true });
    },
  };
}
