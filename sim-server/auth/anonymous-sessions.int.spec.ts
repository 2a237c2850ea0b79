import { randomBytes } from 'node:crypto';
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../db/seed-demo';
import { apiClient, readJson, signInSession, startTestServer, type TestServer } from '../testing/test-server';
import { XSRF_COOKIE } from './csrf';

const engineer = DEMO_ACCOUNTS.find((a) => a.role === 'engineer')!;

describe('anonymous visitors and the session table', () => {
  let t: TestServer;
  beforeAll(async () => {
    // Forwarded addresses are believed from loopback, so each failed sign-in below comes from an address of its own.
    t = await startTestServer({ TRUST_PROXY: 'loopback', SESSION_PRUNE_INTERVAL_SECONDS: '1' });
  });
  afterAll(() => t.close());

  const sessionIds = async () => new Set((await t.database.db.execute<{ sid: string }>(sql`SELECT sid FROM session`)).rows.map((r) => r.sid));

  it('stores no session for 200 anonymous visits: CSRF tokens, app info, health, failed and malformed sign-ins', async () => {
    const before = await sessionIds();
    const stamp = randomBytes(4).toString('hex');
    const signIn = (body: unknown, i: number) =>
      fetch(`${t.baseUrl}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json', 'x-forwarded-for': `10.77.${i}.${randomBytes(1)[0]}` }, body: JSON.stringify(body) });
    const visits: Promise<Response>[] = [];
    for (let i = 0; i < 80; i++) visits.push(fetch(`${t.baseUrl}/api/auth/csrf`));
    for (let i = 0; i < 50; i++) visits.push(fetch(`${t.baseUrl}/api/app-info`));
    for (let i = 0; i < 40; i++) visits.push(fetch(`${t.baseUrl}/api/health`));
    for (let i = 0; i < 10; i++) visits.push(fetch(`${t.baseUrl}/api/auth/me`));
    for (let i = 0; i < 10; i++) visits.push(signIn({ email: '', password: 1 }, i));
    for (let i = 0; i < 10; i++) visits.push(signIn({ email: `visitor-${stamp}-${i}@anonymous.example.test`, password: 'guess' }, i));
    const answers = await Promise.all(visits);
    expect(answers).toHaveLength(200);
    const statuses = new Map<number, number>();
    for (const res of answers) statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1);
    expect(Object.fromEntries(statuses)).toEqual({ 200: 170, 401: 20, 400: 10 });
    expect(answers.some((res) => res.headers.getSetCookie().some((c) => c.startsWith('kinetwin.sid=')))).toBe(false);

    const tokens = await Promise.all(answers.slice(0, 80).map(async (res) => ({ body: (await readJson(res)).csrfToken as string, cookie: res.headers.getSetCookie().find((c) => c.startsWith(`${XSRF_COOKIE}=`)) })));
    for (const { body, cookie } of tokens) {
      expect(body).toMatch(/^[A-Za-z0-9_-]{43}\.[A-Za-z0-9_-]{43}$/);
      expect(cookie?.split(';')[0]).toBe(`${XSRF_COOKIE}=${body}`);
    }
    expect(new Set(tokens.map((x) => x.body)).size).toBe(80);

    const after = await sessionIds();
    expect([...after].filter((sid) => !before.has(sid))).toEqual([]);
  });

  it('keeps the synchronizer token of a signed-in session, which unsafe requests must carry', async () => {
    const session = await signInSession(t.baseUrl, engineer.email, engineer.password);
    const csrf = await fetch(`${t.baseUrl}/api/auth/csrf`, { headers: { cookie: session.cookie } });
    expect((await readJson(csrf)).csrfToken).toBe(session.csrfToken);
    const withAnonymousToken = await apiClient(t.baseUrl, { cookie: session.cookie, csrfToken: (await readJson(await fetch(`${t.baseUrl}/api/auth/csrf`))).csrfToken }).post('/api/auth/sign-out-everywhere');
    expect(withAnonymousToken.status).toBe(403);
    expect((await readJson(withAnonymousToken)).error.code).toBe('csrf');
  });

  it('prunes an expired session row on the configured schedule', async () => {
    const sid = `expired-probe-${randomBytes(6).toString('hex')}`;
    await t.database.db.execute(sql`INSERT INTO session (sid, sess, expire) VALUES (${sid}, ${JSON.stringify({ cookie: {} })}, now() - interval '1 hour')`);
    // The store arms its prune timer at its first session operation: one sign-in does that.
    await signInSession(t.baseUrl, engineer.email, engineer.password);
    let present = true;
    for (let i = 0; i < 100 && present; i++) {
      await new Promise((r) => setTimeout(r, 100));
      present = (await sessionIds()).has(sid);
    }
    expect(present).toBe(false);
  });
});
