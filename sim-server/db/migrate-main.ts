import { readConfig } from '../config';
import { createLogger } from '../logging/logger';
import { prepareDatabase } from './prepare-database';

/**
 * `npm run db:migrate`: start-up's database work without serving, for a release step that
 * migrates separately. With DATABASE_OWNER_URL it migrates (and seeds in demo mode) as the owner
 * and grants DATABASE_URL's role its privileges; servers then need only DATABASE_URL.
 */
async function main(): Promise<void> {
  const read = readConfig(process.env);
  if (!read.ok) return fail(read.message);
  const prepared = await prepareDatabase(read.config, createLogger(read.config.logLevel));
  if (!prepared.ok) return fail(prepared.message);
  await Promise.all([prepared.database.app.close(), prepared.database.owner?.close()]);
  process.stdout.write('kinetwin: database migrated; the app role holds its grants\n');
}

function fail(message: string): void {
  process.stderr.write(`kinetwin: ${message}\n`);
  process.exitCode = 1;
}

void main();
