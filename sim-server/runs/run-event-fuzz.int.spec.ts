import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { MAX_RUN_EVENTS_PER_SECOND, RUN_CLIENT_EVENTS, type RunFrame } from '../../shared/protocol/run-events';
import { runSockets, type RunClient } from '../testing/run-sockets';
import { createTestTeam, demoScenarioDocument, readJson, startTestServer, type TestServer } from '../testing/test-server';
import { SERVER_ERROR } from './run-event-pipeline';


/** Cases per run of the walk; fixed seed, so a failure names its case and repeats exactly. */
const CASES = 240;
const FUZZ_SEED = 20261203;
/** Each socket stays under the per-connection event limit, so every case reaches the handlers. */
const PAUSE_MS = Math.ceil(1000 / MAX_RUN_EVENTS_PER_SECOND) + 2;

/** Stands for the id of the run live at the moment a case is sent (runs end, and new ones start). */
const LIVE_RUN = '<live run>';

const hostileNumber = fc.oneof(
  // Sane values too, so the handlers behind the schemas are reached, not only the refusals.
  fc.constantFrom(0.5, 1, 2, 0.01),
  fc.constantFrom(0, -0, -1, 1.5, 2 ** 31, 2 ** 53, 1e308, -1e308, Number.MIN_VALUE, 1e-320),
  fc.double({ noNaN: false }),
  fc.integer(),
);
const hostileText = fc.oneof(fc.constantFrom('', 'x\u0000', '\ud800', 'run-1', '__proto__', 'constructor', 'a'.repeat(10_000)), fc.string({ maxLength: 40 }));
const hostileValue: fc.Arbitrary<unknown> = fc.letrec((tie) => ({
  value: fc.oneof({ depthSize: 'small' }, hostileNumber, hostileText, fc.boolean(), fc.constant(null), fc.array(tie('value'), { maxLength: 3 }), fc.dictionary(fc.constantFrom('runId', 'speed', 'time', 'kick', 'scenarioId', 'x', '__proto__'), tie('value'), { maxKeys: 3 })),
})).value;

describe('socket event fuzzing: every /runs event with hostile payloads', () => {
  let t: TestServer;
  let cookie: string;
  let scenarioId: number;

  beforeAll(async () => {
    t = await startTestServer();
    const team = await createTestTeam(t, 'Socket fuzz lab');
    cookie = team.members.engineer.session.cookie;
    scenarioId = (await readJson(await team.members.engineer.api.post('/api/scenarios', { scenario: demoScenarioDocument(), note: 'fuzz' }))).id;
  });
  afterAll(async () => {
    disconnectAll();
    await t.close();
  });

  const { connect, ask, tell, disconnectAll } = runSockets(() => t.baseUrl, () => cookie);

  it('answers every event, never with a server error, emits no non-finite number, and keeps serving', async () => {
    const client = await connect();
    const frames: RunFrame[] = [];
    client.on('run:frame', (f) => frames.push(f));
    let runId = '';
    let live = false;
    client.on('run:end', (end) => {
      if (end.runId === runId) live = false;
    });
    /** A live run to aim the control events at: the fuzz stops runs, and this starts the next. */
    const ensureLive = async () => {
      if (live) return;
      const started = await ask(client, 'run:start', { scenarioId, speed: 0.2 });
      if (started.status !== 'ok') throw new Error(JSON.stringify(started));
      runId = (started.data as { runId: string }).runId;
      live = true;
    };
    const withLiveRun = (x: unknown): unknown =>
      x === LIVE_RUN ? runId : Array.isArray(x) ? x.map(withLiveRun) : x && typeof x === 'object' ? Object.fromEntries(Object.entries(x).map(([k, v]) => [k, withLiveRun(v)])) : x;
    let answered = { ok: 0, error: 0 };

    const demo = demoScenarioDocument();
    const liveId = fc.oneof({ weight: 4, arbitrary: fc.constant(LIVE_RUN) }, { weight: 1, arbitrary: hostileText });
    const kick = fc.record(
      { channel: fc.constantFrom('reference', 'torque', 'x'), shape: fc.constantFrom('impulse', 'step', 'sine'), amplitude: hostileNumber, delay: fc.option(hostileNumber, { nil: undefined }) },
      { requiredKeys: ['channel', 'shape', 'amplitude'] },
    );
    const inlineScenario = fc.record({
      ...Object.fromEntries(Object.entries(demo).map(([k, v]) => [k, fc.constant(v)])),
      controller: fc.record({ mode: fc.constant('pid'), kp: hostileNumber, ki: hostileNumber, kd: hostileNumber, samplePeriod: fc.option(hostileNumber, { nil: null }) }),
      nonlinear: fc.record({ coulombFriction: hostileNumber, torqueLimit: fc.option(hostileNumber, { nil: null }) }, { requiredKeys: [] }),
    });
    // Well-formed envelopes with hostile insides reach the handlers behind the schemas; anything
    // at all, sent as any event, checks the schemas themselves.
    const cases = fc.oneof(
      fc.tuple(fc.constantFrom('run:stop', 'run:pause', 'run:resume'), fc.record({ runId: liveId })),
      fc.tuple(fc.constant('run:speed'), fc.record({ runId: liveId, speed: hostileNumber })),
      fc.tuple(fc.constant('run:scrub'), fc.record({ runId: liveId, time: hostileNumber })),
      fc.tuple(fc.constant('run:kick'), fc.record({ runId: liveId, kick })),
      fc.tuple(fc.constant('run:start'), fc.record({ scenarioId: fc.oneof(fc.constant(scenarioId), hostileNumber, hostileText), speed: fc.constantFrom(0.2, 1e308, -1), dt: fc.oneof(fc.constant(0.01), hostileNumber) }, { requiredKeys: ['scenarioId'] })),
      fc.tuple(fc.constant('run:start'), fc.record({ scenario: inlineScenario, speed: fc.constant(0) })),
      fc.tuple(fc.oneof(fc.constantFrom(...RUN_CLIENT_EVENTS), fc.constantFrom('run:launch', 'constructor', 'toString')), hostileValue),
    );

    const result = await fc.check(
      fc.asyncProperty(cases, async ([name, body]) => {
        await new Promise((r) => setTimeout(r, PAUSE_MS));
        await ensureLive();
        const answer = await ask(client, name, withLiveRun(body));
        expect(['ok', 'error']).toContain(answer.status);
        answered = { ...answered, [answer.status]: answered[answer.status as 'ok' | 'error'] + 1 };
        // A run started by the fuzz replaces the connection's live one.
        if (name === 'run:start' && answer.status === 'ok') runId = (answer.data as { runId: string }).runId;
        if (answer.status === 'error') {
          expect(answer.errors).not.toEqual(SERVER_ERROR);
          for (const e of answer.errors) {
            expect(typeof e.field).toBe('string');
            expect(e.message).toMatch(/\S/);
          }
        }
      }),
      { seed: FUZZ_SEED, numRuns: CASES },
    );
    if (result.failed) throw new Error(`socket fuzzing failed with seed ${result.seed} (path ${result.counterexamplePath}): ${fc.stringify(result.counterexample).slice(0, 1_500)}\n${String(result.errorInstance).slice(0, 1_500)}`);

    // Both kinds of answer were reached, so the walk went past the schemas.
    expect(answered.ok).toBeGreaterThan(10);
    expect(answered.error).toBeGreaterThan(10);
    // Every number the server streamed was finite.
    const numbers = frames.flatMap((f) => [...f.t, ...f.angle, ...f.velocity, ...f.controllerTorque, ...f.appliedTorque]);
    expect(numbers.length).toBeGreaterThan(0);
    expect(numbers.every(Number.isFinite)).toBe(true);
    // Still serving: the REST side and a fresh run.
    expect((await fetch(`${t.baseUrl}/api/health`)).status).toBe(200);
    const fresh = await connect();
    expect((await ask(fresh, 'run:start', { scenarioId, speed: 0 })).status).toBe('ok');
  }, 120_000);
});
