import { createServer, connect as connectTcp, type Server, type Socket as TcpSocket } from 'node:net';
import type { AddressInfo } from 'node:net';
import { io, type Socket } from 'socket.io-client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Ack } from '../../shared/protocol/ack';
import { RUN_NAMESPACE, type ClientToServerEvents, type RunFrame, type ServerToClientEvents } from '../../shared/protocol/run-events';
import { SESSION_UNCHECKED_MESSAGE } from '../auth/session-revocation';
import { createTestTeam, demoScenarioDocument, readJson, startTestServer, type TestServer } from '../testing/test-server';

type Client = Socket<ServerToClientEvents, ClientToServerEvents>;

/**
 * A TCP relay between the server and PostgreSQL that can stop passing bytes without closing
 * anything: the way a database behind a dead network link looks to a client (queries hang).
 */
async function startRelay(target: { host: string; port: number }) {
  const pairs: [TcpSocket, TcpSocket][] = [];
  let cut = false;
  const server: Server = createServer((inbound) => {
    const outbound = connectTcp(target.port, target.host);
    inbound.pipe(outbound);
    outbound.pipe(inbound);
    const end = () => {
      inbound.destroy();
      outbound.destroy();
    };
    inbound.on('error', end);
    outbound.on('error', end);
    pairs.push([inbound, outbound]);
    if (cut) [inbound, outbound].forEach((s) => s.pause());
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const set = (paused: boolean) => {
    cut = paused;
    for (const pair of pairs) for (const s of pair) paused ? s.pause() : s.resume();
  };
  return {
    port: (server.address() as AddressInfo).port,
    cut: () => set(true),
    restore: () => set(false),
    close: () =>
      new Promise<void>((resolve) => {
        pairs.flat().forEach((s) => s.destroy());
        server.close(() => resolve());
      }),
  };
}

describe('a database that stops answering while a run is live', () => {
  let relay: Awaited<ReturnType<typeof startRelay>>;
  let t: TestServer;
  let cookie: string;
  let scenarioId: number;
  let client: Client;

  beforeAll(async () => {
    const direct = new URL(process.env.DATABASE_URL!);
    relay = await startRelay({ host: direct.hostname, port: Number(direct.port || 5432) });
    const viaRelay = new URL(direct);
    viaRelay.hostname = '127.0.0.1';
    viaRelay.port = String(relay.port);
    t = await startTestServer({ DATABASE_URL: viaRelay.toString() });
    const team = await createTestTeam(t, 'Outage');
    cookie = team.members.engineer.session.cookie;
    scenarioId = (await readJson(await team.members.engineer.api.post('/api/scenarios', { scenario: demoScenarioDocument(), note: 'outage' }))).id;
    client = await new Promise<Client>((resolve, reject) => {
      const c: Client = io(`${t.baseUrl}${RUN_NAMESPACE}`, { transports: ['websocket'], extraHeaders: { cookie }, reconnection: false });
      c.once('connect', () => resolve(c));
      c.once('connect_error', reject);
    });
  });
  afterAll(async () => {
    relay.restore();
    client.disconnect();
    await t.close();
    await relay.close();
  });

  const ask = (event: string, payload: unknown) => new Promise<Ack<unknown>>((resolve) => (client.emit as (e: string, p: unknown, cb: (a: Ack<unknown>) => void) => void)(event, payload, resolve));

  it('keeps the run streaming and steerable, refuses a new start with a clear error, and serves again once the database is back', async () => {
    const frames: RunFrame[] = [];
    client.on('run:frame', (f) => frames.push(f));
    const started = await ask('run:start', { scenarioId, speed: 0.1 });
    if (started.status !== 'ok') throw new Error(JSON.stringify(started));
    const runId = (started.data as { runId: string }).runId;
    await new Promise((resolve) => client.once('run:frame', resolve));

    relay.cut();
    // Reading the team's library needs a session checked now; steering the run already going does not.
    const unchecked = { status: 'error', errors: [{ field: '', message: SESSION_UNCHECKED_MESSAGE }] };
    expect(await ask('run:start', { scenarioId, speed: 0 })).toEqual(unchecked);
    expect(await ask('run:pause', { runId })).toMatchObject({ status: 'ok', data: { runId, state: 'paused' } });
    expect(await ask('run:resume', { runId })).toMatchObject({ status: 'ok', data: { runId, state: 'running' } });
    // The run was not replaced: frames of it keep coming while the database is away.
    const framesDuringOutage = frames.length;
    await new Promise((resolve) => client.once('run:frame', resolve));
    expect(frames.length).toBeGreaterThan(framesDuringOutage);
    expect(frames.every((f) => f.runId === runId)).toBe(true);
    expect(client.connected).toBe(true);

    relay.restore();
    expect(await ask('run:pause', { runId })).toMatchObject({ status: 'ok', data: { runId, state: 'paused' } });
    expect(await ask('run:stop', { runId })).toMatchObject({ status: 'ok', data: { runId } });
  });
});
