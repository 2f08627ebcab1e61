/**
 * Counts the SQL statements the service sends, at the driver: every `query` of a `pg` client (PostgreSQL server)
 * and every query or exec of PGlite (embedded), BEGIN and COMMIT included, since each is a round trip. Whatever
 * library sends them (Prisma, its adapter, raw SQL) passes here.
 */
import { PGlite } from '@electric-sql/pglite';
import pg from 'pg';

const seen: string[] = [];
let recording = false;
let installed = false;

function textOf(query: unknown): string {
  if (typeof query === 'string') return query;
  if (query && typeof (query as { text?: unknown }).text === 'string') return (query as { text: string }).text;
  return String(query);
}

function install(): void {
  if (installed) return;
  installed = true;
  const pgQuery = pg.Client.prototype.query;
  pg.Client.prototype.query = function (this: unknown, ...args: unknown[]) {
    if (recording) seen.push(textOf(args[0]));
    return (pgQuery as (...a: unknown[]) => unknown).apply(this, args);
  } as typeof pgQuery;
  // Every statement of PGlite, inside a transaction or not, runs through its one exclusive-query lane.
  const proto = PGlite.prototype as unknown as { _runExclusiveQuery: (fn: () => Promise<unknown>) => Promise<unknown> };
  const lane = proto._runExclusiveQuery;
  proto._runExclusiveQuery = function (this: unknown, fn: () => Promise<unknown>) {
    if (recording) seen.push('(embedded statement)');
    return lane.call(this, fn);
  };
}

/**
 * Statements sent while `work` runs in this process. The housekeeping a write starts at random (old rate-limit
 * windows and expired idempotency keys purged on about one write in a hundred) is held off meanwhile, so that
 * the count is the request's own.
 */
export async function statementsDuring(work: () => Promise<unknown>): Promise<string[]> {
  install();
  seen.length = 0;
  const random = Math.random;
  Math.random = () => 0.99;
  recording = true;
  try {
    await work();
  } finally {
    recording = false;
    Math.random = random;
  }
  return [...seen];
}
