import { Component, inject } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { Ack } from '@kinetwin/shared/protocol/ack';
import type { RunControlState, RunFrame, RunKicked, RunSample, RunStartRequest, RunStarted } from '@kinetwin/shared/protocol/run-events';
import { LINK_LOST_MESSAGE, NOT_LIVE_MESSAGE, NO_ANSWER_MESSAGE, RUN_ACK_TIMEOUT_MS, type RunEvent, type RunLink, RunSocket, STOPPED_BEFORE_START_MESSAGE } from './run-socket';
import { RUN_SOCKET_FACTORY, type RunSocketClient } from './run-socket-factory';
import { FakeRunSocketClient } from './testing/fake-run-socket-client';

@Component({ selector: 'kt-run-host', template: '', providers: [RunSocket] })
class RunHost {
  readonly runs = inject(RunSocket);
}

function frame(runId: string, t: number[], angle: number[]): RunFrame {
  const zeros = () => t.map(() => 0);
  return { runId, t, angle, velocity: zeros(), controllerTorque: zeros(), appliedTorque: zeros(), saturating: zeros(), sticking: zeros() };
}

const started = (runId: string): Ack<RunStarted> => ({ status: 'ok', data: { runId, scenarioName: 'Demo arm', horizon: 2, dt: 0.002 } });
const request: RunStartRequest = { scenarioId: 7 };

describe('RunSocket', () => {
  let client: FakeRunSocketClient;
  let runs: RunSocket;
  let events: RunEvent[];
  let links: RunLink[];
  let destroyHost: () => void;

  beforeEach(() => {
    client = new FakeRunSocketClient();
    TestBed.configureTestingModule({
      providers: [{ provide: RUN_SOCKET_FACTORY, useValue: () => client as unknown as RunSocketClient }],
    });
    const fixture = TestBed.createComponent(RunHost);
    runs = fixture.componentInstance.runs;
    destroyHost = () => fixture.destroy();
    events = [];
    links = [];
    runs.events$.subscribe((event) => events.push(event));
    runs.link$.subscribe((link) => links.push(link));
  });

  afterEach(() => vi.useRealTimers());

  it('sends run:start and resolves with the server ack', async () => {
    const answer = runs.start(request);
    const sent = client.last('run:start');
    expect(sent.payload).toEqual({ scenarioId: 7 });
    sent.ack(started('r1'));
    await expect(answer).resolves.toEqual(started('r1'));
  });

  it('passes on the frames and the end of the run it started, in order', async () => {
    const answer = runs.start(request);
    client.last('run:start').ack(started('r1'));
    await answer;
    client.receive('run:frame', frame('r1', [0, 0.002], [0, 0.001]));
    client.receive('run:frame', frame('r1', [0.004], [0.003]));
    client.receive('run:end', { runId: 'r1', reason: 'finished', message: 'horizon reached', simulatedTime: 2 });

    expect(events.map((e) => e.kind)).toEqual(['frame', 'frame', 'end']);
    expect(events[1]).toEqual({ kind: 'frame', frame: frame('r1', [0.004], [0.003]) });
  });

  it('drops frames of another run and strays that come after the end', async () => {
    const answer = runs.start(request);
    client.last('run:start').ack(started('r1'));
    await answer;
    client.receive('run:frame', frame('someone-else', [0], [1]));
    client.receive('run:end', { runId: 'r1', reason: 'finished', message: '', simulatedTime: 2 });
    client.receive('run:frame', frame('r1', [2.002], [0.5]));

    expect(events.map((e) => e.kind)).toEqual(['end']);
  });

  it('holds frames that arrive before the ack and replays only those of the acknowledged run', async () => {
    const answer = runs.start(request);
    client.receive('run:frame', frame('r2', [0], [0.1]));
    client.receive('run:frame', frame('stale', [9], [9]));
    client.receive('run:frame', frame('r2', [0.002], [0.2]));
    expect(events).toEqual([]);

    client.last('run:start').ack(started('r2'));
    await answer;
    expect(events).toEqual([
      { kind: 'frame', frame: frame('r2', [0], [0.1]) },
      { kind: 'frame', frame: frame('r2', [0.002], [0.2]) },
    ]);
  });

  it('stops the previous run and ignores its remaining frames when a new run starts', async () => {
    const first = runs.start(request);
    client.last('run:start').ack(started('r1'));
    await first;

    const second = runs.start(request);
    expect(client.last('run:stop').payload).toEqual({ runId: 'r1' });
    client.last('run:start').ack(started('r3'));
    await second;
    client.receive('run:frame', frame('r1', [1], [1]));
    client.receive('run:frame', frame('r3', [0], [0]));

    expect(events).toEqual([{ kind: 'frame', frame: frame('r3', [0], [0]) }]);
  });

  it('resolves with the field errors of a refused request', async () => {
    const answer = runs.start(request);
    const refused: Ack<RunStarted> = { status: 'error', errors: [{ field: 'joint.inertia', message: 'inertia must be positive' }] };
    client.last('run:start').ack(refused);
    await expect(answer).resolves.toEqual(refused);
    client.receive('run:frame', frame('r1', [0], [0]));
    expect(events).toEqual([]);
  });

  it('settles a waiting start with the errors of a run:error that carries no run id', async () => {
    const answer = runs.start({ scenario: {} as never });
    client.receive('run:error', { runId: null, errors: [{ field: 'scenario.horizon', message: 'horizon is required' }] });
    await expect(answer).resolves.toEqual({ status: 'error', errors: [{ field: 'scenario.horizon', message: 'horizon is required' }] });
    expect(events).toEqual([]);
  });

  it('reports a run:error of the active run as its failure', async () => {
    const answer = runs.start(request);
    client.last('run:start').ack(started('r1'));
    await answer;
    client.receive('run:error', { runId: 'r1', errors: [{ field: '', message: 'integration diverged' }] });
    expect(events).toEqual([{ kind: 'failed', failure: { runId: 'r1', errors: [{ field: '', message: 'integration diverged' }] } }]);
  });

  it('gives up on a start the server never answers, and stops that run if its ack turns up late', async () => {
    vi.useFakeTimers();
    const answer = runs.start(request);
    vi.advanceTimersByTime(RUN_ACK_TIMEOUT_MS);
    await expect(answer).resolves.toEqual({ status: 'error', errors: [{ field: '', message: NO_ANSWER_MESSAGE }] });

    client.last('run:start').ack(started('late'));
    expect(client.last('run:stop').payload).toEqual({ runId: 'late' });
    client.receive('run:frame', frame('late', [0], [0]));
    expect(events).toEqual([]);
  });

  it('sends run:stop for the active run and still passes on its stopped end', async () => {
    const answer = runs.start(request);
    client.last('run:start').ack(started('r1'));
    await answer;

    const stopped = runs.stop();
    const sent = client.last('run:stop');
    expect(sent.payload).toEqual({ runId: 'r1' });
    sent.ack({ status: 'ok', data: { runId: 'r1' } });
    await expect(stopped).resolves.toEqual({ status: 'ok', data: { runId: 'r1' } });
    client.receive('run:end', { runId: 'r1', reason: 'stopped', message: 'stopped by the user', simulatedTime: 0.4 });
    expect(events).toEqual([{ kind: 'end', end: { runId: 'r1', reason: 'stopped', message: 'stopped by the user', simulatedTime: 0.4 } }]);
  });

  it('resolves stop with null when nothing runs, and abandons a start still waiting', async () => {
    await expect(runs.stop()).resolves.toBeNull();
    const answer = runs.start(request);
    await expect(runs.stop()).resolves.toBeNull();
    await expect(answer).resolves.toEqual({ status: 'error', errors: [{ field: '', message: STOPPED_BEFORE_START_MESSAGE }] });
    client.last('run:start').ack(started('r9'));
    expect(client.last('run:stop').payload).toEqual({ runId: 'r9' });
  });

  it('fails the active run when the link drops, and tracks the link state', async () => {
    client.receive('connect');
    const answer = runs.start(request);
    client.last('run:start').ack(started('r1'));
    await answer;
    client.receive('disconnect', 'transport close');

    expect(events).toEqual([{ kind: 'failed', failure: { runId: 'r1', errors: [{ field: '', message: LINK_LOST_MESSAGE }] } }]);
    expect(links).toEqual(['connecting', 'connected', 'reconnecting']);
  });

  it('fails a waiting start at once when the server refuses the handshake', async () => {
    const answer = runs.start(request);
    client.active = false;
    client.receive('connect_error', new Error('sign in first'));
    await expect(answer).resolves.toEqual({ status: 'error', errors: [{ field: '', message: 'The server refused the live link: sign in first' }] });
    expect(links.at(-1)).toBe('refused');
  });

  it('stops its run and closes the socket when its component goes away', async () => {
    const answer = runs.start(request);
    client.last('run:start').ack(started('r1'));
    await answer;
    let completed = false;
    runs.events$.subscribe({ complete: () => (completed = true) });

    destroyHost();
    expect(client.last('run:stop').payload).toEqual({ runId: 'r1' });
    expect(client.disconnected).toBe(true);
    expect(completed).toBe(true);
  });
  describe('live-run controls', () => {
    const paused: RunControlState = { runId: 'r1', state: 'paused', speed: 1, simulatedTime: 0.42 };

    async function live(): Promise<void> {
      const answer = runs.start(request);
      client.last('run:start').ack(started('r1'));
      await answer;
    }

    it('sends pause, resume and speed for the live run and resolves with their acks', async () => {
      await live();
      const pausing = runs.pause('r1');
      expect(client.last('run:pause').payload).toEqual({ runId: 'r1' });
      client.last('run:pause').ack({ status: 'ok', data: paused });
      await expect(pausing).resolves.toEqual({ status: 'ok', data: paused });

      const resuming = runs.resume('r1');
      expect(client.last('run:resume').payload).toEqual({ runId: 'r1' });
      client.last('run:resume').ack({ status: 'ok', data: { ...paused, state: 'running' } });
      await expect(resuming).resolves.toMatchObject({ status: 'ok', data: { state: 'running' } });

      const faster = runs.setSpeed('r1', 0);
      expect(client.last('run:speed').payload).toEqual({ runId: 'r1', speed: 0 });
      const refused = { status: 'error' as const, errors: [{ field: 'speed', message: 'speed must be 0 (as fast as possible) or between 0.1 and 10' }] };
      client.last('run:speed').ack(refused);
      await expect(faster).resolves.toEqual(refused);
    });

    it('scrubs to a time and kicks, resolving with the sample and the term the run took', async () => {
      await live();
      const sample: RunSample = { t: 0.5, angle: 0.3, velocity: 0.1, controllerTorque: 1, appliedTorque: 1, saturating: false, sticking: false };
      const scrubbing = runs.scrub('r1', 0.5);
      expect(client.last('run:scrub').payload).toEqual({ runId: 'r1', time: 0.5 });
      client.last('run:scrub').ack({ status: 'ok', data: sample });
      await expect(scrubbing).resolves.toEqual({ status: 'ok', data: sample });

      const kicked: RunKicked = { runId: 'r1', term: { channel: 'torque', shape: 'impulse', amplitude: 0.02, delay: 0.51 } };
      const kicking = runs.kick('r1', { channel: 'torque', shape: 'impulse', amplitude: 0.02 });
      expect(client.last('run:kick').payload).toEqual({ runId: 'r1', kick: { channel: 'torque', shape: 'impulse', amplitude: 0.02 } });
      client.last('run:kick').ack({ status: 'ok', data: kicked });
      await expect(kicking).resolves.toEqual({ status: 'ok', data: kicked });
    });

    it('refuses controls of a run that is not live here without asking the server', async () => {
      await expect(runs.pause('r1')).resolves.toEqual({ status: 'error', errors: [{ field: '', message: NOT_LIVE_MESSAGE }] });
      await live();
      client.receive('run:end', { runId: 'r1', reason: 'finished', message: '', simulatedTime: 2 });
      await expect(runs.kick('r1', { channel: 'torque', shape: 'step', amplitude: 1 })).resolves.toMatchObject({ status: 'error' });
      expect(client.emitted.filter((e) => e.event === 'run:pause' || e.event === 'run:kick')).toEqual([]);
    });

    it('gives up on a control the server never answers', async () => {
      await live();
      vi.useFakeTimers();
      const answer = runs.resume('r1');
      vi.advanceTimersByTime(RUN_ACK_TIMEOUT_MS);
      await expect(answer).resolves.toEqual({ status: 'error', errors: [{ field: '', message: NO_ANSWER_MESSAGE }] });
    });
  });
});
