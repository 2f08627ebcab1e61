// A pg Pool from a database URL: bounded size, a connect timeout so an unreachable server
// fails fast instead of hanging, and Prisma's `?schema=` parameter honoured as search_path.
import { Pool, type PoolClient } from 'pg';
import { DatabaseError, describeDriverError } from './errors';
import type { DatabaseLogger } from './migrator';

export interface PgConnectionOptions {
  databaseUrl: string;
  /** Connections in the pool (default 10). */
  poolSize?: number;
  /** Give up connecting after this long (default 5000 ms). */
  connectTimeoutMs?: number;
  logger: DatabaseLogger;
}

export interface PgTarget {
  /** Connection string without Prisma's `schema` parameter. */
  readonly connectionString: string;
  /** Schema from `?schema=`, or undefined for the server's search_path (normally public). */
  readonly schema: string | undefined;
  /** host:port/database, without credentials: safe for messages. */
  readonly label: string;
}

const SCHEMA_NAME = /^[A-Za-z_][A-Za-z0-9_$]{0,62}$/;

export function parseDatabaseUrl(databaseUrl: string): PgTarget {
  let url: URL;
  try {
    url = new URL(databaseUrl);
  } catch {
    throw new DatabaseError(
      'DATABASE_URL_INVALID',
      'DATABASE_URL is not a valid URL; expected postgresql://user@host:5432/database.',
      { field: 'databaseUrl' },
    );
  }
  if (url.protocol !== 'postgresql:' && url.protocol !== 'postgres:') {
    throw new DatabaseError(
      'DATABASE_URL_INVALID',
      `DATABASE_URL uses protocol "${url.protocol}"; expected postgresql://user@host:5432/database.`,
      { field: 'databaseUrl', protocol: url.protocol },
    );
  }
  const schema = url.searchParams.get('schema') ?? undefined;
  if (schema !== undefined && !SCHEMA_NAME.test(schema)) {
    throw new DatabaseError(
      'DATABASE_URL_INVALID',
      `DATABASE_URL parameter schema="${schema}" is not a plain PostgreSQL identifier (letters, digits, _ and $).`,
      { field: 'databaseUrl.schema', schema },
    );
  }
  url.searchParams.delete('schema');
  const label = `${url.hostname || 'localhost'}:${url.port || '5432'}${url.pathname || '/'}`;
  return { connectionString: url.toString(), schema, label };
}

export function createPool(target: PgTarget, options: PgConnectionOptions): Pool {
  const pool = new Pool({
    connectionString: target.connectionString,
    max: options.poolSize ?? 10,
    connectionTimeoutMillis: options.connectTimeoutMs ?? 5000,
    idleTimeoutMillis: 30_000,
    // UTC sessions whatever the server's zone: dates inside joined relations come back as JSON text, which Prisma
    // reads as UTC, so a server in another zone would shift them (and the digests of proofs built from them).
    options: ['-c TimeZone=UTC', ...(target.schema ? [`-c search_path="${target.schema}"`] : [])].join(' '),
  });
  // An idle client losing its server emits 'error' on the pool; unhandled, that kills the process.
  pool.on('error', (error) => options.logger.warn(`PostgreSQL connection lost (${target.label}): ${error.message}`));
  return pool;
}

export async function connect(pool: Pool, target: PgTarget): Promise<PoolClient> {
  try {
    return await pool.connect();
  } catch (error) {
    throw new DatabaseError(
      'DATABASE_UNREACHABLE',
      `Cannot connect to PostgreSQL at ${target.label}: ${describeDriverError(error)}`,
      { target: target.label },
      { cause: error },
    );
  }
}
