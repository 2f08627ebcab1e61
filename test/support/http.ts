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
import { DEMO_SIGN_INS } from '../../src/demo/seed';
import { FIXTURE_EMAILS, FIXTURE_PASSWORD, seedShops } from './fixtures';

/** Email and password of every person a test may name by id: the fixture shops' and the demo's. */
export function credentialsOf(userId: string): { email: string; password: string } | undefined {
  const email = FIXTURE_EMAILS[userId];
  if (email) return { email, password: FIXTURE_PASSWORD };
  const demo = DEMO_SIGN_INS.find((u) => u.id === userId);
  return demo && { email: demo.email, password: demo.password };
}

/** Well-formed but never issued: what a person who cannot sign in (inactive, unknown) ends up sending. */
const NO_TOKEN = 'not-a-token-that-was-ever-issued-000000000';

export interface ApiResponse<T = any> {
  status: number;
  body: T;
  headers: Headers;
}

export interface TestApi {
  db: TestDatabase;
  app: INestApplication;
  url: string;
  /** `user`: a person's id; the call is made with their bearer token (signed in once per person per instance). */
  call<T = any>(method: string, path: string, options?: { user?: string; body?: unknown; raw?: string; headers?: Record<string, string> }): Promise<ApiResponse<T>>;
  /** `{ authorization: 'Bearer …' }` for that person, for calls made with plain fetch. */
  authHeaders(user: string): Promise<Record<string, string>>;
  /** A page session for that person (as the browser holds it): the Cookie header to send and the CSRF token. */
  sessionOf(user: string): Promise<{ cookie: string; csrf: string }>;
  close(): Promise<void>;
}

/**
 * `fixtures: false` starts on an empty (migrated) database instead of the two test shops; `env` adds configuration
 * variables (as the environment would).
 */
export async function startApi(backend: Backend, options: { fixtures?: boolean; env?: Record<string, string> } = {}): Promise<TestApi> {
  const db = await testDatabase(backend);
  if (options.fixtures !== false) await seedShops(db.prisma);
  const { app, url } = await listen(db, options.env);
  return withClient(db, app, url, async () => {
    await app.close();
    await db.close();
  });
}

/** Another instance of the service on the same database (as behind a load balancer); closing it leaves the database. */
export async function startInstance(db: TestDatabase, env: Record<string, string> = {}): Promise<TestApi> {
  const { app, url } = await listen(db, env);
  return withClient(db, app, url, () => app.close());
}

async function listen(db: TestDatabase, env: Record<string, string> = {}) {
  const config = loadConfig({ PORT: '0', TRACEBAY_DEMO: 'false', LOG_LEVEL: 'error', ...env });
  const app = await createApp(config, db, new AppLogger('error'));
  await app.listen(0, '127.0.0.1');
  const { port } = app.getHttpServer().address() as AddressInfo;
  return { app, url: `http://127.0.0.1:${port}` };
}

function withClient(db: TestDatabase, app: INestApplication, url: string, close: () => Promise<void>): TestApi {
  const tokens = new Map<string, Promise<string>>();
  const tokenOf = (user: string) => {
    let token = tokens.get(user);
    if (!token) {
      token = (async () => {
        const who = credentialsOf(user);
        if (!who) return NO_TOKEN;
        const res = await fetch(`${url}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(who) });
        return res.ok ? ((await res.json()) as { token: string }).token : NO_TOKEN;
      })();
      tokens.set(user, token);
    }
    return token;
  };
  return {
    db,
    app,
    url,
    async sessionOf(user) {
      const who = credentialsOf(user) ?? { email: `${user}@nobody.test`, password: 'x' };
      const res = await fetch(`${url}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ ...who, as: 'session' }) });
      const cookies = res.headers.getSetCookie().map((c) => c.split(';')[0]!);
      return { cookie: cookies.join('; '), csrf: res.ok ? ((await res.json()) as { csrfToken: string }).csrfToken : '' };
    },
    async authHeaders(user) {
      return { authorization: `Bearer ${await tokenOf(user)}` };
    },
    async call(method, path, options = {}) {
      const headers: Record<string, string> = { ...options.headers };
      if (options.user) headers.authorization ??= `Bearer ${await tokenOf(options.user)}`;
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
    close,
  };
}
