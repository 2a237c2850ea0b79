import { io, type Socket } from 'socket.io-client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  MAX_RUN_EVENTS_PER_SECOND,
  RUN_NAMESPACE,
  type ClientToServerEvents,
  type RunEnded,
  type RunFailed,
  type RunFrame,
  type RunStartRequest,
  type ServerToClientEvents,
} from '../../shared/protocol/run-events';
import type { Ack } from '../../shared/protocol/ack';
import { DEMO_ACCOUNTS } from '../db/seed-demo';
import { readJson, signIn, startTestServer, type TestServer } from '../testing/test-server';

type Client = Socket<ServerToClientEvents, ClientToServerEvents>;

describe('live runs over real sockets', () => {
  let t: TestServer;
  let cookie: string;
  let scenarioIds: number[];
  const clients: Client[] = [];

  beforeAll(async () => {
    t = await startTestServer();
    cookie = await signIn(t.baseUrl, DEMO_ACCOUNTS[0]!.email, DEMO_ACCOUNTS[0]!.password);
    scenarioIds = (await (await readJson(await fetch(`${t.baseUrl}/api/scenarios`, { headers: { cookie } })))).items.map((i: { id: number }) => i.id);
  });
  afterAll(async () => {
    clients.forEach((c) => c.disconnect());
    await t.close();
  });

  const connect = (withCookie = true): Client => {
    const client: Client = io(`${t.baseUrl}${RUN_NAMESPACE}`, {
      transports: ['websocket'],
      extraHeaders: withCookie ? { cookie } : {},
      reconnection: false,
    });
    clients.push(client);
    return client;
  };

  const start = (client: Client, request: unknown) =>
    new Promise<Ack<{ runId: string; horizon: number }>>((resolve) => client.emit('run:start', request as RunStartRequest, resolve));

  const collect = (client: Client) =>
    new Promise<{ frames: RunFrame[]; end: RunEnded }>((resolve) => {
      const frames: RunFrame[] = [];
      client.on('run:frame', (f) => frames.push(f));
      client.once('run:end', (end) => resolve({ frames, end }));
    });

  it('refuses a connection without a signed-in session', async () => {
    const client = connect(false);
    const error = await new Promise<Error>((resolve) => client.once('connect_error', resolve));
    expect(error.message).toMatch(/Sign in first/);
  });

  it('streams a stored scenario to its horizon in time order with finite samples', async () => {
    const client = connect();
    const done = collect(client);
    const ack = await start(client, { scenarioId: scenarioIds[0], speed: 0, dt: 0.005 });
    expect(ack.status).toBe('ok');
    const { frames, end } = await done;
    expect(end).toMatchObject({ reason: 'finished' });
    const t = frames.flatMap((f) => f.t);
    const angle = frames.flatMap((f) => f.angle);
    expect(t[0]).toBe(0);
    expect(t.at(-1)).toBeCloseTo(end.simulatedTime, 9);
    expect(t.every((v, i) => i === 0 || v > t[i - 1]!)).toBe(true);
    expect(angle.every(Number.isFinite)).toBe(true);
    expect(new Set(angle).size).toBeGreaterThan(10);
  });

  it('paces a real-time run by the wall clock and stops on request', async () => {
    const client = connect();
    const done = collect(client);
    const started = performance.now();
    const ack = await start(client, { scenarioId: scenarioIds[0], speed: 1 });
    if (ack.status !== 'ok') throw new Error(JSON.stringify(ack));
    // Wait on frames, not on a sleep: a busy machine may deliver them late, never early.
    await new Promise<void>((resolve) => {
      let seen = 0;
      client.on('run:frame', () => ++seen === 4 && resolve());
    });
    const stopAck = await new Promise<Ack<{ runId: string }>>((resolve) => client.emit('run:stop', { runId: ack.data.runId }, resolve));
    expect(stopAck.status).toBe('ok');
    const { frames, end } = await done;
    expect(end.reason).toBe('stopped');
    const wall = (performance.now() - started) / 1000;
    // Real time: the run cannot be far ahead of the wall clock (one frame interval of slack).
    expect(end.simulatedTime).toBeLessThanOrEqual(wall + 0.1);
    expect(end.simulatedTime).toBeGreaterThan(0);
    expect(frames.length).toBeGreaterThanOrEqual(4);
  });

  it('answers an invalid inline scenario with field errors and keeps serving other clients', async () => {
    const bad = connect();
    const good = connect();
    const errorEvent = new Promise((resolve) => bad.once('run:error', resolve));
    const ack = await start(bad, {
      scenario: { kind: 'kinetwin/scenario', version: 1, name: 'x', joint: { inertia: -1, damping: 0, stiffness: 0 }, controller: { mode: 'pid' }, horizon: 1 },
    });
    expect(ack.status).toBe('error');
    if (ack.status === 'error') expect(ack.errors).toContainEqual({ field: 'scenario.joint.inertia', message: 'inertia must be positive' });
    expect(await errorEvent).toMatchObject({ runId: null, errors: expect.any(Array) });

    for (const junk of [null, 42, 'run', { scenarioId: 'abc' }, { scenarioId: 1, scenario: {} }, { scenarioId: 1, speed: 1000 }]) {
      const reply = await start(bad, junk);
      expect(reply.status, JSON.stringify(junk)).toBe('error');
    }
    const missing = await start(bad, { scenarioId: 987654 });
    expect(missing).toMatchObject({ status: 'error', errors: [{ field: 'scenarioId' }] });
    // An event without an acknowledgement must not throw on the server either.
    bad.emit('run:start', { scenarioId: -1 } as RunStartRequest, undefined as never);

    const done = collect(good);
    expect((await start(good, { scenarioId: scenarioIds[1], speed: 0 })).status).toBe('ok');
    expect((await done).end.reason).toBe('finished');
  });

  it('stops a runaway scenario at a bound with a message and no NaN', async () => {
    const client = connect();
    const done = collect(client);
    const ack = await start(client, {
      speed: 0,
      dt: 0.01,
      scenario: {
        kind: 'kinetwin/scenario',
        version: 1,
        name: 'runaway',
        joint: { inertia: 1, damping: 0, stiffness: 0 },
        controller: { mode: 'pid', kp: 1, ki: 100, kd: 0 },
        inputs: [{ channel: 'reference', shape: 'step', amplitude: 1 }],
        horizon: 600,
      },
    });
    expect(ack.status).toBe('ok');
    const { frames, end } = await done;
    expect(end.reason).toBe('bound');
    expect(end.message).toMatch(/runs away/);
    expect(frames.flatMap((f) => f.angle).every(Number.isFinite)).toBe(true);
  });

  const control = <T>(client: Client, event: 'run:pause' | 'run:resume' | 'run:speed' | 'run:scrub' | 'run:kick', request: unknown) =>
    new Promise<Ack<T>>((resolve) => (client.emit as (e: string, r: unknown, cb: (a: Ack<T>) => void) => void)(event, request, resolve));

  it('pauses, scrubs back, changes speed, resumes and takes a kick that the stream shows', async () => {
    const client = connect();
    const frames: RunFrame[] = [];
    client.on('run:frame', (f) => frames.push(f));
    const ended = new Promise<RunEnded>((resolve) => client.once('run:end', resolve));
    const ack = await start(client, { scenarioId: scenarioIds[0], speed: 1 });
    if (ack.status !== 'ok') throw new Error(JSON.stringify(ack));
    const runId = ack.data.runId;
    await new Promise((r) => setTimeout(r, 250));

    const paused = await control<{ state: string; simulatedTime: number }>(client, 'run:pause', { runId });
    if (paused.status !== 'ok') throw new Error(JSON.stringify(paused));
    expect(paused.data.state).toBe('paused');
    const countAtPause = frames.length;
    await new Promise((r) => setTimeout(r, 150));
    expect(frames.length).toBe(countAtPause);

    const sent = frames.flatMap((f) => f.t);
    const scrub = await control<{ t: number; angle: number }>(client, 'run:scrub', { runId, time: 0.1 });
    if (scrub.status !== 'ok') throw new Error(JSON.stringify(scrub));
    expect(scrub.data.t).toBeCloseTo(0.1, 9);
    const i = sent.findIndex((t) => Math.abs(t - 0.1) < 1e-9);
    expect(scrub.data.angle).toBe(frames.flatMap((f) => f.angle)[i]);
    const future = await control(client, 'run:scrub', { runId, time: paused.data.simulatedTime + 1 });
    expect(future).toMatchObject({ status: 'error', errors: [{ field: 'time', message: expect.stringContaining('not computed yet') }] });

    const kicked = await control<{ term: { delay: number; shape: string } }>(client, 'run:kick', { runId, kick: { channel: 'torque', shape: 'impulse', amplitude: 0.02 } });
    if (kicked.status !== 'ok') throw new Error(JSON.stringify(kicked));
    // The kick lands at the twin's own time: at or after what was shown, within one live chunk.
    expect(kicked.data.term.delay).toBeGreaterThanOrEqual(paused.data.simulatedTime);
    expect(kicked.data.term.delay - paused.data.simulatedTime).toBeLessThanOrEqual(0.05 + 1e-9);
    const badKick = await control(client, 'run:kick', { runId, kick: { channel: 'reference', shape: 'impulse', amplitude: 1 } });
    expect(badKick.status).toBe('error');

    const fast = await control<{ speed: number; state: string }>(client, 'run:speed', { runId, speed: 0 });
    expect(fast).toMatchObject({ status: 'ok', data: { speed: 0, state: 'paused' } });
    expect(await control(client, 'run:speed', { runId, speed: 50 })).toMatchObject({ status: 'error' });
    expect(await control(client, 'run:resume', { runId })).toMatchObject({ status: 'ok', data: { state: 'running' } });
    expect((await ended).reason).toBe('finished');

    // The impulse shows as a velocity jump of A/J at the kick time (J = 0.012 kg·m² in the demo wrist).
    const t = frames.flatMap((f) => f.t);
    const v = frames.flatMap((f) => f.velocity);
    const k = t.findIndex((x) => x >= kicked.data.term.delay - 1e-12);
    expect(v[k + 1]! - v[k - 1]!).toBeGreaterThan(0.5 * (0.02 / 0.012));
    expect(frames[0]).toHaveProperty('appliedTorque');
    expect(frames[0]).toHaveProperty('saturating');
  });

  it('refuses a scenario that breaks a rule of the twin, naming the field', async () => {
    const client = connect();
    const ack = await start(client, {
      scenario: {
        kind: 'kinetwin/scenario',
        version: 1,
        name: 'encoder without sampling',
        joint: { inertia: 1, damping: 0.1, stiffness: 0 },
        controller: { mode: 'pid', kp: 1 },
        nonlinear: { encoderCounts: 4096 },
        horizon: 1,
      },
    });
    expect(ack).toMatchObject({ status: 'error', errors: [{ field: 'scenario.nonlinear.encoderCounts', message: expect.stringContaining('samplePeriod') }] });
  });

  it('answers control events for a run that is not there with a field error', async () => {
    const client = connect();
    for (const event of ['run:pause', 'run:resume', 'run:scrub', 'run:kick', 'run:speed'] as const) {
      const reply = await control(client, event, { runId: 'no-such-run', time: 0, speed: 1, kick: { channel: 'torque', shape: 'step', amplitude: 1 } });
      expect(reply, event).toMatchObject({ status: 'error' });
    }
  });

  it('refuses bad nonlinear values, a negative sample period and zero encoder counts, naming each field', async () => {
    const client = connect();
    const inline = (controller: object, nonlinear: object) => ({
      scenario: { kind: 'kinetwin/scenario', version: 1, name: 'bad effects', joint: { inertia: 1, damping: 0.1, stiffness: 0 }, controller, nonlinear, horizon: 1 },
    });
    const sampled = { mode: 'pid', kp: 1, samplePeriod: 0.001 };
    const cases: [object, string, string][] = [
      [inline(sampled, { torqueLimit: -1 }), 'scenario.nonlinear.torqueLimit', 'torqueLimit must be positive'],
      [inline(sampled, { coulombFriction: 0.5, staticFriction: 0.2 }), 'scenario.nonlinear.staticFriction', 'coulombFriction'],
      [inline({ mode: 'pid', kp: 1, samplePeriod: -0.001 }, {}), 'scenario.controller.samplePeriod', 'samplePeriod must be positive'],
      [inline(sampled, { encoderCounts: 0 }), 'scenario.nonlinear.encoderCounts', 'encoderCounts must be positive'],
      [inline(sampled, { noiseStdDev: Number.NaN }), 'scenario.nonlinear.noiseStdDev', 'noiseStdDev'],
    ];
    for (const [request, field, words] of cases) {
      const ack = await start(client, request);
      expect(ack.status, field).toBe('error');
      if (ack.status === 'error') expect(ack.errors, field).toContainEqual({ field, message: expect.stringContaining(words) });
    }
    // The connection still serves a good run afterwards.
    const done = collect(client);
    expect((await start(client, { scenarioId: scenarioIds[0], speed: 0 })).status).toBe('ok');
    expect((await done).end.reason).toBe('finished');
  });

  it('refuses a kick at a simulated time already past, and takes one set for later', async () => {
    const client = connect();
    const ack = await start(client, { scenarioId: scenarioIds[0], speed: 1 });
    if (ack.status !== 'ok') throw new Error(JSON.stringify(ack));
    const runId = ack.data.runId;
    await new Promise((r) => setTimeout(r, 300));
    const paused = await control<{ simulatedTime: number }>(client, 'run:pause', { runId });
    if (paused.status !== 'ok') throw new Error(JSON.stringify(paused));
    const past = await control(client, 'run:kick', { runId, kick: { channel: 'torque', shape: 'step', amplitude: 0.1, delay: 0.01 } });
    expect(past).toMatchObject({ status: 'error', errors: [{ field: 'kick.delay', message: expect.stringContaining('the run is already at') }] });
    const later = paused.data.simulatedTime + 0.5;
    const future = await control<{ term: { delay: number } }>(client, 'run:kick', { runId, kick: { channel: 'torque', shape: 'step', amplitude: 0.1, delay: later } });
    expect(future).toMatchObject({ status: 'ok', data: { term: { delay: later } } });
    const negative = await control(client, 'run:kick', { runId, kick: { channel: 'torque', shape: 'step', amplitude: 0.1, delay: -1 } });
    expect(negative).toMatchObject({ status: 'error', errors: [{ field: 'kick.delay', message: 'delay must be zero or more' }] });
  });

  it('drops a flood of events past the per-connection limit with a clear error, and other sessions run on', async () => {
    const flooder = connect();
    const floodErrors: RunFailed[] = [];
    flooder.on('run:error', (failure) => floodErrors.push(failure));
    const other = connect();
    const done = collect(other);
    expect((await start(other, { scenarioId: scenarioIds[1], speed: 0 })).status).toBe('ok');

    const sent = 5 * MAX_RUN_EVENTS_PER_SECOND;
    const replies = await Promise.all(Array.from({ length: sent }, () => control(flooder, 'run:speed', { runId: 'no-such-run', speed: 1 })));
    const limited = replies.filter((r) => r.status === 'error' && r.errors[0]!.message.startsWith('too many events'));
    const served = replies.filter((r) => r.status === 'error' && r.errors[0]!.field === 'runId');
    // Every event is answered: the first ones on their merits, the rest with the limit (a burst
    // can straddle two one-second windows, so up to twice the limit may be served).
    expect(served.length + limited.length).toBe(sent);
    expect(served.length).toBeGreaterThanOrEqual(MAX_RUN_EVENTS_PER_SECOND);
    expect(served.length).toBeLessThanOrEqual(2 * MAX_RUN_EVENTS_PER_SECOND);
    expect(limited[0]!.status === 'error' && limited[0]!.errors[0]!.message).toMatch(/at most 60 a second; this one was dropped/);
    // The client hears of the flood once per window, not once per dropped event.
    const floodNotices = floodErrors.filter((f) => f.errors[0]!.message.startsWith('too many events'));
    expect(floodNotices.length).toBeGreaterThanOrEqual(1);
    expect(floodNotices.length).toBeLessThanOrEqual(2);

    expect((await done).end.reason).toBe('finished');
    // After the window the flooding connection is served again.
    await new Promise((r) => setTimeout(r, 1100));
    expect(await control(flooder, 'run:speed', { runId: 'no-such-run', speed: 1 })).toMatchObject({ status: 'error', errors: [{ field: 'runId' }] });
  });

  it('frees the live run when its client disconnects', async () => {
    const client = connect();
    const ack = await start(client, { scenarioId: scenarioIds[0], speed: 0.1 });
    expect(ack.status).toBe('ok');
    const before = t.server.liveRuns();
    client.disconnect();
    await expect.poll(() => t.server.liveRuns(), { timeout: 20_000 }).toBe(before - 1);
  });
});
