import { fileURLToPath } from 'node:url';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import type { Database } from './database';

const migrationsFolder = fileURLToPath(new URL('../../drizzle/migrations', import.meta.url));

/** Applies the checked-in migrations; already applied ones are skipped. */
export async function runMigrations(db: Database): Promise<void> {
  await migrate(db, { migrationsFolder });
}
