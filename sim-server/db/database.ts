import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import * as schema from '../../drizzle/schema';

export type Database = NodePgDatabase<typeof schema>;

/** A connection pool and the Drizzle handle over it. */
export interface DatabaseHandle {
  pool: pg.Pool;
  db: Database;
  close(): Promise<void>;
}

/**
 * Longest wait for a pooled connection, ms. With the database stopped a connection is refused at
 * once; with it unreachable (a dropped network) a request answers 503 after at most this.
 */
export const CONNECT_TIMEOUT_MS = 3000;

/**
 * Longest one statement may run, ms, enforced by PostgreSQL (statement_timeout). Our statements
 * take milliseconds; this bounds a lock wait or a runaway query so no request hangs on one.
 */
export const STATEMENT_TIMEOUT_MS = 30_000;

/**
 * The client gives up on an answer this long after sending a statement, ms (query_timeout): it
 * covers a database host that went silent, where the server-side limit can never fire.
 */
export const QUERY_TIMEOUT_MS = STATEMENT_TIMEOUT_MS + 5000;

export function openDatabase(url: string): DatabaseHandle {
  const pool = new pg.Pool({
    connectionString: url,
    max: 10,
    connectionTimeoutMillis: CONNECT_TIMEOUT_MS,
    statement_timeout: STATEMENT_TIMEOUT_MS,
    query_timeout: QUERY_TIMEOUT_MS,
    // TCP keep-alive lets the kernel notice a peer that vanished without closing the connection.
    keepAlive: true,
  });
  // An idle client losing its connection must not take the process down; the next query reconnects.
  pool.on('error', () => {});
  return { pool, db: drizzle(pool, { schema }), close: () => pool.end() };
}

/** Round-trip time of a trivial query, ms; throws when the database does not answer. */
export async function pingDatabase(pool: pg.Pool): Promise<number> {
  const started = performance.now();
  await pool.query('SELECT 1');
  return performance.now() - started;
}
