import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../db/seed-demo';
import { readJson, signIn, startTestServer, type TestServer } from '../testing/test-server';
import { WRONG_CREDENTIALS } from './auth-routes';
import { createSignInLimits } from './sign-in-limits';

const engineer = DEMO_ACCOUNTS.find((a) => a.role === 'engineer')!;

describe('sign-in against the real database', () => {
  let t: TestServer;
  beforeAll(async () => {
    t = await startTestServer({ SIGN_IN_LIMIT: '3' });
    await loopbackLimits().clearAddress('127.0.0.1');
  });
  afterAll(async () => {
    // Failures from loopback here must not count against the files that run next.
    await loopbackLimits().clearAddress('127.0.0.1');
    await t.close();
  });
  const loopbackLimits = () => createSignInLimits(t.database.pool, { accountLimit: 1, addressLimit: 1, windowMinutes: 1, lockoutMinutes: 1 });

  const post = (body: unknown, cookie?: string) =>
    fetch(`${t.baseUrl}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', ...(cookie ? { cookie } : {}) },
      body: typeof body === 'string' ? body : JSON.stringify(body),
    });

  it('signs the demo engineer in, case-insensitively, and reports the user', async () => {
    const cookie = await signIn(t.baseUrl, engineer.email.toUpperCase(), engineer.password);
    const me = await fetch(`${t.baseUrl}/api/auth/me`, { headers: { cookie } });
    expect(me.status).toBe(200);
    expect(await readJson(me)).toEqual({ user: expect.objectContaining({ email: engineer.email, role: 'engineer' }) });
  });

  it('answers a wrong password and an unknown e-mail with the same words', async () => {
    const wrongPassword = await post({ email: engineer.email, password: 'not-it' });
    const unknownEmail = await post({ email: 'nobody@demo.kinetwin.test', password: engineer.password });
    expect(wrongPassword.status).toBe(401);
    expect(unknownEmail.status).toBe(401);
    const a = await readJson(wrongPassword);
    const b = await readJson(unknownEmail);
    expect(a.error.message).toBe(WRONG_CREDENTIALS);
    expect(b).toEqual(a);
  });

  it('refuses a malformed body with field errors', async () => {
    const res = await post({ email: '', password: 42 });
    expect(res.status).toBe(400);
    const body = await readJson(res);
    expect(body.error.fields.map((f: { field: string }) => f.field).sort()).toEqual(['email', 'password']);
    const junk = await post('{"email":');
    expect(junk.status).toBe(400);
    expect((await readJson(junk)).error.code).toBe('bad_json');
  });

  it('locks an account after its limit of failures, and not the others', async () => {
    // A fresh address each run: the counters live in PostgreSQL and outlast this server.
    const email = `rate-limit-probe-${Date.now()}@demo.kinetwin.test`;
    const statuses: number[] = [];
    for (let i = 0; i < 4; i++) statuses.push((await post({ email, password: `guess-${i}` })).status);
    expect(statuses).toEqual([401, 401, 401, 429]);
    const limited = await post({ email, password: 'guess-5' });
    expect(limited.headers.get('retry-after')).toMatch(/^\d+$/);
    const body = await readJson(limited);
    expect(body.error.code).toBe('account_locked');
    expect(body.error.message).toMatch(/locked after too many failed sign-ins.*Forgot your password/);
    // A different e-mail from the same address is still served.
    expect((await post({ email: engineer.email, password: engineer.password })).status).toBe(200);
  });

  it('keeps /me closed without a session and ends the session on sign-out', async () => {
    expect((await fetch(`${t.baseUrl}/api/auth/me`)).status).toBe(401);
    const cookie = await signIn(t.baseUrl, engineer.email, engineer.password);
    const out = await fetch(`${t.baseUrl}/api/auth/sign-out`, { method: 'POST', headers: { cookie } });
    expect(out.status).toBe(204);
    expect((await fetch(`${t.baseUrl}/api/auth/me`, { headers: { cookie } })).status).toBe(401);
  });

  it('sends security headers with a content policy that allows no external host', async () => {
    const res = await fetch(`${t.baseUrl}/api/health`);
    const csp = res.headers.get('content-security-policy') ?? '';
    expect(csp).toContain("default-src 'self'");
    expect(csp).not.toMatch(/https?:/);
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
  });
});
