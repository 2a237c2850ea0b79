import { io, type Socket } from 'socket.io-client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Ack } from '../../shared/protocol/ack';
import { RUN_NAMESPACE, type ClientToServerEvents, type RunFrame, type RunStartRequest, type RunStarted, type ServerToClientEvents } from '../../shared/protocol/run-events';
import { DEMO_ACCOUNTS } from '../db/seed-demo';
import { DATABASE_UNAVAILABLE_MESSAGE } from '../http/database-unavailable';
import { startServerProcess, type ServerProcess } from '../testing/server-process';
import { apiClient, demoScenarioDocument, readJson, signInSession, type ApiClient } from '../testing/test-server';
import { createThrowawayCluster, type ThrowawayCluster } from '../testing/throwaway-cluster';

type Client = Socket<ServerToClientEvents, ClientToServerEvents>;

/**
 * A guard, not a speed target: a request must be answered, not hang. A stopped database refuses
 * connections at once; the pool waits at most CONNECT_TIMEOUT_MS (3 s) for one in any case.
 */
const ANSWER_GUARD = { signal: () => AbortSignal.timeout(15_000) };

describe('PostgreSQL stopped under a running server', () => {
  let cluster: ThrowawayCluster;
  let server: ServerProcess;
  let api: ApiClient;
  let scenarioId: number;
  let headRevision: number;
  let socket: Client;
  const frames: RunFrame[] = [];

  beforeAll(async () => {
    cluster = await createThrowawayCluster();
    // A fixed secret so the session cookie stays valid across the outage (demo mode would pick one per start).
    server = await startServerProcess({ DATABASE_URL: cluster.url, DATABASE_OWNER_URL: cluster.ownerUrl, SESSION_SECRET: 'database-outage-test-secret' });
    // The demo engineer owns the demo scenarios, so may save them.
    const owner = DEMO_ACCOUNTS[0]!;
    const session = await signInSession(server.baseUrl, owner.email, owner.password);
    api = apiClient(server.baseUrl, session);
    const { items } = await readJson(await api.get('/api/scenarios'));
    scenarioId = items[0].id;
    headRevision = items[0].revision;
    socket = io(`${server.baseUrl}${RUN_NAMESPACE}`, { transports: ['websocket'], extraHeaders: { cookie: session.cookie }, reconnection: false });
    socket.on('run:frame', (frame) => frames.push(frame));
  }, 90_000);
  afterAll(async () => {
    socket?.disconnect();
    await server?.kill('SIGTERM');
    await cluster?.destroy();
  });

  const health = () => fetch(`${server.baseUrl}/api/health`, { signal: ANSWER_GUARD.signal() });

  it('says so on /api/health, answers 503 with a message, keeps live runs going, and recovers by itself', { timeout: 120_000 }, async () => {
    // A live run of a minute at real time, going before the database stops.
    const wrist = { ...demoScenarioDocument(), name: 'Wrist over a minute', horizon: 60 };
    const started = await new Promise<Ack<RunStarted>>((resolve) => socket.emit('run:start', { scenario: wrist, speed: 1 } as RunStartRequest, resolve));
    expect(started.status).toBe('ok');
    const runId = started.status === 'ok' ? started.data.runId : '';
    await expect.poll(() => frames.length, { timeout: 30_000 }).toBeGreaterThan(0);
    expect((await health()).status).toBe(200);

    // Every backend ends at once with no checkpoint, as in a crash of the database host.
    await cluster.stop('immediate');

    const down = await health();
    expect(down.status).toBe(503);
    expect(await readJson(down)).toMatchObject({ status: 'degraded', database: { ok: false, latencyMs: null, error: expect.any(String) } });

    // A signed-in read, a save and a sign-in: each is refused with the same clear 503.
    const refused = [
      await api.request('GET', '/api/scenarios', undefined, {}),
      await api.put(`/api/scenarios/${scenarioId}`, { scenario: { ...demoScenarioDocument(), name: 'Saved during the outage' }, baseRevision: headRevision, note: 'outage' }),
      await fetch(`${server.baseUrl}/api/auth/sign-in`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ email: DEMO_ACCOUNTS[0]!.email, password: DEMO_ACCOUNTS[0]!.password }),
        signal: ANSWER_GUARD.signal(),
      }),
    ];
    for (const res of refused) {
      expect(res.status, res.url).toBe(503);
      expect(await readJson(res), res.url).toEqual({ error: { code: 'database_unavailable', message: DATABASE_UNAVAILABLE_MESSAGE } });
    }

    // The live run needs no database once started: frames keep coming, and it answers controls.
    const seen = frames.length;
    await expect.poll(() => frames.length, { timeout: 30_000 }).toBeGreaterThan(seen + 5);
    const paused = await new Promise<Ack<unknown>>((resolve) => socket.emit('run:pause', { runId }, resolve));
    expect(paused.status).toBe('ok');
    const resumed = await new Promise<Ack<unknown>>((resolve) => socket.emit('run:resume', { runId }, resolve));
    expect(resumed.status).toBe('ok');
    expect(server.output()).not.toMatch(/Error:.*\n\s+at /);

    await cluster.start();
    // No restart of the server: the pool reconnects on the next request.
    await expect.poll(async () => (await health()).status, { timeout: 60_000, interval: 250 }).toBe(200);
    const library = await api.get('/api/scenarios');
    expect(library.status).toBe(200);
    // The save refused during the outage left nothing behind; the same save now succeeds.
    const item = (await readJson(library)).items.find((i: { id: number }) => i.id === scenarioId);
    expect(item.revision).toBe(headRevision);
    const saved = await api.put(`/api/scenarios/${scenarioId}`, { scenario: { ...demoScenarioDocument(), name: 'Saved after the outage' }, baseRevision: headRevision, note: 'after' });
    expect(saved.status).toBe(200);
    expect((await readJson(saved)).revision).toBe(headRevision + 1);

    const stopped = await new Promise<Ack<unknown>>((resolve) => socket.emit('run:stop', { runId }, resolve));
    expect(stopped.status).toBe('ok');
    // The server stayed up throughout.
    expect(await Promise.race([server.exited, new Promise((resolve) => setTimeout(() => resolve('running'), 100))])).toBe('running');
  });
});
