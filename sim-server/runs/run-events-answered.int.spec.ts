import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { MAX_ID } from '../../shared/protocol/library-api';
import { RUN_CLIENT_EVENTS, type RunControlState } from '../../shared/protocol/run-events';
import { runSockets, type RunClient } from '../testing/run-sockets';
import { createTestTeam, demoScenarioDocument, readJson, startTestServer, type TestServer } from '../testing/test-server';
import { missingPayload, unknownEvent } from './run-event-pipeline';


describe('every socket event that asks for an answer gets one', () => {
  let t: TestServer;
  let cookie: string;
  let scenarioId: number;

  beforeAll(async () => {
    t = await startTestServer();
    const team = await createTestTeam(t, 'Answered events');
    cookie = team.members.engineer.session.cookie;
    scenarioId = (await readJson(await team.members.engineer.api.post('/api/scenarios', { scenario: demoScenarioDocument(), note: 'answers' }))).id;
  });
  afterAll(async () => {
    disconnectAll();
    await t.close();
  });

  const { connect, ask, tell, disconnectAll } = runSockets(() => t.baseUrl, () => cookie);

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
    tell(client, 'no:such:event', { x: 1 });
    tell(client, 'run:start', { scenarioId: -1 });
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
