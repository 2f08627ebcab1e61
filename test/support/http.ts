/**
 * Boots the real application on a test database and talks to it over HTTP on loopback, the way a client
 * would. One instance per test file.
 */
import type { INestApplication } from '@nestjs/common';
import type { AddressInfo } from 'node:net';
import { createApp } from '../../src/app/create-app';
import { AppLogger } from '../../src/common/logging/app-logger';
import { loadConfig } from '../../src/config/config';
import { testDatabase, type Backend, type TestDatabase } from './db';
import { seedShops } from './fixtures';

export interface ApiResponse<T = any> {
  status: number;
  body: T;
  headers: Headers;
}

export interface TestApi {
  db: TestDatabase;
  app: INestApplication;
  url: string;
  call<T = any>(method: string, path: string, options?: { user?: string; body?: unknown; raw?: string; headers?: Record<string, string> }): Promise<ApiResponse<T>>;
  close(): Promise<void>;
}

/** `fixtures: false` starts on an empty (migrated) database instead of the two test shops. */
export async function startApi(backend: Backend, options: { fixtures?: boolean } = {}): Promise<TestApi> {
  const db = await testDatabase(backend);
  if (options.fixtures !== false) await seedShops(db.prisma);
  const config = loadConfig({ PORT: '0', TRACEBAY_DEMO: 'false', LOG_LEVEL: 'error' });
  const app = await createApp(config, db, new AppLogger('error'));
  await app.listen(0, '127.0.0.1');
  const { port } = app.getHttpServer().address() as AddressInfo;
  const url = `http://127.0.0.1:${port}`;
  return {
    db,
    app,
    url,
    async call(method, path, options = {}) {
      const headers: Record<string, string> = { ...options.headers };
      if (options.user) headers['x-tracebay-user'] = options.user;
      let payload: string | undefined = options.raw;
      if (options.body !== undefined) payload = JSON.stringify(options.body);
      if (payload !== undefined) headers['content-type'] ??= 'application/json';
      const response = await fetch(url + path, { method, headers, body: payload });
      const text = await response.text();
      let body: unknown = text;
      try {
        body = text ? JSON.parse(text) : undefined;
      } catch {
        /* not JSON: keep the text */
      }
      return { status: response.status, body: body as never, headers: response.headers };
    },
    async close() {
      await app.close();
      await db.close();
    },
  };
}
