import { io, type Socket } from 'socket.io-client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Ack } from '../../shared/protocol/ack';
import { MAX_ID } from '../../shared/protocol/library-api';
import { RUN_CLIENT_EVENTS, RUN_NAMESPACE, type ClientToServerEvents, type RunControlState, type ServerToClientEvents } from '../../shared/protocol/run-events';
import { createTestTeam, demoScenarioDocument, readJson, startTestServer, type TestServer } from '../testing/test-server';
import { missingPayload, unknownEvent } from './run-event-pipeline';

type Client = Socket<ServerToClientEvents, ClientToServerEvents>;
type Emit = (event: string, ...args: unknown[]) => void;

describe('every socket event that asks for an answer gets one', () => {
  let t: TestServer;
  let cookie: string;
  let scenarioId: number;
  const clients: Client[] = [];

  beforeAll(async () => {
    t = await startTestServer();
    const team = await createTestTeam(t, 'Answered events');
    cookie = team.members.engineer.session.cookie;
    scenarioId = (await readJson(await team.members.engineer.api.post('/api/scenarios', { scenario: demoScenarioDocument(), note: 'answers' }))).id;
  });
  afterAll(async () => {
    clients.forEach((c) => c.disconnect());
    await t.close();
  });

  const connect = () =>
    new Promise<Client>((resolve, reject) => {
      const client: Client = io(`${t.baseUrl}${RUN_NAMESPACE}`, { transports: ['websocket'], extraHeaders: { cookie }, reconnection: false });
      clients.push(client);
      client.once('connect', () => resolve(client));
      client.once('connect_error', reject);
    });
  /** Emits `args` and resolves with the acknowledgement, which socket.io always passes last. */
  const ask = (client: Client, event: string, ...args: unknown[]) => new Promise<Ack<unknown>>((resolve) => (client.emit as Emit)(event, ...args, resolve));

  it('bounds scenarioId to PostgreSQL integer: one past it is a field error, the largest is looked up', async () => {
    const client = await connect();
    expect(await ask(client, 'run:start', { scenarioId: MAX_ID + 1 })).toEqual({ status: 'error', errors: [{ field: 'scenarioId', message: 'scenarioId is too large' }] });
    const huge = await ask(client, 'run:start', { scenarioId: 2 ** 53 });
    expect(huge.status === 'error' && huge.errors).toContainEqual({ field: 'scenarioId', message: 'scenarioId is too large' });
    expect(await ask(client, 'run:start', { scenarioId: MAX_ID })).toEqual({ status: 'error', errors: [{ field: 'scenarioId', message: `there is no scenario ${MAX_ID} in your team's library` }] });
    expect(await ask(client, 'run:start', { scenarioId: 1.5 })).toMatchObject({ status: 'error', errors: [{ field: 'scenarioId', message: 'scenarioId must be a whole number' }] });
  });

  it('answers every event sent with no payload, naming the event', async () => {
    const client = await connect();
    for (const event of RUN_CLIENT_EVENTS) {
      expect(await ask(client, event), event).toEqual({ status: 'error', errors: missingPayload(event) });
    }
  });

  it('answers an unknown event with an acknowledgement, and serves the socket after one without', async () => {
    const client = await connect();
    const heard: unknown[] = [];
    client.on('run:error', (failure) => heard.push(failure));
    expect(await ask(client, 'run:launch', { scenarioId })).toEqual({ status: 'error', errors: unknownEvent('run:launch', RUN_CLIENT_EVENTS) });
    expect(await ask(client, 'constructor', {})).toMatchObject({ status: 'error', errors: [{ field: 'event' }] });
    expect(await ask(client, '__proto__')).toMatchObject({ status: 'error', errors: [{ field: 'event' }] });
    (client.emit as Emit)('no:such:event', { x: 1 });
    (client.emit as Emit)('run:start', { scenarioId: -1 });
    // Still served, in order, after the events that asked nothing back.
    expect((await ask(client, 'run:start', { scenarioId, speed: 0 })).status).toBe('ok');
    expect(heard.length).toBeGreaterThanOrEqual(4);
  });

  it('takes the acknowledgement from the end when a client sends extra arguments', async () => {
    const client = await connect();
    expect(await ask(client, 'run:stop', { runId: 'not-here' }, 'extra', 42)).toEqual({ status: 'error', errors: [{ field: 'runId', message: 'no live run with this id on this connection' }] });
  });

  it('carries out the events of one socket in the order they were sent', async () => {
    const client = await connect();
    const started = await ask(client, 'run:start', { scenarioId, speed: 0.1 });
    if (started.status !== 'ok') throw new Error(JSON.stringify(started));
    const runId = (started.data as { runId: string }).runId;
    // Sent together: each session check runs at once, but the answers keep the sending order.
    const answers = await Promise.all([
      ask(client, 'run:speed', { runId, speed: 2 }),
      ask(client, 'run:speed', { runId, speed: 0.5 }),
      ask(client, 'run:pause', { runId }),
      ask(client, 'run:speed', { runId, speed: 3 }),
      ask(client, 'run:resume', { runId }),
    ]);
    const states = answers.map((a) => (a.status === 'ok' ? (a.data as RunControlState) : null));
    expect(states.map((s) => s && [s.state, s.speed])).toEqual([
      ['running', 2],
      ['running', 0.5],
      ['paused', 0.5],
      ['paused', 3],
      ['running', 3],
    ]);
  });
});
