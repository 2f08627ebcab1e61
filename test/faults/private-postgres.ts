/**
 * A PostgreSQL server of a test's own (initdb into a temporary folder, its own port and socket folder), so that a
 * test may stop and restart it without disturbing the shared server other test files use.
 */
import { execFile, execFileSync } from 'node:child_process';
import { promisify } from 'node:util';
import { chownSync, existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { freePort } from './service-process';

const PG_BIN = process.env.TRACEBAY_PG_BIN ?? findPgBin();

function findPgBin(): string {
  const root = '/usr/lib/postgresql';
  const versions = existsSync(root) ? readdirSync(root).filter((v) => existsSync(join(root, v, 'bin', 'initdb'))) : [];
  const newest = versions.sort((a, b) => Number(b) - Number(a))[0];
  if (!newest) throw new Error(`No PostgreSQL server binaries under ${root}; set TRACEBAY_PG_BIN to the folder holding initdb and pg_ctl.`);
  return join(root, newest, 'bin');
}

export interface PrivatePostgres {
  readonly port: number;
  /** Connection URL of its `postgres` database (trust authentication on loopback). */
  readonly url: string;
  /** Runs the server binaries without blocking the event loop (requests in flight keep being answered). */
  stop(): Promise<void>;
  start(): Promise<void>;
  /** Stops the server and removes its folder. */
  destroy(): void;
}

/** initdb refuses to run as root: as root, run the server binaries as the `postgres` system user. */
function command(binary: string, args: string[]): [string, string[]] {
  const asRoot = process.getuid?.() === 0;
  return asRoot ? ['runuser', ['-u', 'postgres', '--', join(PG_BIN, binary), ...args]] : [join(PG_BIN, binary), args];
}

async function run(binary: string, args: string[]): Promise<void> {
  const [cmd, argv] = command(binary, args);
  try {
    await promisify(execFile)(cmd, argv, { encoding: 'utf8', timeout: 60_000 });
  } catch (error) {
    const e = error as { stdout?: string; stderr?: string; message: string };
    throw new Error(`${binary} ${args.join(' ')} failed: ${e.message}\n${e.stdout ?? ''}${e.stderr ?? ''}`);
  }
}

export async function startPrivatePostgres(): Promise<PrivatePostgres> {
  const dir = mkdtempSync(join(tmpdir(), 'tracebay-private-pg-'));
  if (process.getuid?.() === 0) {
    const uid = Number(execFileSync('id', ['-u', 'postgres'], { encoding: 'utf8' }).trim());
    const gid = Number(execFileSync('id', ['-g', 'postgres'], { encoding: 'utf8' }).trim());
    chownSync(dir, uid, gid);
  }
  const data = join(dir, 'data');
  const port = await freePort();
  await run('initdb', ['-D', data, '-U', 'postgres', '--auth=trust', '--no-sync', '-E', 'UTF8', '--locale=C']);
  const options = `-p ${port} -k ${dir} -c listen_addresses=127.0.0.1 -c shared_buffers=16MB -c max_connections=40`;
  const pgCtl = (...args: string[]) => run('pg_ctl', ['-D', data, '-l', join(dir, 'server.log'), ...args]);
  let running = false;
  const server: PrivatePostgres = {
    port,
    url: `postgresql://postgres@127.0.0.1:${port}/postgres`,
    async start() {
      await pgCtl('-o', options, '-w', '-t', '30', 'start');
      running = true;
    },
    async stop() {
      // Fast shutdown: open sessions are ended at once, as a restarting server does to its clients.
      await pgCtl('-m', 'fast', '-w', '-t', '30', 'stop');
      running = false;
    },
    destroy() {
      try {
        if (running) execFileSync(...command('pg_ctl', ['-D', data, '-m', 'immediate', '-w', 'stop']), { stdio: 'ignore', timeout: 30_000 });
      } finally {
        running = false;
        rmSync(dir, { recursive: true, force: true });
      }
    },
  };
  try {
    await server.start();
  } catch (error) {
    rmSync(dir, { recursive: true, force: true });
    throw error;
  }
  return server;
}
