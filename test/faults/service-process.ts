/**
 * The service as a separate operating-system process (`node dist/main.js`), the way a shop runs it, so that tests
 * and the load benchmark can kill it, restart it and talk to it only over HTTP.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, statSync, utimesSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';

export const PROJECT_ROOT = resolve(__dirname, '..', '..');
const MAIN = join(PROJECT_ROOT, 'dist', 'main.js');

/** Newest modification time of any file under `dir` (recursively). */
function newestMtime(dir: string): number {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const path = join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestMtime(path) : statSync(path).mtimeMs);
  }
  return newest;
}

/**
 * Compiles `src/` into `dist/` (the `npm run build` output) when `dist/main.js` is missing or older than any source
 * file. Parallel test files share one build: the first to take the lock folder builds, the others wait for it.
 * Type errors in unrelated files do not stop the emit; a missing `dist/main.js` afterwards does.
 */
export async function ensureServiceBuild(): Promise<string> {
  const stale = () => !existsSync(MAIN) || statSync(MAIN).mtimeMs < newestMtime(join(PROJECT_ROOT, 'src'));
  if (!stale()) return MAIN;
  const lock = join(tmpdir(), 'tracebay-service-build.lock');
  const deadline = Date.now() + 120_000;
  for (;;) {
    try {
      mkdirSync(lock);
      break;
    } catch {
      // Someone else builds; a lock older than two minutes belongs to a killed run.
      if (Date.now() - statSync(lock, { throwIfNoEntry: false })!.mtimeMs > 120_000) spawnSync('rm', ['-rf', lock]);
      await new Promise((r) => setTimeout(r, 250));
      if (!stale()) return MAIN;
      if (Date.now() > deadline) throw new Error('Timed out waiting for another process to build dist/');
    }
  }
  try {
    if (!stale()) return MAIN;
    const tsc = join(PROJECT_ROOT, 'node_modules', 'typescript', 'bin', 'tsc');
    const built = spawnSync(process.execPath, [tsc, '-p', 'tsconfig.build.json'], { cwd: PROJECT_ROOT, encoding: 'utf8' });
    if (!existsSync(MAIN)) throw new Error(`npm run build produced no dist/main.js:\n${built.stdout}${built.stderr}`);
    const now = new Date();
    utimesSync(MAIN, now, now);
    return MAIN;
  } finally {
    spawnSync('rm', ['-rf', lock]);
  }
}

/** A port nobody listens on right now (the kernel's choice). */
export async function freePort(): Promise<number> {
  return new Promise((resolvePort, reject) => {
    const server = createServer();
    server.unref();
    server.on('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address() as { port: number };
      server.close(() => resolvePort(port));
    });
  });
}

export interface ServiceProcess {
  readonly url: string;
  readonly pid: number;
  readonly child: ChildProcess;
  /** Everything the process wrote so far (stdout and stderr interleaved). */
  output(): string;
  /** Resolves with the exit code or signal once the process has ended. */
  readonly exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
  kill(signal?: NodeJS.Signals): Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
}

export interface StartOptions {
  /** `DATABASE_URL`; without it the embedded database in `dataDir`. */
  databaseUrl?: string;
  dataDir?: string;
  env?: Record<string, string>;
  /** Extra Node options before the script (e.g. --cpu-prof for a profile of a benchmark run). */
  nodeArgs?: string[];
  /** How long to wait for `/api/health` to answer (default 40 s: the embedded database opens slowly). */
  readyTimeoutMs?: number;
}

export async function startService(options: StartOptions): Promise<ServiceProcess> {
  const main = await ensureServiceBuild();
  const port = await freePort();
  const env: Record<string, string> = {
    PATH: process.env.PATH ?? '/usr/bin:/bin',
    HOME: process.env.HOME ?? tmpdir(),
    PORT: String(port),
    HOST: '127.0.0.1',
    TRACEBAY_DEMO: 'false',
    LOG_LEVEL: 'warn',
    TRACEBAY_DATA_DIR: options.dataDir ?? join(tmpdir(), `tracebay-unused-${port}`),
    ...(options.databaseUrl ? { DATABASE_URL: options.databaseUrl } : {}),
    ...options.env,
  };
  const child = spawn(process.execPath, [...(options.nodeArgs ?? []), main], { cwd: PROJECT_ROOT, env, stdio: ['ignore', 'pipe', 'pipe'] });
  let log = '';
  child.stdout!.on('data', (d: Buffer) => (log += d.toString()));
  child.stderr!.on('data', (d: Buffer) => (log += d.toString()));
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((r) => child.once('exit', (code, signal) => r({ code, signal })));
  let ended = false;
  void exited.then(() => (ended = true));
  const url = `http://127.0.0.1:${port}`;
  const service: ServiceProcess = {
    url,
    pid: child.pid!,
    child,
    output: () => log,
    exited,
    async kill(signal = 'SIGTERM') {
      if (!ended) child.kill(signal);
      return exited;
    },
  };
  const deadline = Date.now() + (options.readyTimeoutMs ?? 40_000);
  for (;;) {
    if (ended) throw new Error(`The service exited before answering:\n${log}`);
    try {
      const res = await fetch(`${url}/api/health`, { signal: AbortSignal.timeout(2000) });
      if (res.status === 200) return service;
    } catch {
      /* not listening yet */
    }
    if (Date.now() > deadline) {
      await service.kill('SIGKILL');
      throw new Error(`The service did not answer /api/health within the time allowed:\n${log}`);
    }
    await new Promise((r) => setTimeout(r, 150));
  }
}

export interface FixtureUser {
  id: string;
  email: string;
  password: string;
}

/** Request headers that name `user` to a running service: a bearer token from `POST /api/auth/sign-in`. */
export async function credentialsFor(url: string, user: FixtureUser): Promise<Record<string, string>> {
  const res = await fetch(`${url}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: user.email, password: user.password }),
    signal: AbortSignal.timeout(10_000),
  });
  const body = (await res.json().catch(() => ({}))) as { token?: string; accessToken?: string };
  const token = body.token ?? body.accessToken;
  if (!res.ok || !token) throw new Error(`Sign-in of ${user.email} answered ${res.status}: ${JSON.stringify(body)}`);
  return { authorization: `Bearer ${token}` };
}
