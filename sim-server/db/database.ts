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

export function openDatabase(url: string): DatabaseHandle {
  const pool = new pg.Pool({ connectionString: url, max: 10, connectionTimeoutMillis: 5000 });
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
