import { gzipSync } from 'node:zlib';
import { desc, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { outbox, users } from '../../drizzle/schema';
import { LOG_UPLOAD_PATHS } from '../logs/log-upload';
import { createTestTeam, demoScenarioDocument, readJson, startTestServer, TEST_PASSWORD, type TestServer } from '../testing/test-server';
import { snapshotTables, type TableState } from '../testing/table-snapshot';

/** The malformed ids issue 9 measured as 500s: a lone %, a byte that is no UTF-8, an overlong "/" and a cut-off sequence. */
const MALFORMED_IDS = ['%', '%FF', '%C0%AF', '%E0%A4%A'];

/** The sign-in limiter and the account limiter must not turn these probes into 429s. */
const GENEROUS_LIMITS = { SIGN_IN_LIMIT: '1000', SIGN_IN_ADDRESS_LIMIT: '100000', ACCOUNT_REQUEST_LIMIT: '1000' };
/** Sessions and sign-in counters change with every sign-in by design; they are not stored input. */
const SIGN_IN_STATE = { tables: ['session', 'sign_in_limits'] };

describe('hostile REST input: 4xx with the field named, nothing stored', () => {
  let t: TestServer;
  let team: Awaited<ReturnType<typeof createTestTeam>>;
  let scenarioId: number;
  let before: Record<string, TableState>;

  const raw = (method: string, path: string, body: string | Buffer | undefined, headers: Record<string, string>, signedIn = true) => {
    const session = team.members.admin.session;
    return fetch(`${t.baseUrl}${path}`, { method, headers: { ...(signedIn ? { cookie: session.cookie, 'x-csrf-token': session.csrfToken } : {}), ...headers }, body });
  };

  beforeAll(async () => {
    t = await startTestServer(GENEROUS_LIMITS);
    team = await createTestTeam(t, 'Hostile lab');
    const res = await team.members.admin.api.post('/api/scenarios', { scenario: { ...demoScenarioDocument(), name: 'Hostile axis' } });
    expect(res.status).toBe(201);
    scenarioId = (await readJson(res)).id;
    before = await snapshotTables(t.database.pool, SIGN_IN_STATE);
  });
  afterAll(() => t.close());

  it('answers 400 naming the parameter for malformed percent-encoding on every :param of every route', async () => {
    const withParams = t.server.routes.filter((r) => r.path.includes('/:'));
    expect(withParams.length).toBeGreaterThan(15);
    for (const route of withParams) {
      const names = route.path.split('/').filter((s) => s.startsWith(':'));
      for (const [i, name] of names.entries()) {
        for (const bad of MALFORMED_IDS) {
          // The other parameters hold good ids, so the bad one is the only fault.
          let k = 0;
          const path = route.path.replace(/:[A-Za-z]+/g, () => (k++ === i ? bad : String(scenarioId)));
          const res = await raw(route.method.toUpperCase(), path, undefined, {});
          const body = await readJson(res);
          const label = `${route.method} ${path} → ${res.status} ${JSON.stringify(body)}`;
          expect(res.status, label).toBe(400);
          expect(body.error.fields, label).toEqual([{ field: name.slice(1), message: expect.stringContaining('percent-encoded') }]);
          expect(body.error.message, label).toContain(name.slice(1));
        }
      }
    }
  });

  it('answers 400 naming the parameter for ids out of range, negative or not numbers', async () => {
    for (const bad of ['2147483648', '1e400', '-1', '0', '1.5', '%D9%A3', '%00']) {
      const res = await raw('GET', `/api/scenarios/${scenarioId}/revisions/${bad}`, undefined, {});
      const body = await readJson(res);
      expect(res.status, bad).toBe(400);
      expect(body.error.fields, bad).toEqual([{ field: 'n', message: expect.stringContaining('revision number') }]);
    }
  });

  it('refuses a NUL or a lone surrogate in every kind of text field with 400 naming the field', async () => {
    const { admin, lead } = team.members;
    const doc = demoScenarioDocument();
    for (const bad of ['x\u0000', '\ud800', 'ok\udfff']) {
      const cases: [string, string, unknown, string][] = [
        ['post', '/api/scenarios', { scenario: { ...doc, name: bad } }, 'scenario.name'],
        ['post', '/api/scenarios', { scenario: { ...doc, notes: bad } }, 'scenario.notes'],
        ['post', '/api/scenarios/import', { file: { ...doc, name: bad } }, 'file.name'],
        ['put', `/api/scenarios/${scenarioId}`, { scenario: { ...doc, name: bad }, baseRevision: 1 }, 'scenario.name'],
        ['patch', `/api/scenarios/${scenarioId}`, { tags: ['fine', bad] }, 'tags.1'],
        ['post', `/api/scenarios/${scenarioId}/duplicate`, { name: bad }, 'name'],
        ['post', `/api/scenarios/${scenarioId}/revisions/1/comments`, { body: bad }, 'body'],
        ['post', `/api/scenarios/${scenarioId}/handoffs`, { toUserId: lead.id, access: 'view', message: bad }, 'message'],
        ['post', '/api/team/invitations', { email: `a${bad}@example.test`, role: 'viewer' }, 'email'],
        ['post', '/api/auth/sign-up', { email: 'new@example.test', password: TEST_PASSWORD, displayName: bad }, 'displayName'],
      ];
      for (const [method, path, body, field] of cases) {
        const res = await admin.api.request(method, path, body);
        const answer = await readJson(res);
        const label = `${method} ${path} ${JSON.stringify(bad)} → ${res.status} ${JSON.stringify(answer)}`;
        expect(res.status, label).toBe(400);
        expect(answer.error.fields?.[0]?.field, label).toBe(field);
        expect(answer.error.message, label).toMatch(/NUL character|lone surrogate/);
      }
      // The e-mail at sign-in, without a session.
      const signIn = await raw('POST', '/api/auth/sign-in', JSON.stringify({ email: `${admin.email}${bad}`, password: TEST_PASSWORD }), { 'content-type': 'application/json' }, false);
      expect(signIn.status).toBe(400);
      expect((await readJson(signIn)).error.fields[0].field).toBe('email');
    }
  });

  it('refuses ?q=%00 in the library search and NUL in any query parameter with 400 naming it', async () => {
    for (const [path, field] of [
      ['/api/scenarios?q=%00', 'q'],
      ['/api/scenarios?q=axis%00', 'q'],
      [`/api/scenarios/${scenarioId}/diff?from=1&to=%00`, 'to'],
      ['/api/team/activity?kind=%00', 'kind'],
    ] as const) {
      const res = await team.members.admin.api.get(path);
      const body = await readJson(res);
      expect(res.status, path).toBe(400);
      expect(body.error.fields[0].field, path).toBe(field);
    }
    // A character that is fine in a search still searches.
    expect((await team.members.admin.api.get('/api/scenarios?q=%C3%BC')).status).toBe(200);
  });

  it('never lets an object e-mail crash the sign-in limiter', async () => {
    for (const email of [{ toString: 1 }, { toString: null, valueOf: null }, ['a'], 5, null]) {
      const res = await raw('POST', '/api/auth/sign-in', JSON.stringify({ email, password: 'x' }), { 'content-type': 'application/json' }, false);
      expect(res.status, JSON.stringify(email)).toBe(400);
      expect((await readJson(res)).error.fields[0].field).toBe('email');
    }
  });

  it('answers 415 to a raw {} that is not sent as application/json, on every route that takes a body', async () => {
    const mutating = t.server.routes.filter((r) => r.method !== 'get');
    for (const contentType of [undefined, 'application/x-www-form-urlencoded', 'text/plain', 'multipart/form-data; boundary=x', 'application/xml', 'application/merge-patch+json']) {
      for (const route of mutating) {
        const path = route.path.replace(/:[A-Za-z]+/g, String(scenarioId));
        // fetch adds text/plain to a string body; a Buffer body goes out with no Content-Type at all.
        const res = await raw(route.method.toUpperCase(), path, contentType ? '{}' : Buffer.from('{}'), contentType ? { 'content-type': contentType } : {});
        const body = await readJson(res);
        const label = `${route.method} ${path} as ${contentType} → ${res.status} ${JSON.stringify(body)}`;
        // Log uploads take multipart/form-data: a broken one is refused by the upload's own reader.
        if (contentType?.startsWith('multipart/') && route.method === 'post' && (LOG_UPLOAD_PATHS as readonly string[]).includes(route.path)) {
          expect(res.status, label).toBe(400);
          expect(body.error.message, label).toContain('multipart/form-data');
          continue;
        }
        expect(res.status, label).toBe(415);
        expect(body.error, label).toMatchObject({ code: 'unsupported_media_type', message: expect.stringContaining('application/json') });
      }
    }
  });

  it('answers 415 with a message to compressed bodies and to charsets other than UTF-8 (RFC 9110 §15.5.16)', async () => {
    const json = JSON.stringify({ email: 'nobody@example.test', password: 'x' });
    const cases: [Record<string, string>, string | Buffer, string][] = [
      [{ 'content-type': 'application/json', 'content-encoding': 'gzip' }, json, 'unsupported_encoding'],
      [{ 'content-type': 'application/json', 'content-encoding': 'gzip' }, gzipSync(json), 'unsupported_encoding'],
      [{ 'content-type': 'application/json', 'content-encoding': 'br' }, json, 'unsupported_encoding'],
      [{ 'content-type': 'application/json', 'content-encoding': 'x-kinetwin-unknown' }, json, 'unsupported_encoding'],
      [{ 'content-type': 'application/json; charset=latin1' }, json, 'unsupported_charset'],
      [{ 'content-type': 'application/json; charset=koi8-r' }, json, 'unsupported_charset'],
      // body-parser itself would decode these two.
      [{ 'content-type': 'application/json; charset=utf-7' }, json, 'unsupported_charset'],
      [{ 'content-type': 'application/json; charset="UTF-16"' }, json, 'unsupported_charset'],
    ];
    for (const signedIn of [false, true]) {
      for (const [headers, body, code] of cases) {
        const res = await raw('POST', '/api/auth/sign-in', body, headers, signedIn);
        const answer = await readJson(res);
        const label = `${JSON.stringify(headers)} → ${res.status} ${JSON.stringify(answer)}`;
        expect(res.status, label).toBe(415);
        expect(answer.error.code, label).toBe(code);
        expect(answer.error.message, label).toMatch(/send (it uncompressed|UTF-8)/);
        if (code === 'unsupported_encoding') expect(res.headers.get('accept-encoding'), label).toBe('identity');
      }
    }
    // The same body as plain UTF-8 JSON reaches the route.
    expect((await raw('POST', '/api/auth/sign-in', json, { 'content-type': 'application/json; charset=utf-8' }, false)).status).toBe(401);
    expect((await raw('POST', '/api/auth/sign-in', json, { 'content-type': 'application/json;charset="UTF-8"' }, false)).status).toBe(401);
  });

  it('answers every API request with Cache-Control: no-store, errors included (RFC 9111 §5.2.2.5)', async () => {
    const admin = team.members.admin.api;
    const answers = [
      await admin.get('/api/scenarios'),
      await admin.get(`/api/scenarios/${scenarioId}`),
      await admin.get('/api/team'),
      await admin.get('/api/auth/me'),
      await admin.get('/api/health'),
      await admin.get('/api/scenarios/987654'),
      await admin.get('/api/scenarios/%FF'),
      await admin.get('/api/no-such-route'),
      await fetch(`${t.baseUrl}/api/scenarios`),
      await raw('POST', '/api/auth/sign-in', '{', { 'content-type': 'application/json' }, false),
    ];
    expect(answers.map((r) => r.status)).toEqual([200, 200, 200, 200, 200, 404, 400, 404, 401, 400]);
    for (const res of answers) expect(res.headers.get('cache-control'), res.url).toBe('no-store');
  });

  // Tests run in declaration order within a file: everything above was refused, so nothing changed.
  it('stored nothing for any of the refused requests above', async () => {
    const after = await snapshotTables(t.database.pool, SIGN_IN_STATE);
    expect(after).toEqual(before);
  });

  it('still takes a body-less POST where the route needs no body', async () => {
    expect((await raw('POST', `/api/scenarios/${scenarioId}/archive`, undefined, {})).status).toBe(200);
    expect((await raw('POST', `/api/scenarios/${scenarioId}/unarchive`, undefined, { 'content-length': '0', 'content-type': 'text/plain' })).status).toBe(200);
  });

  it('keeps CR and LF out of mail subjects built from a display name or a scenario name', async () => {
    const { admin, lead } = team.members;
    await t.database.db.update(users).set({ displayName: 'Ada\r\nBcc: everyone@example.test' }).where(eq(users.id, admin.id));
    const created = await admin.api.post('/api/scenarios', { scenario: { ...demoScenarioDocument(), name: 'Wrist\r\nBcc: all@example.test\nX-Priority: 1' } });
    expect(created.status).toBe(201);
    const id = (await readJson(created)).id;
    expect((await admin.api.post(`/api/scenarios/${id}/handoffs`, { toUserId: lead.id, access: 'view' })).status).toBe(201);
    expect((await admin.api.post('/api/team/invitations', { email: 'header-probe@example.test', role: 'viewer' })).status).toBe(201);

    const [handoff] = await t.database.db.select().from(outbox).where(eq(outbox.toAddress, lead.email)).orderBy(desc(outbox.id));
    const [invitation] = await t.database.db.select().from(outbox).where(eq(outbox.toAddress, 'header-probe@example.test'));
    expect(handoff!.subject).toBe('Ada Bcc: everyone@example.test handed you "Wrist Bcc: all@example.test X-Priority: 1"');
    expect(invitation!.subject).toBe('Ada Bcc: everyone@example.test invited you to Hostile lab on Kinetwin');
    for (const mail of [handoff!, invitation!]) expect(mail.subject).not.toMatch(/[\r\n]/);
    await t.database.db.update(users).set({ displayName: admin.displayName }).where(eq(users.id, admin.id));
  });

});
