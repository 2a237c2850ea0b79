import { and, desc, eq, sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { invitations, outbox, passwordResets, users } from '../../drizzle/schema';
import { CSRF_HEADER } from '../../shared/protocol/library-api';
import { apiClient, readJson, signInSession, startTestServer, type TestServer, type TestSession } from '../testing/test-server';
import { DUPLICATE_EMAIL } from './account-store';
import { RESET_REQUESTED } from './password-reset-routes';

const PASSWORD = 'hinge-torque-42';

describe('accounts: sign-up, invitations, password reset, sign-out everywhere, CSRF and origin', () => {
  let t: TestServer;
  let founder: { session: TestSession; id: number; email: string };
  const stamp = Date.now();
  const email = (who: string) => `${who}-${stamp}@accounts.example.test`;

  beforeAll(async () => {
    t = await startTestServer({ ACCOUNT_REQUEST_LIMIT: '1000' });
    const res = await apiClient(t.baseUrl, null).post('/api/auth/sign-up', { email: email('founder'), password: PASSWORD, displayName: 'Ada Founder', teamName: 'Founders lab' });
    expect(res.status).toBe(201);
    const body = await readJson(res);
    const cookie = res.headers.getSetCookie().find((c) => c.startsWith('kinetwin.sid='))!.split(';')[0]!;
    founder = { session: { cookie, csrfToken: body.csrfToken }, id: body.user.id, email: email('founder') };
  });
  afterAll(() => t.close());

  const anonymous = () => apiClient(t.baseUrl, null);
  const founderApi = () => apiClient(t.baseUrl, founder.session);
  const lastMailTo = async (to: string) => (await t.database.db.select().from(outbox).where(eq(outbox.toAddress, to)).orderBy(desc(outbox.id)).limit(1))[0];
  const tokenIn = (text: string) => /token=([A-Za-z0-9_-]{43})/.exec(text)?.[1] ?? null;

  it('makes the founder of a new team its admin, and a later sign-up without invitation founds another', async () => {
    const team = await readJson(await founderApi().get('/api/team'));
    expect(team).toEqual({ team: { id: expect.any(Number), name: 'Founders lab' }, members: [expect.objectContaining({ id: founder.id, role: 'admin' })] });
    const second = await anonymous().post('/api/auth/sign-up', { email: email('solo'), password: PASSWORD, displayName: 'Solo Sam' });
    expect(second.status).toBe(201);
    const cookie = second.headers.getSetCookie().find((c) => c.startsWith('kinetwin.sid='))!.split(';')[0]!;
    const theirs = await readJson(await apiClient(t.baseUrl, { cookie, csrfToken: (await readJson(second)).csrfToken }).get('/api/team'));
    expect(theirs.team).toMatchObject({ name: "Solo Sam's team" });
    expect(theirs.team.id).not.toBe(team.team.id);
    expect(theirs.members).toEqual([expect.objectContaining({ role: 'admin' })]);
  });

  it('refuses duplicate e-mails (any case) and weak passwords with clear messages', async () => {
    const dup = await anonymous().post('/api/auth/sign-up', { email: founder.email.toUpperCase(), password: PASSWORD, displayName: 'Copy' });
    expect(dup.status).toBe(409);
    expect((await readJson(dup)).error).toMatchObject({ code: 'duplicate_email', message: DUPLICATE_EMAIL });
    const weak: [string, RegExp][] = [
      ['short', /at least 10 characters/],
      ['password123', /most common passwords/],
      ['zzzzzzzzzzzz', /one character repeated/],
      ['abababababab', /at least 4 different characters/],
      [`weakling-${stamp}-x`, /e-mail name/],
    ];
    for (const [password, message] of weak) {
      const res = await anonymous().post('/api/auth/sign-up', { email: `weakling-${stamp}@accounts.example.test`, password, displayName: 'Weak' });
      expect(res.status, password).toBe(400);
      const body = await readJson(res);
      expect(body.error.fields).toEqual([{ field: 'password', message: expect.stringMatching(message) }]);
    }
    const malformed = await anonymous().post('/api/auth/sign-up', { email: 'no-at-sign', password: PASSWORD, displayName: 'x'.repeat(81), extra: 1 });
    expect((await readJson(malformed)).error.fields.map((f: { field: string }) => f.field).sort()).toEqual(['', 'displayName', 'email']);
    expect((await t.database.db.select().from(users).where(eq(users.email, `weakling-${stamp}@accounts.example.test`))).length).toBe(0);
  });

  it('invites by e-mail with a single-use link that joins the team in the invited role', async () => {
    const invitee = email('invitee');
    const res = await founderApi().post('/api/team/invitations', { email: invitee, role: 'lead' });
    expect(res.status).toBe(201);
    const mail = await lastMailTo(invitee);
    expect(mail!.subject).toBe('Ada Founder invited you to Founders lab on Kinetwin');
    const token = tokenIn(mail!.text)!;
    expect(mail!.html).toContain(`${t.baseUrl}/accept-invitation?token=${token}`);
    // Only the hash is stored.
    const [stored] = await t.database.db.select().from(invitations).where(eq(invitations.email, invitee));
    expect(stored!.tokenHash).not.toContain(token);
    expect(JSON.stringify(await readJson(await founderApi().get('/api/team/invitations')))).not.toContain(token);

    expect(await readJson(await anonymous().post('/api/auth/invitations/lookup', { token }))).toMatchObject({ email: invitee, teamName: 'Founders lab', role: 'lead' });
    const wrongAddress = await anonymous().post('/api/auth/sign-up', { email: email('someone-else'), password: PASSWORD, displayName: 'Eve', invitationToken: token });
    expect(wrongAddress.status).toBe(400);
    const joined = await anonymous().post('/api/auth/sign-up', { email: invitee, password: PASSWORD, displayName: 'Ivo Invitee', invitationToken: token });
    expect(joined.status).toBe(201);
    expect((await readJson(joined)).user).toMatchObject({ email: invitee, role: 'lead' });
    expect((await readJson(await founderApi().get('/api/team'))).members.map((m: { email: string }) => m.email)).toContain(invitee);

    const again = await anonymous().post('/api/auth/sign-up', { email: email('late'), password: PASSWORD, displayName: 'Late', invitationToken: token });
    expect(again.status).toBe(410);
    expect((await readJson(again)).error.code).toBe('token_used');
    expect((await founderApi().post('/api/team/invitations', { email: invitee, role: 'viewer' })).status).toBe(409);
  });

  it('refuses expired, forged, withdrawn and replaced invitation links', async () => {
    const invite = async (to: string) => {
      expect((await founderApi().post('/api/team/invitations', { email: to, role: 'viewer' })).status).toBe(201);
      return tokenIn((await lastMailTo(to))!.text)!;
    };
    const expiredTo = email('expired');
    const expired = await invite(expiredTo);
    await t.database.db.update(invitations).set({ expiresAt: sql`now() - interval '1 minute'` }).where(eq(invitations.email, expiredTo));
    const signUp = (to: string, token: string) => anonymous().post('/api/auth/sign-up', { email: to, password: PASSWORD, displayName: 'Someone', invitationToken: token });
    const late = await signUp(expiredTo, expired);
    expect(late.status).toBe(410);
    expect((await readJson(late)).error.code).toBe('token_expired');

    const forged = await signUp(expiredTo, expired.slice(0, -1) + (expired.endsWith('A') ? 'B' : 'A'));
    expect(forged.status).toBe(400);
    expect((await readJson(forged)).error.code).toBe('invalid_token');
    expect((await signUp(expiredTo, 'not-a-token')).status).toBe(400);

    const replacedTo = email('replaced');
    const first = await invite(replacedTo);
    const second = await invite(replacedTo);
    expect((await signUp(replacedTo, first)).status).toBe(410);
    const { items } = await readJson(await founderApi().get('/api/team/invitations'));
    const pending = items.find((i: { email: string }) => i.email === replacedTo);
    expect((await founderApi().delete(`/api/team/invitations/${pending.id}`)).status).toBe(204);
    expect((await signUp(replacedTo, second)).status).toBe(410);
    expect((await t.database.db.select().from(users).where(eq(users.email, replacedTo))).length).toBe(0);
  });

  it('resets a password by a single-use e-mailed link that also signs out every other session', async () => {
    const other = await signInSession(t.baseUrl, founder.email, PASSWORD);
    expect((await apiClient(t.baseUrl, other).get('/api/auth/me')).status).toBe(200);

    const unknown = await anonymous().post('/api/auth/password-reset/request', { email: 'nobody-at-all@accounts.example.test' });
    expect(unknown.status).toBe(202);
    expect((await readJson(unknown)).message).toBe(RESET_REQUESTED);
    expect(await lastMailTo('nobody-at-all@accounts.example.test')).toBeUndefined();

    const requested = await anonymous().post('/api/auth/password-reset/request', { email: founder.email.toUpperCase() });
    expect(requested.status).toBe(202);
    expect(await readJson(requested)).toEqual({ message: RESET_REQUESTED });
    const token = tokenIn((await lastMailTo(founder.email))!.text)!;

    const weak = await anonymous().post('/api/auth/password-reset/complete', { token, password: 'password123' });
    expect(weak.status).toBe(400);
    // The same link used twice at once: both pass the first read while their hashes run; the
    // locked second read lets exactly one through.
    const race = await Promise.all([0, 1].map(() => anonymous().post('/api/auth/password-reset/complete', { token, password: 'new-hinge-torque-7' })));
    expect(race.map((r) => r.status).sort()).toEqual([200, 410]);
    const [done, twin] = race[0]!.status === 200 ? race : [race[1]!, race[0]!];
    expect((await readJson(twin!)).error.code).toBe('token_used');
    expect((await readJson(done)).user.id).toBe(founder.id);
    expect((await apiClient(t.baseUrl, other).get('/api/auth/me')).status).toBe(401);
    expect((await founderApi().get('/api/auth/me')).status).toBe(401);
    expect((await anonymous().post('/api/auth/password-reset/complete', { token, password: 'another-hinge-8' })).status).toBe(410);
    founder.session = await signInSession(t.baseUrl, founder.email, 'new-hinge-torque-7');

    await anonymous().post('/api/auth/password-reset/request', { email: founder.email });
    const stale = tokenIn((await lastMailTo(founder.email))!.text)!;
    await t.database.db.update(passwordResets).set({ expiresAt: sql`now() - interval '1 second'` }).where(and(eq(passwordResets.userId, founder.id)));
    const expired = await anonymous().post('/api/auth/password-reset/complete', { token: stale, password: 'another-hinge-8' });
    expect(expired.status).toBe(410);
    expect((await readJson(expired)).error.code).toBe('token_expired');
    const forged = await anonymous().post('/api/auth/password-reset/complete', { token: 'Q'.repeat(43), password: 'another-hinge-8' });
    expect(forged.status).toBe(400);
    expect(JSON.stringify(await readJson(forged))).not.toContain(founder.email);
    expect((await signInSession(t.baseUrl, founder.email, 'new-hinge-torque-7')).cookie).toMatch(/^kinetwin\.sid=/);
  });

  it('signs out everywhere', async () => {
    const a = await signInSession(t.baseUrl, founder.email, 'new-hinge-torque-7');
    const b = await signInSession(t.baseUrl, founder.email, 'new-hinge-torque-7');
    expect((await apiClient(t.baseUrl, a).post('/api/auth/sign-out-everywhere')).status).toBe(204);
    expect((await apiClient(t.baseUrl, b).get('/api/auth/me')).status).toBe(401);
    expect((await apiClient(t.baseUrl, a).get('/api/auth/me')).status).toBe(401);
    founder.session = await signInSession(t.baseUrl, founder.email, 'new-hinge-torque-7');
    expect((await founderApi().get('/api/auth/me')).status).toBe(200);
  });

  it('manages members: role changes take effect at once, removal ends sessions, the last admin stays', async () => {
    const team = await readJson(await founderApi().get('/api/team'));
    const lead = team.members.find((m: { role: string }) => m.role === 'lead');
    const leadSession = await signInSession(t.baseUrl, lead.email, PASSWORD);
    expect((await founderApi().patch(`/api/team/members/${lead.id}`, { role: 'viewer' })).status).toBe(200);
    expect((await readJson(await apiClient(t.baseUrl, leadSession).get('/api/auth/me'))).user.role).toBe('viewer');
    expect((await founderApi().patch(`/api/team/members/${lead.id}`, { role: 'owner' })).status).toBe(400);
    expect((await founderApi().patch(`/api/team/members/${founder.id}`, { role: 'engineer' })).status).toBe(409);
    expect((await founderApi().delete(`/api/team/members/${founder.id}`)).status).toBe(409);
    expect((await founderApi().delete('/api/team/members/987654')).status).toBe(404);
    expect((await founderApi().delete(`/api/team/members/${lead.id}`)).status).toBe(204);
    expect((await apiClient(t.baseUrl, leadSession).get('/api/auth/me')).status).toBe(401);
    const signIn = await anonymous().post('/api/auth/sign-in', { email: lead.email, password: PASSWORD });
    expect(signIn.status).toBe(401);
  });

  it('needs the CSRF token on unsafe requests; GET /api/auth/csrf hands it out and sets the XSRF cookie', async () => {
    const csrf = await founderApi().get('/api/auth/csrf');
    const { csrfToken } = await readJson(csrf);
    expect(csrfToken).toBe(founder.session.csrfToken);
    expect(csrf.headers.getSetCookie().find((c) => c.startsWith('XSRF-TOKEN='))).toContain(`XSRF-TOKEN=${csrfToken}`);
    const body = { scenario: {}, baseRevision: 1 };
    const without = await fetch(`${t.baseUrl}/api/scenarios`, { method: 'POST', headers: { cookie: founder.session.cookie, 'content-type': 'application/json' }, body: JSON.stringify(body) });
    expect(without.status).toBe(403);
    expect((await readJson(without)).error.message).toContain(CSRF_HEADER);
    // Angular's own header name is accepted too.
    const angular = await fetch(`${t.baseUrl}/api/team/invitations`, {
      method: 'POST',
      headers: { cookie: founder.session.cookie, 'content-type': 'application/json', 'x-xsrf-token': csrfToken },
      body: JSON.stringify({ email: email('via-angular'), role: 'viewer' }),
    });
    expect(angular.status).toBe(201);
  });

  it('refuses sign-in, sign-up and other unsafe requests sent from another origin', async () => {
    const evil = { origin: 'https://evil.example' };
    const signIn = await anonymous().request('POST', '/api/auth/sign-in', { email: founder.email, password: 'new-hinge-torque-7' }, evil);
    expect(signIn.status).toBe(403);
    expect((await readJson(signIn)).error.code).toBe('bad_origin');
    expect((await anonymous().request('POST', '/api/auth/sign-up', { email: email('evil'), password: PASSWORD, displayName: 'E' }, evil)).status).toBe(403);
    expect((await anonymous().request('POST', '/api/auth/sign-in', { email: founder.email, password: 'new-hinge-torque-7' }, { referer: 'https://evil.example/page' })).status).toBe(403);
    expect((await founderApi().request('POST', '/api/auth/sign-out-everywhere', {}, evil)).status).toBe(403);
    // Live runs too: a socket handshake from another site's page is refused before any session is read.
    const handshake = (origin: string) => fetch(`${t.baseUrl}/socket.io/?EIO=4&transport=polling`, { headers: { origin, cookie: founder.session.cookie } });
    expect((await handshake('https://evil.example')).status).toBe(403);
    expect((await handshake(t.baseUrl)).status).toBe(200);
    // The app's own origin (and no Origin at all, i.e. not a browser) are fine.
    expect((await anonymous().request('POST', '/api/auth/sign-in', { email: founder.email, password: 'new-hinge-torque-7' }, { origin: t.baseUrl })).status).toBe(200);
    expect((await anonymous().request('POST', '/api/auth/sign-in', { email: founder.email, password: 'new-hinge-torque-7' }, { origin: t.config.appBaseUrl })).status).toBe(200);
  });
});

describe('account request limits', () => {
  let t: TestServer;
  beforeAll(async () => {
    t = await startTestServer({ ACCOUNT_REQUEST_LIMIT: '2' });
  });
  afterAll(() => t.close());

  it('throttles password-reset requests from one address', async () => {
    const api = apiClient(t.baseUrl, null);
    const statuses: number[] = [];
    for (let i = 0; i < 3; i++) statuses.push((await api.post('/api/auth/password-reset/request', { email: `probe-${i}@accounts.example.test` })).status);
    expect(statuses).toEqual([202, 202, 429]);
    const limited = await api.post('/api/auth/password-reset/request', { email: 'probe@accounts.example.test' });
    expect((await readJson(limited)).error).toMatchObject({ code: 'rate_limited', message: expect.stringMatching(/Try again in \d+ minutes/) });
  });
});
