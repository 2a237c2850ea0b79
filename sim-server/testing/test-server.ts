import { readFileSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import { teams, users } from '../../drizzle/schema';
import { roles, type Role } from '../../shared/protocol/api-types';
import { hashPassword } from '../auth/passwords';
import { readConfig, type ServerConfig } from '../config';
import { createKinetwinServer, type KinetwinServer } from '../create-app';
import type { DatabaseHandle } from '../db/database';
import { prepareDatabase } from '../db/prepare-database';
import { createLogger } from '../logging/logger';

/**
 * A real server on a free loopback port against the test database, migrated and seeded by the
 * owner (DATABASE_OWNER_URL) and serving as the app role (DATABASE_URL), as in production.
 */
export interface TestServer {
  baseUrl: string;
  server: KinetwinServer;
  /** The owner's handle: for fixtures written straight to the tables and for snapshots. */
  database: DatabaseHandle;
  /** The app role's handle, the one the server itself uses. */
  appDatabase: DatabaseHandle;
  config: ServerConfig;
  close(): Promise<void>;
}

export async function startTestServer(overrides: Record<string, string> = {}): Promise<TestServer> {
  const read = readConfig({ ...process.env, PORT: '0', LOG_LEVEL: 'silent', KINETWIN_MODE: 'demo', ...overrides });
  if (!read.ok) throw new Error(read.message);
  const config = read.config;
  if (config.databaseOwnerUrl === null) throw new Error('integration tests need DATABASE_OWNER_URL too: eval "$(scripts/local-postgres.sh env kinetwin_test)"');
  const prepared = await prepareDatabase(config, createLogger('silent'), { seed: true });
  if (!prepared.ok) throw new Error(prepared.message);
  const appDatabase = prepared.database.app;
  const database = prepared.database.owner!;
  const server = createKinetwinServer(config, appDatabase, createLogger('silent'), 'test');
  await new Promise<void>((resolve) => server.http.listen(0, '127.0.0.1', resolve));
  const { port } = server.http.address() as AddressInfo;
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    server,
    database,
    appDatabase,
    config,
    close: async () => {
      await server.close();
      await Promise.all([appDatabase.close(), database.close()]);
    },
  };
}

/** Signs in through the real route and returns the session cookie ("name=value"). */
export async function signIn(baseUrl: string, email: string, password: string): Promise<string> {
  return (await signInSession(baseUrl, email, password)).cookie;
}

/** A response body as JSON, typed loosely: the assertions that follow check its shape. */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export function readJson(res: Response): Promise<any> {
  return res.json();
}

/** A signed-in session as a browser holds it: the cookie and the CSRF token the server gave. */
export interface TestSession {
  cookie: string;
  csrfToken: string;
}

/** Signs in through the real route and keeps both the cookie and the session's CSRF token. */
export async function signInSession(baseUrl: string, email: string, password: string): Promise<TestSession> {
  const res = await fetch(`${baseUrl}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
  if (res.status !== 200) throw new Error(`sign-in as ${email} answered ${res.status}: ${await res.text()}`);
  const cookie = res.headers.getSetCookie().find((c) => c.startsWith('kinetwin.sid='));
  if (!cookie) throw new Error('sign-in set no session cookie');
  const { csrfToken } = (await res.json()) as { csrfToken: string };
  return { cookie: cookie.split(';')[0]!, csrfToken };
}

/** JSON requests to the API as one session (or none), with the CSRF header on unsafe methods. */
export interface ApiClient {
  get(path: string): Promise<Response>;
  post(path: string, body?: unknown): Promise<Response>;
  put(path: string, body?: unknown): Promise<Response>;
  patch(path: string, body?: unknown): Promise<Response>;
  delete(path: string): Promise<Response>;
  request(method: string, path: string, body?: unknown, headers?: Record<string, string>): Promise<Response>;
}

export function apiClient(baseUrl: string, session: TestSession | null): ApiClient {
  // A FormData body goes out as multipart/form-data with fetch's own boundary (file uploads).
  const request = (method: string, path: string, body?: unknown, headers: Record<string, string> = {}) =>
    fetch(`${baseUrl}${path}`, {
      method: method.toUpperCase(),
      headers: {
        ...(body === undefined || body instanceof FormData ? {} : { 'content-type': 'application/json' }),
        ...(session ? { cookie: session.cookie, 'x-csrf-token': session.csrfToken } : {}),
        ...headers,
      },
      body: body === undefined ? undefined : body instanceof FormData || typeof body === 'string' ? body : JSON.stringify(body),
    });
  return {
    get: (path) => request('GET', path),
    post: (path, body = {}) => request('POST', path, body),
    put: (path, body = {}) => request('PUT', path, body),
    patch: (path, body = {}) => request('PATCH', path, body),
    delete: (path) => request('DELETE', path),
    request,
  };
}

/** The password of every member createTestTeam makes; hashed once per test process. */
export const TEST_PASSWORD = 'test-team-password-7';
let testPasswordHash: Promise<string> | null = null;

export interface TestMember {
  id: number;
  email: string;
  displayName: string;
  role: Role;
  session: TestSession;
  api: ApiClient;
}

/**
 * A team of its own with one signed-in member per role (and any extra roles asked for), made
 * directly in the database so each test file pays for one password hash, not one per user.
 */
export async function createTestTeam(t: TestServer, name: string, extraRoles: Role[] = []): Promise<{ teamId: number; members: Record<Role, TestMember>; extra: TestMember[] }> {
  testPasswordHash ??= hashPassword(TEST_PASSWORD);
  const passwordHash = await testPasswordHash;
  const db = t.database.db;
  const [team] = await db.insert(teams).values({ name }).returning({ id: teams.id });
  const tag = `${name.toLowerCase().replace(/[^a-z0-9]+/g, '-')}-${team!.id}`;
  const make = async (role: Role, index: number): Promise<TestMember> => {
    const email = `${role}${index}.${tag}@example.test`;
    const displayName = `${name} ${role} ${index}`;
    const [user] = await db.insert(users).values({ teamId: team!.id, email, displayName, role, passwordHash }).returning({ id: users.id });
    const session = await signInSession(t.baseUrl, email, TEST_PASSWORD);
    return { id: user!.id, email, displayName, role, session, api: apiClient(t.baseUrl, session) };
  };
  const members = {} as Record<Role, TestMember>;
  for (const role of roles) members[role] = await make(role, 0);
  const extra: TestMember[] = [];
  for (const [i, role] of extraRoles.entries()) extra.push(await make(role, i + 1));
  return { teamId: team!.id, members, extra };
}

/** A demo scenario file's document, as a client would send it. */
export function demoScenarioDocument(file = 'wrist-pitch-step.json'): Record<string, unknown> {
  return JSON.parse(readFileSync(new URL(`../../scenarios/${file}`, import.meta.url), 'utf8')) as Record<string, unknown>;
}
