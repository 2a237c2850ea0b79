import { AppError } from './app-error';

/**
 * SQLSTATEs that mean the database cannot serve us now rather than that the query was wrong
 * (PostgreSQL 15 manual, Appendix A "PostgreSQL Error Codes"): class 08 connection exception,
 * 53300 too_many_connections, 57P01 admin_shutdown, 57P02 crash_shutdown, 57P03 cannot_connect_now.
 */
const UNAVAILABLE_SQLSTATES = new Set(['53300', '57P01', '57P02', '57P03']);

/** Socket errors of a connection that could not be made or was lost (Node's net error codes). */
const UNAVAILABLE_SOCKET_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EHOSTUNREACH', 'ENETUNREACH', 'ENOTFOUND', 'EAI_AGAIN', 'EPIPE']);

/**
 * node-postgres 8 and pg-pool 3 raise these without a code when the server is gone or silent;
 * matched on their text, which is all they carry (pg/lib/client.js, pg-pool/index.js).
 */
const UNAVAILABLE_MESSAGES = [
  'timeout exceeded when trying to connect',
  'Connection terminated due to connection timeout',
  'Connection terminated unexpectedly',
  'Connection terminated',
  'Query read timeout',
];

/** What the client reads; the server keeps serving what needs no database, and recovers by itself. */
export const DATABASE_UNAVAILABLE_MESSAGE = 'The database is unreachable right now, so this request was not carried out and nothing was saved. Try again in a moment.';

/** True when `err` (or an error it wraps, as Drizzle's query errors do) says the database is out of reach. */
export function isDatabaseUnavailable(err: unknown): boolean {
  for (let e: unknown = err, depth = 0; e instanceof Error && depth < 5; e = e.cause, depth++) {
    const code = (e as { code?: unknown }).code;
    if (typeof code === 'string' && (code.startsWith('08') || UNAVAILABLE_SQLSTATES.has(code) || UNAVAILABLE_SOCKET_CODES.has(code))) return true;
    // Connecting to a host name tries each address; Node then reports an AggregateError of them.
    if (e instanceof AggregateError && e.errors.some(isDatabaseUnavailable)) return true;
    if (UNAVAILABLE_MESSAGES.includes(e.message)) return true;
  }
  return false;
}

/**
 * The 503 for an error that means the database is out of reach (RFC 9110 §15.6.4: the server is
 * temporarily unable to handle the request); null for any other error.
 */
export function databaseUnavailableError(err: unknown): AppError | null {
  return isDatabaseUnavailable(err) ? new AppError(503, 'database_unavailable', DATABASE_UNAVAILABLE_MESSAGE) : null;
}
