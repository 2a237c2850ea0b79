import type { ServerConfig } from '../config';
import type { Logger } from '../logging/logger';
import { applyAppGrants } from './apply-app-grants';
import { readServingRoleFacts, servingRoleRefusal } from './app-role-check';
import { openDatabase, pingDatabase, type DatabaseHandle } from './database';
import { runMigrations } from './migrate';
import { seedDemo } from './seed-demo';

/** The pools after start-up's database work: `app` serves; `owner` is null without DATABASE_OWNER_URL. */
export interface PreparedDatabase {
  app: DatabaseHandle;
  owner: DatabaseHandle | null;
}

export type Prepared = { ok: true; database: PreparedDatabase } | { ok: false; message: string };

/** A connection URL with its password replaced, for messages. */
export function redactUrl(url: string): string {
  return url.replace(/\/\/([^:@/]+):[^@/]*@/, '//$1:***@');
}

async function currentRole(handle: DatabaseHandle): Promise<string> {
  return (await handle.pool.query<{ role: string }>('SELECT current_user AS role')).rows[0]!.role;
}

/**
 * Start-up's database work, each failure a one-line message: connect both roles, migrate and (in
 * demo mode) seed as the owner, make the app role's grants exactly APP_GRANTS, then refuse a
 * serving role that holds more than grants (unless ALLOW_PRIVILEGED_DATABASE_ROLE). Without
 * DATABASE_OWNER_URL the DATABASE_URL role migrates and seeds, and no grants are applied: whoever
 * migrated separately (npm run db:migrate) applied them.
 */
export async function prepareDatabase(config: ServerConfig, logger: Logger, options: { seed: boolean } = { seed: config.mode === 'demo' }): Promise<Prepared> {
  const app = openDatabase(config.databaseUrl);
  const owner = config.databaseOwnerUrl === null ? null : openDatabase(config.databaseOwnerUrl);
  const fail = async (message: string): Promise<Prepared> => {
    await Promise.all([app.close(), owner?.close()]).catch(() => {});
    return { ok: false, message };
  };

  try {
    await pingDatabase(app.pool);
  } catch (err) {
    return fail(`database unreachable at ${redactUrl(config.databaseUrl)}: ${(err as Error).message}. Start PostgreSQL (npm start does) or fix DATABASE_URL.`);
  }
  if (owner) {
    try {
      await pingDatabase(owner.pool);
    } catch (err) {
      return fail(`database unreachable at ${redactUrl(config.databaseOwnerUrl!)}: ${(err as Error).message}. Fix DATABASE_OWNER_URL (or leave it unset when migrations run separately).`);
    }
  }

  const migrator = owner ?? app;
  try {
    await runMigrations(migrator.db);
  } catch (err) {
    const hint = owner
      ? 'Check that the DATABASE_OWNER_URL role owns the database or may create tables in it, then start again.'
      : 'Set DATABASE_OWNER_URL to the role that owns the schema, or run npm run db:migrate with it first, then start again.';
    return fail(`migrations failed: ${(err as Error).message}. ${hint}`);
  }
  if (options.seed) {
    try {
      logger.info(await seedDemo(migrator.db), 'demo data seeded');
    } catch (err) {
      return fail(`demo seed failed: ${(err as Error).message}`);
    }
  }

  let appRole: string;
  try {
    appRole = await currentRole(app);
    if (owner && (await currentRole(owner)) !== appRole) await applyAppGrants(owner.pool, appRole);
  } catch (err) {
    return fail(`granting the app role its privileges failed: ${(err as Error).message}. DATABASE_OWNER_URL must be the role that owns the tables.`);
  }

  let refusal: string | null;
  try {
    refusal = servingRoleRefusal(await readServingRoleFacts(app.pool));
  } catch (err) {
    return fail(`could not read the privileges of the database role ${appRole}: ${(err as Error).message}`);
  }
  if (refusal !== null) {
    if (!config.allowPrivilegedDatabaseRole) return fail(refusal);
    logger.warn({ role: appRole }, `serving anyway (ALLOW_PRIVILEGED_DATABASE_ROLE=true): ${refusal}`);
  }
  return { ok: true, database: { app, owner } };
}
