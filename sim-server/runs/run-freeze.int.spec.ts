import { io, type Socket } from 'socket.io-client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Ack } from '../../shared/protocol/ack';
import { RUN_NAMESPACE, type ClientToServerEvents, type RunEnded, type RunFrame, type RunStartRequest, type ServerToClientEvents } from '../../shared/protocol/run-events';
import { DEMO_ACCOUNTS } from '../db/seed-demo';
import { signIn, startTestServer, type TestServer } from '../testing/test-server';

type Client = Socket<ServerToClientEvents, ClientToServerEvents>;

/** The demo elbow lift (scenarios/elbow-lift-drive-limit.json) with friction on. */
const elbow = (controller: object, patch: object = {}) => ({
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'freeze test',
  joint: { inertia: 0.03, damping: 0.08, stiffness: 0, gearRatio: 1 },
  controller: { mode: 'pid', kp: 10, ki: 2, kd: 0.9, derivativeOn: 'measurement', ...controller },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.8, delay: 0.2 }],
  horizon: 3,
  nonlinear: { torqueLimit: 1.5, coulombFriction: 0.05, staticFriction: 0.08 },
  ...patch,
});

/**
 * Inside every catalogued range, yet a grind: the largest kd the catalogue allows on a 1 g·m²
 * joint with a 1 µs sampled loop and friction flips the joint through stiction every few
 * samples: seconds of computing until a bound stops it (the friction-event bound at 0.4 s
 * simulated, or the work budget, whichever it meets first).
 */
const grind = () => elbow({ kd: 1e7, samplePeriod: 1e-6 }, { joint: { inertia: 1e-3, damping: 0.08, stiffness: 0, gearRatio: 1 } });

describe('one client’s stiff run does not freeze the server', () => {
  let t: TestServer;
  let cookies: string[];
  const clients: Client[] = [];

  beforeAll(async () => {
    t = await startTestServer();
    cookies = [await signIn(t.baseUrl, DEMO_ACCOUNTS[0]!.email, DEMO_ACCOUNTS[0]!.password), await signIn(t.baseUrl, DEMO_ACCOUNTS[1]!.email, DEMO_ACCOUNTS[1]!.password)];
  });
  afterAll(async () => {
    clients.forEach((c) => c.disconnect());
    await t.close();
  });

  const connect = (cookie: string): Client => {
    const client: Client = io(`${t.baseUrl}${RUN_NAMESPACE}`, { transports: ['websocket'], extraHeaders: { cookie }, reconnection: false });
    clients.push(client);
    return client;
  };
  const start = (client: Client, request: unknown) =>
    new Promise<Ack<{ runId: string }>>((resolve) => client.emit('run:start', request as RunStartRequest, resolve));
  const firstFrameFrom = (client: Client, time: number) =>
    new Promise<void>((resolve) => {
      const seen = (f: RunFrame) => {
        if (f.t.length > 0 && f.t[f.t.length - 1]! >= time) {
          client.off('run:frame', seen);
          resolve();
        }
      };
      client.on('run:frame', seen);
    });

  it('refuses the gains that froze the server (friction on, kd or ki = 1e308) at the edge, naming the field', async () => {
    const client = connect(cookies[0]!);
    for (const gain of ['kd', 'ki'] as const) {
      const ack = await start(client, { speed: 0, scenario: elbow({ [gain]: 1e308 }) });
      expect(ack).toMatchObject({ status: 'error', errors: [{ field: `scenario.controller.${gain}`, message: expect.stringMatching(new RegExp(`^${gain} must be at most .*: ${gain} above`)) }] });
    }
  });

  it('keeps another client’s run streaming and /api/health answering while a stiff run computes, which then stops at a bound', async () => {
    const events: string[] = [];
    // The second client: a real-time run long enough to outlast the stiff one.
    const watcher = connect(cookies[1]!);
    const watcherStarted = await start(watcher, { speed: 1, dt: 0.01, scenario: elbow({}, { horizon: 600 }) });
    if (watcherStarted.status !== 'ok') throw new Error(JSON.stringify(watcherStarted));
    await firstFrameFrom(watcher, 0);
    watcher.on('run:frame', () => events.push('watcher frame'));

    const stiff = connect(cookies[0]!);
    const stiffFrames: RunFrame[] = [];
    stiff.on('run:frame', (f) => stiffFrames.push(f));
    const stiffEnded = new Promise<RunEnded>((resolve) => stiff.once('run:end', resolve)).then((end) => {
      events.push('stiff end');
      return end;
    });
    const grinding = firstFrameFrom(stiff, 0.2);
    const ack = await start(stiff, { speed: 0, dt: 0.001, scenario: grind() });
    expect(ack.status).toBe('ok');
    await grinding;
    events.push('stiff grinding');
    // Health is asked for while the stiff run computes; its answer must come before that run ends.
    const health = fetch(`${t.baseUrl}/api/health`).then((res) => {
      events.push('health answered');
      return res.status;
    });

    const end = await stiffEnded;
    expect(end.reason).toBe('bound');
    expect(end.message).toMatch(/^(work budget: .* evaluations by t = \d+\.\d{4} s, over the twin's allowance|friction event bound: \d+ stick\/slip switches by t = \d+\.\d{4} s)/);
    expect(stiffFrames.flatMap((f) => f.angle).every(Number.isFinite)).toBe(true);
    expect(await health).toBe(200);

    const grindingAt = events.indexOf('stiff grinding');
    const endAt = events.indexOf('stiff end');
    expect(events.indexOf('health answered')).toBeGreaterThan(grindingAt);
    expect(events.indexOf('health answered')).toBeLessThan(endAt);
    const framesMeanwhile = events.slice(grindingAt, endAt).filter((e) => e === 'watcher frame').length;
    expect(framesMeanwhile, events.join(', ')).toBeGreaterThanOrEqual(3);

    const watcherEnded = new Promise<RunEnded>((resolve) => watcher.once('run:end', resolve));
    watcher.emit('run:stop', { runId: watcherStarted.data.runId }, () => undefined);
    expect((await watcherEnded).reason).toBe('stopped');
  }, 120_000);

  it('acknowledges run:stop while a stiff run computes, and the run ends stopped rather than at its bound', async () => {
    const client = connect(cookies[0]!);
    const ended = new Promise<RunEnded>((resolve) => client.once('run:end', resolve));
    const grinding = firstFrameFrom(client, 0.2);
    const ack = await start(client, { speed: 0, dt: 0.001, scenario: grind() });
    if (ack.status !== 'ok') throw new Error(JSON.stringify(ack));
    await grinding;
    const stopAck = await new Promise<Ack<{ runId: string }>>((resolve) => client.emit('run:stop', { runId: ack.data.runId }, resolve));
    expect(stopAck).toEqual({ status: 'ok', data: { runId: ack.data.runId } });
    // Left alone the grind ends at a bound ("bound"): "stopped" means the stop got in.
    const end = await ended;
    expect(end.reason).toBe('stopped');
  }, 60_000);
});
