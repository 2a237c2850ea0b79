import { subscribe, unsubscribe } from 'node:diagnostics_channel';
import { randomBytes } from 'node:crypto';
import bcrypt from 'bcryptjs';
import { desc, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { outbox, teams, users } from '../../drizzle/schema';
import { readJson, startTestServer, type TestServer } from '../testing/test-server';
import { WRONG_CREDENTIALS } from './auth-routes';
import { hashPassword, PASSWORD_WORK_CHANNEL, SCRYPT_PARAMS } from './passwords';
import { createSignInLimits } from './sign-in-limits';

const PASSWORD = 'joint-stiffness-31';
const stamp = `${Date.now()}-${process.pid}`;
let seq = 0;
/** A random private address (RFC 1918), so its counter starts empty even though counters outlast each run. */
const freshAddress = () => `10.${[...randomBytes(3)].join('.')}`;
const freshEmail = (who: string) => `${who}-${stamp}-${seq++}@limits.example.test`;

type Work = { scheme: string; purpose: string };

/** The password derivations (scheme, purpose) the server starts while `run` runs. */
async function passwordWork(run: () => Promise<unknown>): Promise<Work[]> {
  const seen: Work[] = [];
  const listener = (message: unknown) => seen.push(message as Work);
  subscribe(PASSWORD_WORK_CHANNEL, listener);
  try {
    await run();
  } finally {
    unsubscribe(PASSWORD_WORK_CHANNEL, listener);
  }
  return seen;
}

/** A user made directly in the database, with the given stored hash. */
async function makeUser(t: TestServer, passwordHash: string): Promise<{ id: number; email: string }> {
  const [team] = await t.database.db.insert(teams).values({ name: `limits ${stamp}` }).returning({ id: teams.id });
  const email = freshEmail('member');
  const [user] = await t.database.db.insert(users).values({ teamId: team!.id, email, displayName: 'Limit Probe', passwordHash, role: 'engineer' }).returning({ id: users.id });
  return { id: user!.id, email };
}

function signInAs(t: TestServer, email: string, password: string, forwardedFor?: string) {
  return fetch(`${t.baseUrl}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', ...(forwardedFor ? { 'x-forwarded-for': forwardedFor } : {}) },
    body: JSON.stringify({ email, password }),
  });
}

/** Failures this file made from the real loopback address must not count against later files. */
async function forgetLoopback(t: TestServer): Promise<void> {
  await createSignInLimits(t.database.pool, { accountLimit: 1, addressLimit: 1, windowMinutes: 1, lockoutMinutes: 1 }).clearAddress('127.0.0.1');
}

let passwordHash: string;
beforeAll(async () => {
  passwordHash = await hashPassword(PASSWORD);
});

describe('sign-in limits with TRUST_PROXY unset', () => {
  let t: TestServer;
  beforeAll(async () => {
    t = await startTestServer({ SIGN_IN_LIMIT: '3', SIGN_IN_ADDRESS_LIMIT: '8' });
    await forgetLoopback(t);
  });
  afterAll(async () => {
    await forgetLoopback(t);
    await t.close();
  });

  it('counts failures per account whatever X-Forwarded-For says, and refuses even the right password while locked', async () => {
    const user = await makeUser(t, passwordHash);
    const statuses: number[] = [];
    for (let i = 0; i < 4; i++) statuses.push((await signInAs(t, user.email, `guess-${i}`, freshAddress())).status);
    expect(statuses).toEqual([401, 401, 401, 429]);
    const right = await signInAs(t, user.email, PASSWORD, freshAddress());
    expect(right.status).toBe(429);
    expect((await readJson(right)).error).toMatchObject({ code: 'account_locked', message: expect.stringMatching(/unlocks at \d\d:\d\d UTC.*reset its password/) });
    expect(right.headers.getSetCookie().some((c) => c.startsWith('kinetwin.sid='))).toBe(false);
  });

  it('caps failures from one address across e-mails, X-Forwarded-For notwithstanding, without hashing the refused ones', async () => {
    await forgetLoopback(t);
    const user = await makeUser(t, passwordHash);
    const statuses: number[] = [];
    for (let i = 0; i < 8; i++) statuses.push((await signInAs(t, freshEmail('nobody'), 'guess', freshAddress())).status);
    expect(statuses).toEqual(Array(8).fill(401));
    let refused: Response | undefined;
    const work = await passwordWork(async () => {
      refused = await signInAs(t, user.email, PASSWORD, freshAddress());
    });
    expect(refused!.status).toBe(429);
    expect((await readJson(refused!)).error.code).toBe('rate_limited');
    expect(work).toEqual([]);
  });
});

describe('sign-in limits with TRUST_PROXY naming the proxy (127.0.0.1)', () => {
  let t: TestServer;
  beforeAll(async () => {
    t = await startTestServer({ TRUST_PROXY: '127.0.0.1', SIGN_IN_LIMIT: '3', SIGN_IN_ADDRESS_LIMIT: '4', ACCOUNT_REQUEST_LIMIT: '1000' });
  });
  afterAll(() => t.close());

  it('believes the proxy for the address, yet a new forwarded address on each try does not escape the account limit', async () => {
    const user = await makeUser(t, passwordHash);
    const statuses: number[] = [];
    for (let i = 0; i < 4; i++) statuses.push((await signInAs(t, user.email, `guess-${i}`, freshAddress())).status);
    expect(statuses).toEqual([401, 401, 401, 429]);
    expect((await signInAs(t, user.email, PASSWORD, freshAddress())).status).toBe(429);
  });

  it('caps failures per forwarded address across e-mails; an entry the client prepends does not move it', async () => {
    const user = await makeUser(t, passwordHash);
    const address = freshAddress();
    const statuses: number[] = [];
    // The proxy appends the address it saw; whatever the client wrote before it is not believed.
    for (let i = 0; i < 5; i++) statuses.push((await signInAs(t, freshEmail('nobody'), 'guess', `198.51.100.${i}, ${address}`)).status);
    expect(statuses).toEqual([401, 401, 401, 401, 429]);
    expect((await signInAs(t, user.email, PASSWORD, address)).status).toBe(429);
    // Another client behind the same proxy is not held up.
    expect((await signInAs(t, user.email, PASSWORD, freshAddress())).status).toBe(200);
  });

  it('lets the owner end a lockout by completing a password reset, which also signs them in', async () => {
    const user = await makeUser(t, passwordHash);
    for (let i = 0; i < 4; i++) await signInAs(t, user.email, `guess-${i}`, freshAddress());
    expect((await signInAs(t, user.email, PASSWORD, freshAddress())).status).toBe(429);

    const requested = await fetch(`${t.baseUrl}/api/auth/password-reset/request`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: user.email }) });
    expect(requested.status).toBe(202);
    const [mail] = await t.database.db.select().from(outbox).where(eq(outbox.toAddress, user.email)).orderBy(desc(outbox.id)).limit(1);
    const token = /token=([A-Za-z0-9_-]{43})/.exec(mail!.text)![1];
    const completed = await fetch(`${t.baseUrl}/api/auth/password-reset/complete`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ token, password: 'new-gear-backlash-9' }) });
    expect(completed.status).toBe(200);
    expect((await signInAs(t, user.email, 'new-gear-backlash-9', freshAddress())).status).toBe(200);
  });
});

describe('password checks at sign-in', () => {
  let t: TestServer;
  beforeAll(async () => {
    t = await startTestServer({ TRUST_PROXY: 'loopback' });
  });
  afterAll(() => t.close());

  it('checks a legacy bcrypt hash (off the main thread) and replaces it with scrypt at the next successful sign-in', async () => {
    const legacy = bcrypt.hashSync(PASSWORD, 4);
    const user = await makeUser(t, legacy);
    const stored = async () => (await t.database.db.select({ h: users.passwordHash }).from(users).where(eq(users.id, user.id)))[0]!.h;

    const wrong = await passwordWork(async () => expect((await signInAs(t, user.email, 'not-it', freshAddress())).status).toBe(401));
    expect(wrong).toEqual([{ scheme: 'bcrypt', purpose: 'verify' }]);
    expect(await stored()).toBe(legacy);

    const first = await passwordWork(async () => expect((await signInAs(t, user.email, PASSWORD, freshAddress())).status).toBe(200));
    expect(first).toEqual([
      { scheme: 'bcrypt', purpose: 'verify' },
      { scheme: 'scrypt', purpose: 'hash' },
    ]);
    expect(await stored()).toMatch(new RegExp(`^\\$scrypt\\$ln=${SCRYPT_PARAMS.log2N},r=${SCRYPT_PARAMS.r},p=${SCRYPT_PARAMS.p}\\$`));

    const second = await passwordWork(async () => expect((await signInAs(t, user.email, PASSWORD, freshAddress())).status).toBe(200));
    expect(second).toEqual([{ scheme: 'scrypt', purpose: 'verify' }]);
  });

  it('does the same work for an unknown e-mail as for a wrong password, and answers alike', async () => {
    const user = await makeUser(t, passwordHash);
    let known: Response | undefined;
    let unknown: Response | undefined;
    const knownWork = await passwordWork(async () => (known = await signInAs(t, user.email, 'not-it', freshAddress())));
    const unknownWork = await passwordWork(async () => (unknown = await signInAs(t, freshEmail('nobody'), 'not-it', freshAddress())));
    expect(knownWork).toEqual([{ scheme: 'scrypt', purpose: 'verify' }]);
    expect(unknownWork).toEqual(knownWork);
    expect([known!.status, unknown!.status]).toEqual([401, 401]);
    expect(await readJson(unknown!)).toEqual(await readJson(known!));
    expect((await readJson(await signInAs(t, freshEmail('nobody'), 'x', freshAddress()))).error.message).toBe(WRONG_CREDENTIALS);
  });
});
