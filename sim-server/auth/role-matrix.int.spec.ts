import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { roles, type Role } from '../../shared/protocol/api-types';
import { CSRF_EXEMPT_PATHS } from '../create-app';
import { apiClient, createTestTeam, demoScenarioDocument, readJson, signInSession, startTestServer, TEST_PASSWORD, type TestMember, type TestServer } from '../testing/test-server';
import { PERMISSIONS } from './permissions';
import type { RouteRecord } from './route-table';

/** A concrete request for one route, made as one member. */
interface Call {
  path: string;
  body?: unknown;
  /** Run as this role's spare member in a fresh session (routes that end sessions). */
  spare?: true;
}

interface Fixture {
  scenarioId: number;
  archiveScenarioId: number;
  invitationId: number;
  roleTarget: TestMember;
  removeTarget: TestMember;
  handoffTarget: TestMember;
  logId: number;
  /** A log the team's engineer owns, for the delete route. */
  deleteLogId: number;
}

/** A small log upload as the app sends it (multipart, the file in "file"). */
function logForm(name: string): FormData {
  const form = new FormData();
  form.set('file', new Blob(['time;angle [deg]\n0;0\n0,001;1,5\n0,002;3\n']), `${name}.csv`);
  form.set('name', name);
  return form;
}

const FORGED_TOKEN = 'A'.repeat(43);

/** One entry per API route: the test below checks that this list and the server's agree. */
function callsFor(member: TestMember, f: Fixture): Record<string, Call> {
  const s = `/api/scenarios/${f.scenarioId}`;
  return {
    // Signing in regenerates the session it runs in, so it runs in a spare one.
    'post /api/auth/sign-in': { path: '/api/auth/sign-in', body: { email: member.email, password: TEST_PASSWORD }, spare: true },
    'post /api/auth/sign-up': { path: '/api/auth/sign-up', body: { email: 'not an address', password: 'x', displayName: '' } },
    'post /api/auth/invitations/lookup': { path: '/api/auth/invitations/lookup', body: { token: FORGED_TOKEN } },
    'post /api/auth/sign-out': { path: '/api/auth/sign-out', spare: true },
    'post /api/auth/sign-out-everywhere': { path: '/api/auth/sign-out-everywhere', spare: true },
    'get /api/auth/me': { path: '/api/auth/me' },
    'get /api/auth/csrf': { path: '/api/auth/csrf' },
    'post /api/auth/password-reset/request': { path: '/api/auth/password-reset/request', body: { email: 'nobody-here@example.test' } },
    'post /api/auth/password-reset/complete': { path: '/api/auth/password-reset/complete', body: { token: FORGED_TOKEN, password: 'a-long-new-password' } },
    'get /api/scenarios': { path: '/api/scenarios' },
    'post /api/scenarios': { path: '/api/scenarios', body: { scenario: demoScenarioDocument(), note: `matrix ${member.role}` } },
    'post /api/scenarios/import': { path: '/api/scenarios/import', body: { file: demoScenarioDocument('elbow-free-swing.json') } },
    'get /api/scenarios/:id': { path: s },
    'put /api/scenarios/:id': { path: s, body: { scenario: demoScenarioDocument(), baseRevision: 1, note: `matrix ${member.role}` } },
    'patch /api/scenarios/:id': { path: s, body: { tags: ['matrix', member.role] } },
    'post /api/scenarios/:id/duplicate': { path: `${s}/duplicate`, body: {} },
    'post /api/scenarios/:id/archive': { path: `/api/scenarios/${f.archiveScenarioId}/archive` },
    'post /api/scenarios/:id/unarchive': { path: `/api/scenarios/${f.archiveScenarioId}/unarchive` },
    'get /api/scenarios/:id/export': { path: `${s}/export` },
    'get /api/scenarios/:id/revisions': { path: `${s}/revisions` },
    'get /api/scenarios/:id/revisions/:n': { path: `${s}/revisions/1` },
    'get /api/scenarios/:id/diff': { path: `${s}/diff?from=1&to=1` },
    'post /api/scenarios/:id/revisions/:n/restore': { path: `${s}/revisions/1/restore`, body: { baseRevision: 1 } },
    'post /api/scenarios/:id/revisions/:n/sign-off': { path: `${s}/revisions/1/sign-off`, body: { acknowledgeSafety: true } },
    'get /api/scenarios/:id/comments': { path: `${s}/comments` },
    'post /api/scenarios/:id/revisions/:n/comments': { path: `${s}/revisions/1/comments`, body: { body: `comment by the ${member.role}` } },
    'post /api/scenarios/:id/handoffs': { path: `${s}/handoffs`, body: { toUserId: f.handoffTarget.id, access: 'view', message: 'matrix' } },
    'get /api/scenarios/:id/activity': { path: `${s}/activity` },
    'get /api/handoffs/received': { path: '/api/handoffs/received' },
    'get /api/handoffs/sent': { path: '/api/handoffs/sent' },
    'get /api/team': { path: '/api/team' },
    'patch /api/team/members/:memberId': { path: `/api/team/members/${f.roleTarget.id}`, body: { role: 'engineer' } },
    'delete /api/team/members/:memberId': { path: `/api/team/members/${f.removeTarget.id}` },
    'get /api/team/invitations': { path: '/api/team/invitations' },
    'post /api/team/invitations': { path: '/api/team/invitations', body: { email: `invitee-${member.role}-${f.scenarioId}@example.test`, role: 'viewer' } },
    'delete /api/team/invitations/:invitationId': { path: `/api/team/invitations/${f.invitationId}` },
    'get /api/team/activity': { path: '/api/team/activity' },
    'get /api/dev/mailbox': { path: '/api/dev/mailbox' },
    'post /api/checks': { path: '/api/checks', body: { scenario: demoScenarioDocument() } },
    'post /api/checks/sine-sweep': { path: '/api/checks/sine-sweep', body: { scenario: demoScenarioDocument(), from: 1, to: 10, points: 2 } },
    'post /api/scenarios/:id/logs/preview': { path: `${s}/logs/preview`, body: logForm(`preview ${member.role}`) },
    'post /api/scenarios/:id/logs': { path: `${s}/logs`, body: logForm(`matrix ${member.role}`) },
    'get /api/scenarios/:id/logs': { path: `${s}/logs` },
    'get /api/scenarios/:id/logs/:logId': { path: `${s}/logs/${f.logId}` },
    'get /api/scenarios/:id/logs/:logId/csv': { path: `${s}/logs/${f.logId}/csv` },
    'delete /api/scenarios/:id/logs/:logId': { path: `${s}/logs/${f.deleteLogId}` },
    'post /api/checks/operating-range': { path: '/api/checks/operating-range', body: { scenario: { ...demoScenarioDocument(), nonlinear: { gravity: { mass: 1, arm: 0.2 } } }, angle: 0.5 } },
  };
}

const key = (r: RouteRecord) => `${r.method} ${r.path}`;

function allowedRoles(route: RouteRecord): readonly Role[] {
  return route.access === 'public' || route.access === 'signed-in' ? roles : PERMISSIONS[route.access];
}

describe('role matrix: every API route × every role, against the real server', () => {
  let t: TestServer;
  let team: Awaited<ReturnType<typeof createTestTeam>>;
  let other: Awaited<ReturnType<typeof createTestTeam>>;
  let f: Fixture;
  let foreign: { scenarioId: number; name: string; invitationId: number; logId: number };

  beforeAll(async () => {
    t = await startTestServer({ ACCOUNT_REQUEST_LIMIT: '1000' });
    // Spares of every role (sessions that may be ended), two members for role change and removal.
    [team, other] = await Promise.all([createTestTeam(t, 'Matrix lab', [...roles, 'viewer', 'viewer']), createTestTeam(t, 'Foreign lab')]);
    const engineer = team.members.engineer.api;
    const created = async (api: typeof engineer, name: string) => {
      const res = await api.post('/api/scenarios', { scenario: { ...demoScenarioDocument(), name } });
      expect(res.status).toBe(201);
      return (await readJson(res)).id as number;
    };
    const uploaded = async (api: typeof engineer, scenarioId: number, name: string) => {
      const res = await api.post(`/api/scenarios/${scenarioId}/logs`, logForm(name));
      expect(res.status).toBe(201);
      return (await readJson(res)).id as number;
    };
    const invite = async (admin: TestMember, email: string) => {
      const res = await admin.api.post('/api/team/invitations', { email, role: 'viewer' });
      expect(res.status).toBe(201);
      return (await readJson(res)).id as number;
    };
    const scenarioId = await created(engineer, 'Matrix axis');
    f = {
      scenarioId,
      archiveScenarioId: await created(engineer, 'Matrix archive axis'),
      invitationId: await invite(team.members.admin, 'pending-matrix@example.test'),
      roleTarget: team.extra[4]!,
      removeTarget: team.extra[5]!,
      handoffTarget: team.members.lead,
      logId: await uploaded(engineer, scenarioId, 'Matrix log'),
      deleteLogId: await uploaded(engineer, scenarioId, 'Matrix log to delete'),
    };
    const foreignScenarioId = await created(other.members.engineer.api, 'Foreign secret axis');
    const foreignLogId = await uploaded(other.members.engineer.api, foreignScenarioId, 'Foreign secret log');
    foreign = {
      scenarioId: foreignScenarioId,
      name: 'Foreign secret axis',
      invitationId: await invite(other.members.admin, 'pending-foreign@example.test'),
      logId: foreignLogId,
    };
  });
  afterAll(() => t.close());

  it('has a request for every route the server registers, and no other', () => {
    const registered = t.server.routes.map(key).sort();
    expect(Object.keys(callsFor(team.members.viewer, f)).sort()).toEqual(registered);
    expect(new Set(registered).size).toBe(registered.length);
  });

  it.each(roles)('lets the %s through exactly the routes the permission table allows', async (role) => {
    const member = team.members[role];
    const spare = team.extra[roles.indexOf(role)]!;
    const calls = callsFor(member, f);
    for (const route of t.server.routes) {
      const call = calls[key(route)]!;
      const api = call.spare ? apiClient(t.baseUrl, await signInSession(t.baseUrl, spare.email, TEST_PASSWORD)) : member.api;
      const res = await api.request(route.method, call.path, call.body);
      // eslint-disable-next-line @typescript-eslint/no-explicit-any
      const body: any = res.status === 204 ? null : await res.json().catch(() => null);
      const label = `${role} ${key(route)} → ${res.status} ${JSON.stringify(body)?.slice(0, 200)}`;
      expect(res.status, label).toBeLessThan(500);
      if (allowedRoles(route).includes(role)) {
        expect(res.status, label).not.toBe(401);
        expect(body?.error?.code, label).not.toBe('forbidden_role');
        expect(body?.error?.code, label).not.toBe('csrf');
      } else {
        expect(res.status, label).toBe(403);
        expect(body.error.code, label).toBe('forbidden_role');
        expect(body.error.message, label).toBe(body.error.message.replace(/Matrix|axis/g, ''));
      }
    }
  });

  it('answers 401 to every route that needs a session when there is none', async () => {
    const anonymous = apiClient(t.baseUrl, null);
    const calls = callsFor(team.members.viewer, f);
    for (const route of t.server.routes) {
      const call = calls[key(route)]!;
      const res = await anonymous.request(route.method, call.path, call.body);
      if (route.access === 'public') expect(res.status, key(route)).not.toBe(401);
      else expect(res.status, key(route)).toBe(401);
    }
  });

  it('refuses every unsafe request of a signed-in session without its CSRF token', async () => {
    const session = await signInSession(t.baseUrl, team.extra[0]!.email, TEST_PASSWORD);
    const noToken = apiClient(t.baseUrl, { ...session, csrfToken: '' });
    const wrongToken = apiClient(t.baseUrl, { ...session, csrfToken: 'x'.repeat(43) });
    const calls = callsFor(team.members.viewer, f);
    for (const route of t.server.routes.filter((r) => r.method !== 'get' && !CSRF_EXEMPT_PATHS.includes(r.path.replace(/^\/api/, '')))) {
      const call = calls[key(route)]!;
      for (const api of [noToken, wrongToken]) {
        const res = await api.request(route.method, call.path, call.body);
        expect(res.status, key(route)).toBe(403);
        expect((await readJson(res)).error.code, key(route)).toBe('csrf');
      }
    }
    // The session itself is still good.
    expect((await apiClient(t.baseUrl, session).get('/api/auth/me')).status).toBe(200);
  });

  it("answers 404 for another team's scenario, revision, member and invitation on every route, leaking nothing", async () => {
    const admin = team.members.admin;
    const foreignFixture: Fixture = {
      ...f,
      scenarioId: foreign.scenarioId,
      archiveScenarioId: foreign.scenarioId,
      invitationId: foreign.invitationId,
      roleTarget: other.members.viewer,
      removeTarget: other.members.lead,
      logId: foreign.logId,
      deleteLogId: foreign.logId,
    };
    const calls = callsFor(admin, foreignFixture);
    const withIds = t.server.routes.filter((r) => r.path.includes('/:'));
    expect(withIds.length).toBeGreaterThan(15);
    for (const route of withIds) {
      const call = calls[key(route)]!;
      const res = await admin.api.request(route.method, call.path, call.body);
      const text = await res.text();
      expect(res.status, `${key(route)} ${text}`).toBe(404);
      expect(text).not.toContain('Foreign');
      expect(text).not.toContain(other.members.lead.email);
    }
    // And the foreign team still sees its own scenario, untouched.
    const theirs = await readJson(await other.members.engineer.api.get(`/api/scenarios/${foreign.scenarioId}`));
    expect(theirs).toMatchObject({ name: foreign.name, revision: 1, status: 'draft', tags: [] });
    expect((await readJson(await admin.api.get('/api/scenarios?status=all&pageSize=100'))).items.map((i: { name: string }) => i.name)).not.toContain(foreign.name);
  });
});
