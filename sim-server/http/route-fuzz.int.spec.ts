import { gzipSync } from 'node:zlib';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { RouteRecord } from '../auth/route-table';
import { MAX_JSON_BODY } from '../create-app';
import { createTestTeam, demoScenarioDocument, readJson, signInSession, startTestServer, TEST_PASSWORD, type TestMember, type TestServer, type TestSession } from '../testing/test-server';
import { snapshotTables } from '../testing/table-snapshot';

/**
 * Property-based fuzzing of every route in the route table (issue 9 §2), signed in as an admin
 * with the CSRF token and anonymously: hostile ids in each :param, hostile query strings and
 * hostile bodies. No answer may be a 5xx, every 4xx carries a JSON error with a message, and no
 * table changes. Fixed seed, so a failure names the seed and the case and repeats exactly.
 */
const FUZZ_SEED = 90_216;
/** Cases per route and identity; about 40 routes × 2 identities keeps the file to a few seconds. */
const RUNS_PER_ROUTE = 6;

/**
 * State that changes without any fuzz damage: signing the spare member in again stores a session
 * row, the spare's sign-out-everywhere (which takes no body) raises its session generation, and
 * failed sign-ins among the fuzzed bodies count against the sign-in limits by design.
 */
const NOT_FUZZ_DAMAGE = { tables: ['session', 'sign_in_limits'], columns: { users: ['session_generation'] } };

/** Routes that end the session they run in; they run as a spare member, signed in again after. */
const SESSION_ENDING = new Set(['post /api/auth/sign-out', 'post /api/auth/sign-out-everywhere']);

// ─── what a hostile client sends ─────────────────────────────────────────────────────────────────

/** Path ids no route may take: malformed percent-encoding, out of range, negative, not numbers. */
const hostileId = fc.oneof(
  fc.constantFrom('%', '%FF', '%C0%AF', '%E0%A4%A', '%ED%A0%80', '%00', '%2F', '2147483648', '1e400', '-1', '0', '1.5', '0x1F', '%20', '%D9%A3', 'NaN', 'Infinity', '9'.repeat(400), '%F0%9F%98%80'),
  fc.bigInt({ min: 2_147_483_648n, max: 10n ** 40n }).map(String),
  fc.integer({ min: -(2 ** 31), max: 0 }).map(String),
  // Dot segments are left out: a URL library resolves them before sending.
  fc.string({ unit: 'grapheme', minLength: 1, maxLength: 12 }).filter((s) => !/^\d+$/.test(s) && s !== '.' && s !== '..').map(encodeURIComponent),
);

/** Text a careless or hostile client puts in a field. */
const hostileText = fc.oneof(
  fc.constantFrom('x\u0000', '\u0000', '\ud800', 'a\udfff', '', ' ', '\r\nBcc: all@example.test', '<script>alert(1)</script>', "'; drop table users; --", '%00', '\u202e', '😀', 'a@b', 'nobody@example.test'),
  fc.string({ unit: 'binary', maxLength: 30 }),
  fc.constantFrom(5_000, 100_000, 300_000).map((n) => 'a'.repeat(n)),
);

/** Keys the API's bodies use, and keys that should be nobody's. */
const bodyKey = fc.constantFrom('email', 'password', 'displayName', 'teamName', 'invitationToken', 'token', 'scenario', 'file', 'note', 'baseRevision', 'tags', 'name', 'body', 'message', 'toUserId', 'access', 'role', 'acknowledgeSafety', 'revision', '__proto__', 'constructor', 'x\u0000', '\ud800');

const { value: hostileValue } = fc.letrec<{ value: unknown }>((tie) => ({
  value: fc.oneof(
    { depthSize: 'small' },
    hostileText,
    fc.integer(),
    fc.double(),
    fc.boolean(),
    fc.constant(null),
    fc.array(tie('value'), { maxLength: 4 }),
    fc.dictionary(bodyKey, tie('value'), { maxKeys: 4 }),
  ),
}));

/** A request body as it goes on the wire, with its headers; `refused` when the edge must refuse it. */
interface BodyCase {
  text: string | Buffer | undefined;
  headers: Record<string, string>;
  refused: boolean;
}

const json = (text: string | Buffer, refused: boolean, headers: Record<string, string> = {}): BodyCase => ({ text, headers: { 'content-type': 'application/json', ...headers }, refused });
const nested = (depth: number, open: string, leaf: string, close: string) => open.repeat(depth) + leaf + close.repeat(depth);

/** Bodies the input guards must refuse whatever the route: unstorable text, runaway nesting, not JSON. */
const refusedBody: fc.Arbitrary<BodyCase> = fc.oneof(
  fc.tuple(fc.dictionary(bodyKey, hostileValue, { maxKeys: 3 }), bodyKey, fc.constantFrom('x\u0000', '\ud800', 'ok\udfff')).map(([object, key, bad]) => json(JSON.stringify({ ...object, [key]: [bad] }), true)),
  fc.constantFrom(33, 1_000, 20_000).map((depth) => json(nested(depth, '[', '1', ']'), true)),
  fc.constantFrom(33, 2_000).map((depth) => json(nested(depth, '{"a":', '1', '}'), true)),
  fc.constantFrom('{', '{"a":1}garbage', 'email=a&password=b', '"x"', 'null', '1e400', 'true', '{"a":"\u0000raw"}').map((text) => json(text, true)),
  fc.constant(json('a'.repeat(300 * 1024), true)),
  fc.constantFrom('application/x-www-form-urlencoded', 'text/plain', 'multipart/form-data; boundary=x', 'application/xml').map((type) => ({ text: '{}', headers: { 'content-type': type }, refused: true })),
  // A Buffer body goes out with no Content-Type at all, as `curl -d` with the header removed would.
  fc.constant<BodyCase>({ text: Buffer.from('{}'), headers: {}, refused: true }),
  fc.constantFrom('gzip', 'br', 'deflate', 'x-unknown').map((coding) => json(coding === 'gzip' ? gzipSync('{}') : '{}', true, { 'content-encoding': coding })),
  fc.constantFrom('latin1', 'koi8-r', 'utf-7', 'utf-16', 'UTF-16LE', '"utf-32"').map((charset) => ({ text: '{}', headers: { 'content-type': `application/json; charset=${charset}` }, refused: true })),
);

/** Any hostile body: the refused ones, plus JSON of the wrong shape or types, and none at all. */
const anyBody: fc.Arbitrary<BodyCase> = fc.oneof(
  refusedBody,
  fc.dictionary(bodyKey, hostileValue, { maxKeys: 5 }).map((object) => json(JSON.stringify(object), false)),
  fc.array(hostileValue, { maxLength: 4 }).map((array) => json(JSON.stringify(array), false)),
  fc.constantFrom('{}', '[]', '[{}]', '{"scenario":null}', '{"scenario":{}}', '{"file":"not a scenario"}').map((text) => json(text, false)),
  fc.constant<BodyCase>({ text: undefined, headers: {}, refused: false }),
);

/** A query string; `refused` when it carries text that cannot be stored (the edge refuses it). */
interface QueryCase {
  text: string;
  refused: boolean;
}

const refusedQuery: fc.Arbitrary<QueryCase> = fc
  .tuple(fc.constantFrom('q', 'page', 'pageSize', 'status', 'from', 'to', 'revision', 'tag', 'zz'), fc.string({ unit: 'grapheme-ascii', maxLength: 6 }))
  .map(([key, before]) => ({ text: `?${key}=${encodeURIComponent(before)}%00`, refused: true }));

const anyQuery: fc.Arbitrary<QueryCase> = fc.oneof(
  fc.constant({ text: '', refused: false }),
  refusedQuery,
  fc.constantFrom('?q=%FF', '?q=%', '?page=1e400', '?page=-1', '?pageSize=2147483648', '?q=a&q=b', '?status[]=x', '?__proto__=x', '?constructor=1', '?revision=1e400', `?q=${'a'.repeat(4_000)}`, `?${'&'.repeat(2_000)}`, '?from=1&to=%C0%AF').map((text) => ({ text, refused: false })),
  fc.dictionary(fc.string({ unit: 'grapheme', maxLength: 8 }), fc.string({ unit: 'grapheme', maxLength: 20 }), { maxKeys: 3 }).map((object) => ({ text: `?${new URLSearchParams(object)}`, refused: false })),
);

/** One fuzz case for a route: each :param hostile or a real id, and at least one hostile thing the edge or the route must refuse. */
interface FuzzCase {
  params: { value: string; hostile: boolean }[];
  query: QueryCase;
  body: BodyCase;
}

function fuzzCase(route: RouteRecord, realIds: Record<string, string>): fc.Arbitrary<FuzzCase> {
  const names = route.path.split('/').filter((s) => s.startsWith(':')).map((s) => s.slice(1));
  const real = (name: string) => fc.constant({ value: realIds[name]!, hostile: false });
  const hostile = hostileId.map((value) => ({ value, hostile: true }));
  // fetch sends no body with GET.
  const body = route.method === 'get' ? fc.constant<BodyCase>({ text: undefined, headers: {}, refused: false }) : anyBody;
  const withHostileParam = fc.record({
    params: fc.tuple(...names.map((n) => fc.oneof(hostile, real(n)))).filter((ps) => names.length === 0 || ps.some((p) => p.hostile)),
    query: anyQuery,
    body,
  });
  if (names.length === 0) return withHostileParam;
  // Real ids with a body or query the edge must refuse: proves the refusal comes before any write.
  const withRealIds = fc.record({
    params: fc.tuple(...names.map(real)),
    query: route.method === 'get' ? refusedQuery : anyQuery,
    body: route.method === 'get' ? body : refusedBody,
  });
  return fc.oneof(withHostileParam, withRealIds);
}

function pathOf(route: RouteRecord, c: FuzzCase): string {
  let i = 0;
  return route.path.replace(/:[A-Za-z]+/g, () => c.params[i++]!.value) + c.query.text;
}

/** What a case must get: any answer under 500; a 4xx when the edge must refuse it or a param is hostile. */
function mustBeRefused(route: RouteRecord, c: FuzzCase): boolean {
  return c.query.refused || c.body.refused || c.params.some((p) => p.hostile);
}

// ─── the walk ────────────────────────────────────────────────────────────────────────────────────

describe('route fuzzing: every route, hostile ids, queries and bodies, as an admin and anonymously', () => {
  let t: TestServer;
  let admin: TestMember;
  let spare: TestMember;
  let spareSession: TestSession;
  let realIds: Record<string, string>;

  beforeAll(async () => {
    t = await startTestServer({ SIGN_IN_LIMIT: '1000', SIGN_IN_ADDRESS_LIMIT: '100000', ACCOUNT_REQUEST_LIMIT: '100000' });
    const team = await createTestTeam(t, 'Fuzz lab', ['viewer']);
    admin = team.members.admin;
    spare = team.extra[0]!;
    spareSession = spare.session;
    const created = await admin.api.post('/api/scenarios', { scenario: { ...demoScenarioDocument(), name: 'Fuzz axis' } });
    const invited = await admin.api.post('/api/team/invitations', { email: 'fuzz-invitee@example.test', role: 'viewer' });
    const scenarioId = String((await readJson(created)).id);
    const form = new FormData();
    form.set('file', new Blob(['time,angle\n0,0\n0.001,0.5\n']), 'fuzz.csv');
    const logged = await admin.api.post(`/api/scenarios/${scenarioId}/logs`, form);
    expect([created.status, invited.status, logged.status]).toEqual([201, 201, 201]);
    realIds = { id: scenarioId, n: '1', memberId: String(team.members.viewer.id), invitationId: String((await readJson(invited)).id), logId: String((await readJson(logged)).id) };
  });
  afterAll(() => t.close());

  async function send(route: RouteRecord, c: FuzzCase, signedIn: boolean): Promise<void> {
    const key = `${route.method} ${route.path}`;
    const session = !signedIn ? null : SESSION_ENDING.has(key) ? spareSession : admin.session;
    const res = await fetch(`${t.baseUrl}${pathOf(route, c)}`, {
      method: route.method.toUpperCase(),
      headers: { ...(session ? { cookie: session.cookie, 'x-csrf-token': session.csrfToken } : {}), ...c.body.headers },
      body: c.body.text,
    });
    const text = await res.text();
    const label = `${signedIn ? 'admin' : 'anonymous'} ${route.method.toUpperCase()} ${pathOf(route, c).slice(0, 200)} → ${res.status} ${text.slice(0, 300)}`;
    expect(res.status, label).toBeLessThan(500);
    if (mustBeRefused(route, c)) expect(res.status, label).toBeGreaterThanOrEqual(400);
    if (res.status >= 400) {
      expect(res.headers.get('content-type'), label).toMatch(/^application\/json/);
      const body = JSON.parse(text) as { error?: { code?: unknown; message?: unknown } };
      expect(typeof body.error?.code, label).toBe('string');
      expect(body.error?.message, label).toEqual(expect.stringMatching(/\S/));
    }
    if (session === spareSession && res.status < 300) spareSession = await signInSession(t.baseUrl, spare.email, TEST_PASSWORD);
  }

  async function walk(route: RouteRecord, signedIn: boolean, seed: number): Promise<void> {
    const result = await fc.check(
      fc.asyncProperty(fuzzCase(route, realIds), (c) => send(route, c, signedIn)),
      { seed, numRuns: RUNS_PER_ROUTE },
    );
    if (result.failed) {
      const shown = fc.stringify(result.counterexample).slice(0, 1_500);
      throw new Error(`fuzzing ${route.method} ${route.path} failed with seed ${result.seed} (path ${result.counterexamplePath}): ${shown}\n${String(result.errorInstance).slice(0, 1_500)}`);
    }
  }

  it('answers no 5xx, a JSON error with a message for every 4xx, and stores nothing', async () => {
    expect(t.server.routes.length).toBeGreaterThan(30);
    // The JSON limit the oversized bodies above are built to exceed.
    expect(MAX_JSON_BODY).toBe('256kb');
    const before = await snapshotTables(t.database.pool, NOT_FUZZ_DAMAGE);
    for (const [i, route] of t.server.routes.entries()) {
      await walk(route, true, FUZZ_SEED + i);
      await walk(route, false, FUZZ_SEED + 1_000 + i);
    }
    expect(await snapshotTables(t.database.pool, NOT_FUZZ_DAMAGE)).toEqual(before);
    // The admin's session lived through the walk, so the signed-in half really ran signed in.
    expect((await admin.api.get('/api/auth/me')).status).toBe(200);
  });
});
