import { readFileSync } from 'node:fs';
import { readConfig } from './config';
import { createKinetwinServer } from './create-app';
import { prepareDatabase } from './db/prepare-database';
import { DEMO_ACCOUNTS } from './db/seed-demo';
import { createLogger } from './logging/logger';

const version = (JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')) as { version: string }).version;

/** One line saying what went wrong and how to fix it, then a non-zero exit. */
function fail(message: string): never {
  process.stderr.write(`kinetwin: ${message}\n`);
  process.exit(1);
}

async function main() {
  const read = readConfig(process.env);
  if (!read.ok) fail(`${read.message}`);
  const config = read.config;
  const logger = createLogger(config.logLevel);
  const prepared = await prepareDatabase(config, logger);
  if (!prepared.ok) fail(prepared.message);
  // The owner's pool was for migrations, the seed and the grants only: the server never uses it.
  await prepared.database.owner?.close();
  const database = prepared.database.app;

  const server = createKinetwinServer(config, database, logger, version);
  server.http.on('error', (err: NodeJS.ErrnoException) => {
    if (err.code === 'EADDRINUSE') fail(`port ${config.port} on ${config.host} is taken by another program. Stop it or set PORT to a free port.`);
    if (err.code === 'EACCES') fail(`no permission to listen on port ${config.port}. Use a port above 1023 (set PORT).`);
    fail(`cannot listen on ${config.host}:${config.port}: ${err.message}`);
  });
  server.http.listen(config.port, config.host, () => {
    const address = server.http.address();
    const port = typeof address === 'object' && address ? address.port : config.port;
    logger.info({ host: config.host, port, mode: config.mode, version }, 'kinetwin listening');
    // Parsed by scripts and read by people: keep this line's shape.
    process.stdout.write(`Kinetwin ${version} is up: http://${config.host}:${port}/\n`);
    if (config.mode === 'demo') {
      for (const account of DEMO_ACCOUNTS) process.stdout.write(`  demo sign-in (${account.role}): ${account.email} / ${account.password}\n`);
    }
  });

  let stopping = false;
  const shutdown = (signal: string) => {
    if (stopping) return;
    stopping = true;
    logger.info({ signal }, 'shutting down');
    const forced = setTimeout(() => process.exit(1), 5000);
    forced.unref();
    void server
      .close()
      .then(() => database.close())
      .then(() => process.exit(0));
  };
  process.on('SIGINT', () => shutdown('SIGINT'));
  process.on('SIGTERM', () => shutdown('SIGTERM'));
}

void main();
