// Which errors mean "the database cannot be reached right now" (try again shortly) rather than a fault of the
// request or of the code: the pg driver's socket errors, PostgreSQL's connection and shutdown SQLSTATEs, and the
// codes Prisma gives those when they come through its driver adapter.
import { isDatabaseError } from './errors';

/** Prisma error codes for a lost or unreachable server (Prisma error reference, "Common" and "Query engine"). */
const PRISMA_CODES = new Set([
  'P1001', // can't reach database server
  'P1002', // server reached but timed out
  'P1008', // operations timed out
  'P1017', // server has closed the connection
  'P2024', // timed out fetching a connection from the pool
  'P2028', // transaction API error (the transaction's connection went away)
  'P2037', // too many database connections
]);

/**
 * SQLSTATE classes and codes (PostgreSQL 15 documentation, Appendix A "PostgreSQL Error Codes"): class 08
 * connection exception; 53300 too_many_connections; 57P01 admin_shutdown, 57P02 crash_shutdown, 57P03
 * cannot_connect_now (starting up or shutting down).
 */
const SQLSTATE = /^(08[0-9A-Z]{3}|53300|57P0[123])$/;

const SOCKET_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', 'EHOSTUNREACH', 'ENETUNREACH', 'EAI_AGAIN']);

const MESSAGES =
  /Connection terminated|Can't reach database server|Server has closed the connection|timeout exceeded when trying to connect|Client has encountered a connection error|the database system is (starting up|shutting down|in recovery mode)|terminating connection due to administrator command|sorry, too many clients/i;

export function isDatabaseUnavailable(error: unknown): boolean {
  const seen = new Set<unknown>();
  const visit = (value: unknown, depth: number): boolean => {
    if (!value || typeof value !== 'object' || depth > 5 || seen.has(value)) return false;
    seen.add(value);
    if (isDatabaseError(value, 'DATABASE_UNREACHABLE')) return true;
    const v = value as { code?: unknown; originalCode?: unknown; kind?: unknown; message?: unknown; cause?: unknown; meta?: { driverAdapterError?: unknown }; errors?: unknown };
    const code = typeof v.code === 'string' ? v.code : undefined;
    if (code && (PRISMA_CODES.has(code) || SQLSTATE.test(code) || SOCKET_CODES.has(code))) return true;
    if (typeof v.originalCode === 'string' && (SQLSTATE.test(v.originalCode) || SOCKET_CODES.has(v.originalCode))) return true;
    if (v.kind === 'DatabaseNotReachable' || v.kind === 'ConnectionClosed' || v.kind === 'SocketTimeout' || v.kind === 'TooManyConnections') return true;
    if (typeof v.message === 'string' && MESSAGES.test(v.message)) return true;
    const nested = [v.cause, v.meta?.driverAdapterError, ...(Array.isArray(v.errors) ? v.errors : [])];
    return nested.some((n) => visit(n, depth + 1));
  };
  return visit(error, 0);
}

/** SQLSTATE of the driver error behind a Prisma or pg error, if any. */
export function sqlState(error: unknown): string | undefined {
  const seen = new Set<unknown>();
  const visit = (value: unknown, depth: number): string | undefined => {
    if (!value || typeof value !== 'object' || depth > 5 || seen.has(value)) return undefined;
    seen.add(value);
    const v = value as { code?: unknown; originalCode?: unknown; cause?: unknown; meta?: { driverAdapterError?: unknown; code?: unknown } };
    if (typeof v.originalCode === 'string' && /^[0-9A-Z]{5}$/.test(v.originalCode)) return v.originalCode;
    if (typeof v.meta?.code === 'string' && /^[0-9A-Z]{5}$/.test(v.meta.code)) return v.meta.code;
    if (typeof v.code === 'string' && /^[0-9A-Z]{5}$/.test(v.code) && !/^P\d{4}$/.test(v.code)) return v.code;
    return visit(v.cause, depth + 1) ?? visit(v.meta?.driverAdapterError, depth + 1);
  };
  return visit(error, 0);
}

/**
 * A value the database refused as data (SQLSTATE class 22 "data exception": a NUL character in text, a number out
 * of range, text too long): a fault of the request that validation let through, answered as bad input, not a 500.
 */
export function isDataRejected(error: unknown): boolean {
  return sqlState(error)?.startsWith('22') ?? false;
}
