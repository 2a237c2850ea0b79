import { eq } from 'drizzle-orm';
import { io, type Socket } from 'socket.io-client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { passwordResets, users } from '../../drizzle/schema';
import type { Ack } from '../../shared/protocol/ack';
import type { Role } from '../../shared/protocol/api-types';
import { RUN_CLIENT_EVENTS, RUN_NAMESPACE, type ClientToServerEvents, type RunClientEvent, type ServerToClientEvents } from '../../shared/protocol/run-events';
import { newLinkToken } from '../auth/link-tokens';
import { roleMay, type Action } from '../auth/permissions';
import { SESSION_ENDED_MESSAGE } from '../auth/session-revocation';
import { apiClient, createTestTeam, demoScenarioDocument, readJson, signInSession, startTestServer, TEST_PASSWORD, type TestMember, type TestServer } from '../testing/test-server';
import { RUN_ACCESS } from './run-handlers';

// OWASP ASVS 4.0.3 V3.3.1 (sign-out invalidates the session) and V3.3.3 (ending every session of a
// user ends all of them), applied to the live-run socket: every socket event × every session state.

type Client = Socket<ServerToClientEvents, ClientToServerEvents>;

/** One socket event as the matrix sends it; controls act on a run the socket started by id. */
interface EventCase {
  label: string;
  event: RunClientEvent;
  control: boolean;
  access: Action;
  payload(runId: string): unknown;
}

/** What happens to a member between opening their sockets and sending the events. */
interface SessionState {
  name: string;
  /** The session no longer lets the member in (every event refused, the handshake too). */
  revokes: boolean;
  /** The change goes through a route whose hook disconnects the member's sockets on that node. */
  hooked: boolean;
  /** The member's role afterwards. */
  role: Role;
  apply(member: TestMember): Promise<void>;
}

const SESSION_SECRET = 'run-access-shared-session-secret';

describe('run events × session states: only a current session with a role allowed the action is served', () => {
  // Two nodes on one database with no adapter between them: node A hears the revocation hooks,
  // node B only the per-event check (the case of a cluster node the notice has not reached).
  let a: TestServer;
  let b: TestServer;
  let admin: TestMember;
  let members: TestMember[];
  let scenarioId: number;
  const clients: Client[] = [];

  const cases = (): EventCase[] => [
    { label: 'run:start by id', event: 'run:start', control: false, access: RUN_ACCESS.stored, payload: () => ({ scenarioId, speed: 0 }) },
    { label: 'run:start inline', event: 'run:start', control: false, access: RUN_ACCESS.inline, payload: () => ({ scenario: demoScenarioDocument(), speed: 0 }) },
    { label: 'run:stop', event: 'run:stop', control: true, access: RUN_ACCESS.stored, payload: (runId) => ({ runId }) },
    { label: 'run:pause', event: 'run:pause', control: true, access: RUN_ACCESS.stored, payload: (runId) => ({ runId }) },
    { label: 'run:resume', event: 'run:resume', control: true, access: RUN_ACCESS.stored, payload: (runId) => ({ runId }) },
    { label: 'run:speed', event: 'run:speed', control: true, access: RUN_ACCESS.stored, payload: (runId) => ({ runId, speed: 2 }) },
    { label: 'run:scrub', event: 'run:scrub', control: true, access: RUN_ACCESS.stored, payload: (runId) => ({ runId, time: 0 }) },
    { label: 'run:kick', event: 'run:kick', control: true, access: RUN_ACCESS.stored, payload: (runId) => ({ runId, kick: { channel: 'torque', shape: 'step', amplitude: 0.01 } }) },
  ];

  const states: SessionState[] = [
    { name: 'signed in', revokes: false, hooked: false, role: 'engineer', apply: async () => {} },
    {
      name: 'signed out',
      revokes: true,
      hooked: true,
      role: 'engineer',
      apply: async (m) => expect((await m.api.post('/api/auth/sign-out')).status).toBe(204),
    },
    {
      name: 'signed out everywhere (from a second browser)',
      revokes: true,
      hooked: true,
      role: 'engineer',
      apply: async (m) => {
        const second = apiClient(a.baseUrl, await signInSession(a.baseUrl, m.email, TEST_PASSWORD));
        expect((await second.post('/api/auth/sign-out-everywhere')).status).toBe(204);
      },
    },
    {
      name: 'password reset',
      revokes: true,
      hooked: true,
      role: 'engineer',
      apply: async (m) => {
        const { token, hash } = newLinkToken();
        await a.database.db.insert(passwordResets).values({ userId: m.id, tokenHash: hash, expiresAt: new Date(Date.now() + 3600_000) });
        const res = await apiClient(a.baseUrl, null).post('/api/auth/password-reset/complete', { token, password: 'a fresh passphrase for the matrix' });
        expect(res.status).toBe(200);
      },
    },
    {
      name: 'removed from the team',
      revokes: true,
      hooked: true,
      role: 'engineer',
      apply: async (m) => expect((await admin.api.delete(`/api/team/members/${m.id}`)).status).toBe(204),
    },
    {
      // No route deactivates without removing; an operator's UPDATE reaches only the checks.
      name: 'deactivated in the database',
      revokes: true,
      hooked: false,
      role: 'engineer',
      apply: async (m) => {
        await a.database.db.update(users).set({ deactivatedAt: new Date() }).where(eq(users.id, m.id));
      },
    },
    {
      name: 'role lowered to viewer',
      revokes: false,
      hooked: true,
      role: 'viewer',
      apply: async (m) => expect((await admin.api.patch(`/api/team/members/${m.id}`, { role: 'viewer' })).status).toBe(200),
    },
  ];

  beforeAll(async () => {
    a = await startTestServer({ SESSION_SECRET });
    b = await startTestServer({ SESSION_SECRET });
    const team = await createTestTeam(a, 'Run access', states.map(() => 'engineer' as const));
    admin = team.members.admin;
    members = team.extra;
    const created = await readJson(await team.members.engineer.api.post('/api/scenarios', { scenario: demoScenarioDocument(), note: 'run access' }));
    scenarioId = created.id;
  });
  afterAll(async () => {
    clients.forEach((c) => c.disconnect());
    await Promise.all([a.close(), b.close()]);
  });

  const open = (server: TestServer, cookie: string): Client => {
    const client: Client = io(`${server.baseUrl}${RUN_NAMESPACE}`, { transports: ['websocket'], extraHeaders: { cookie }, reconnection: false });
    clients.push(client);
    return client;
  };
  const connect = (server: TestServer, cookie: string) =>
    new Promise<Client>((resolve, reject) => {
      const client = open(server, cookie);
      client.once('connect', () => resolve(client));
      client.once('connect_error', reject);
    });
  const refusedHandshake = (server: TestServer, cookie: string) =>
    new Promise<string>((resolve, reject) => {
      const client = open(server, cookie);
      client.once('connect', () => reject(new Error('the handshake was let through')));
      client.once('connect_error', (error) => resolve(error.message));
    });
  const send = (client: Client, event: string, payload: unknown) =>
    new Promise<Ack<unknown>>((resolve) => (client.emit as (e: string, p: unknown, cb: (a: Ack<unknown>) => void) => void)(event, payload, resolve));
  const disconnected = (client: Client) => new Promise<string>((resolve) => client.once('disconnect', (reason) => resolve(reason)));
  const errorsHeard = (client: Client) => {
    const messages: string[] = [];
    client.on('run:error', (failure) => messages.push(...failure.errors.map((e) => e.message)));
    return messages;
  };
  /** A socket with a stored scenario's run going (speed 0.1: it lasts far longer than the test). */
  const withRun = async (client: Client) => {
    const firstFrame = new Promise((resolve) => client.once('run:frame', resolve));
    const ack = await send(client, 'run:start', { scenarioId, speed: 0.1 });
    if (ack.status !== 'ok') throw new Error(JSON.stringify(ack));
    await firstFrame;
    return (ack.data as { runId: string }).runId;
  };

  it('covers every event the namespace takes', () => {
    expect(new Set(cases().map((c) => c.event))).toEqual(new Set(RUN_CLIENT_EVENTS));
  });

  for (const [index, state] of states.entries()) {
    it(`${state.name}: ${state.revokes ? 'every event refused, every socket ended, the handshake refused' : 'each event served as the role table says'}`, async () => {
      const member = members[index]!;
      const cookie = member.session.cookie;

      // Node A: a socket streaming a run, which the hook (or the periodic check) must end.
      const here = await connect(a, cookie);
      const hereErrors = errorsHeard(here);
      const hereGone = disconnected(here);
      await withRun(here);

      // Node B: one socket per event. A revoked session is refused before its run is looked up,
      // so those sockets hold no run (and the periodic check, which looks at runs, leaves them be).
      const sockets = await Promise.all(
        cases().map(async (c) => {
          const client = await connect(b, cookie);
          const runId = c.control && !state.revokes ? await withRun(client) : 'no-run-started';
          return { c, client, runId, gone: disconnected(client) };
        }),
      );

      await state.apply(member);

      for (const { c, client, runId, gone } of sockets) {
        const ack = await send(client, c.event, c.payload(runId));
        if (state.revokes) {
          expect(ack, c.label).toEqual({ status: 'error', errors: [{ field: '', message: SESSION_ENDED_MESSAGE }] });
          expect(await gone, c.label).toBe('io server disconnect');
        } else if (roleMay(state.role, c.access)) {
          expect(ack.status, `${c.label}: ${JSON.stringify(ack)}`).toBe('ok');
          expect(client.connected, c.label).toBe(true);
        } else {
          expect(ack, c.label).toMatchObject({ status: 'error', errors: [{ message: expect.stringContaining(`your role (${state.role}) may not`) }] });
        }
      }

      if (state.hooked || state.revokes) {
        // Ended by the route's hook, or (no hook) by the periodic check of streaming sockets.
        expect(await hereGone).toBe('io server disconnect');
        expect(hereErrors).toContain(SESSION_ENDED_MESSAGE);
      } else {
        expect(here.connected).toBe(true);
      }

      if (state.revokes) {
        for (const server of [a, b]) expect(await refusedHandshake(server, cookie)).toMatch(/Sign in first/);
      } else {
        // The session still stands: a new socket is let in and served with the role of now.
        const again = await connect(a, cookie);
        const ack = await send(again, 'run:start', { scenarioId, speed: 0 });
        expect(ack.status).toBe(roleMay(state.role, RUN_ACCESS.stored) ? 'ok' : 'error');
      }
    });
  }

  it("ends only the signing-out session's sockets: the member's other session keeps its socket and is served", async () => {
    const member = members[0]!;
    const staying = await signInSession(a.baseUrl, member.email, TEST_PASSWORD);
    const leaving = await signInSession(a.baseUrl, member.email, TEST_PASSWORD);
    const kept = await connect(a, staying.cookie);
    const ended = await connect(a, leaving.cookie);
    const endedGone = disconnected(ended);
    expect((await apiClient(a.baseUrl, leaving).post('/api/auth/sign-out')).status).toBe(204);
    expect(await endedGone).toBe('io server disconnect');
    expect((await send(kept, 'run:start', { scenarioId, speed: 0 })).status).toBe('ok');
    expect(kept.connected).toBe(true);
  });
});
