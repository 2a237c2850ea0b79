import type { Pool } from 'pg';

/** Rows of one table and a digest of their content, so an UPDATE shows as well as an INSERT. */
export interface TableState {
  rows: number;
  digest: string;
}

/** What a snapshot leaves out: whole tables, and columns that hold session state, by table. */
export interface SnapshotExclusions {
  tables?: readonly string[];
  columns?: Readonly<Record<string, readonly string[]>>;
}

/**
 * Every table of the public schema as it is now, less the exclusions: a test takes one before
 * and one after a phase of requests that must store nothing, and compares them.
 */
export async function snapshotTables(pool: Pool, except: SnapshotExclusions = {}): Promise<Record<string, TableState>> {
  const { rows: tables } = await pool.query<{ tablename: string }>("select tablename from pg_tables where schemaname = 'public' order by tablename");
  const state: Record<string, TableState> = {};
  for (const { tablename } of tables) {
    if (except.tables?.includes(tablename)) continue;
    const quoted = `"${tablename.replace(/"/g, '""')}"`;
    const { rows } = await pool.query<{ rows: string; digest: string }>(
      `select count(*) as rows, md5(coalesce(string_agg((to_jsonb(t) - $1::text[])::text, E'\\n' order by (to_jsonb(t) - $1::text[])::text), '')) as digest from ${quoted} t`,
      [except.columns?.[tablename] ?? []],
    );
    state[tablename] = { rows: Number(rows[0]!.rows), digest: rows[0]!.digest };
  }
  return state;
}
