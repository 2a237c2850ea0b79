import type { AddressInfo } from 'node:net';
import { readConfig, type ServerConfig } from '../config';
import { createKinetwinServer, type KinetwinServer } from '../create-app';
import { openDatabase, type DatabaseHandle } from '../db/database';
import { runMigrations } from '../db/migrate';
import { seedDemo } from '../db/seed-demo';
import { createLogger } from '../logging/logger';

/** A real server on a free loopback port against the test database (DATABASE_URL), migrated and seeded. */
export interface TestServer {
  baseUrl: string;
  server: KinetwinServer;
  database: DatabaseHandle;
  config: ServerConfig;
  close(): Promise<void>;
}

export async function startTestServer(overrides: Record<string, string> = {}): Promise<TestServer> {
  const read = readConfig({ ...process.env, PORT: '0', LOG_LEVEL: 'silent', KINETWIN_MODE: 'demo', ...overrides });
  if (!read.ok) throw new Error(read.message);
  const config = read.config;
  const database = openDatabase(config.databaseUrl);
  await runMigrations(database.db);
  await seedDemo(database.db);
  const server = createKinetwinServer(config, database, createLogger('silent'), 'test');
  await new Promise<void>((resolve) => server.http.listen(0, '127.0.0.1', resolve));
  const { port } = server.http.address() as AddressInfo;
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    server,
    database,
    config,
    close: async () => {
      await server.close();
      await database.close();
    },
  };
}

/** Signs in through the real route and returns the session cookie ("name=value"). */
export async function signIn(baseUrl: string, email: string, password: string): Promise<string> {
  const res = await fetch(`${baseUrl}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
  if (res.status !== 200) throw new Error(`sign-in as ${email} answered ${res.status}: ${await res.text()}`);
  const cookie = res.headers.getSetCookie().find((c) => c.startsWith('kinetwin.sid='));
  if (!cookie) throw new Error('sign-in set no session cookie');
  return cookie.split(';')[0]!;
}

/** A response body as JSON, typed loosely: the assertions that follow check its shape. */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export function readJson(res: Response): Promise<any> {
  return res.json();
}
