import { fileURLToPath } from 'node:url';
import { sql } from 'drizzle-orm';
import { readMigrationFiles } from 'drizzle-orm/migrator';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { MIGRATIONS_SCHEMA, MIGRATIONS_TABLE } from './app-grants';
import type { Database } from './database';

const migrationsFolder = fileURLToPath(new URL('../../drizzle/migrations', import.meta.url));

/**
 * Checked-in migrations the database has not applied yet (the migrator's own rule: newer than the
 * last one recorded), or null when its bookkeeping cannot be read (a new database, or a role
 * without SELECT on it).
 */
export async function pendingMigrations(db: Database): Promise<number | null> {
  const files = readMigrationFiles({ migrationsFolder });
  try {
    const { rows } = await db.execute<{ created_at: string | null }>(
      sql`select created_at from ${sql.identifier(MIGRATIONS_SCHEMA)}.${sql.identifier(MIGRATIONS_TABLE)} order by created_at desc limit 1`,
    );
    const last = rows[0]?.created_at;
    if (last === undefined || last === null) return files.length;
    return files.filter((f) => Number(last) < f.folderMillis).length;
  } catch {
    return null;
  }
}

/**
 * Applies the checked-in migrations; already applied ones are skipped. With nothing pending it
 * runs no statement at all: drizzle's migrator always starts with CREATE SCHEMA IF NOT EXISTS,
 * which PostgreSQL refuses to a role without CREATE on the database (the app role), even when
 * the schema exists.
 */
export async function runMigrations(db: Database): Promise<void> {
  if ((await pendingMigrations(db)) === 0) return;
  await migrate(db, { migrationsFolder });
}
