import { performance } from 'node:perf_hooks';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CheckResponse } from '../../shared/protocol/check-api';
import { parseScenario } from '../../shared/scenario/parse-scenario';
import { AppError } from '../http/app-error';
import { createLogger } from '../logging/logger';
import { apiClient, createTestTeam, demoScenarioDocument, readJson, startTestServer, type TestMember, type TestServer } from '../testing/test-server';
import { createCheckPool } from './check-pool';
import { slowWrist } from './testing/slow-wrist';

const DEMOS = ['wrist-pitch-step.json', 'elbow-free-swing.json', 'gantry-axis-ramp.json', 'shoulder-hold-disturbance.json'];

/** Demo data (invented numbers): the wrist demo behind a 1 N·m drive limit, which its 0.5 rad step exceeds at once. */
function torqueLimitedWrist(): Record<string, unknown> {
  return { ...demoScenarioDocument('wrist-pitch-step.json'), name: 'Wrist pitch behind a 1 N·m limit', nonlinear: { torqueLimit: 1 } };
}

async function postChecks(member: TestMember, scenario: unknown): Promise<{ status: number; body: any; ms: number }> {
  const started = performance.now();
  const res = await member.api.post('/api/checks', { scenario });
  const body = await readJson(res);
  return { status: res.status, body, ms: performance.now() - started };
}

describe('POST /api/checks against the real server', () => {
  let t: TestServer;
  let team: Awaited<ReturnType<typeof createTestTeam>>;

  beforeAll(async () => {
    t = await startTestServer({ KINETWIN_CHECK_WORKERS: '2' });
    team = await createTestTeam(t, 'Checks lab');
  });
  afterAll(() => t.close());

  it('passes the superposition and shift checks of every linear demo, in a worker thread', async () => {
    expect(t.server.checkThreads()).toBe(0);
    for (const file of DEMOS) {
      const { status, body } = await postChecks(team.members.viewer, demoScenarioDocument(file));
      expect(status, file).toBe(200);
      const answer = body as CheckResponse;
      expect(answer.superposition, file).toMatchObject({ pass: true, threshold: 1e-4 });
      expect(answer.superposition.reason, file).toMatch(/^superposition holds/);
      expect(answer.shift.pass, file).toBe(true);
      expect(answer.linearRange, file).toMatchObject({ scale: 1000, passesAtMax: true, triedScales: [0.001, 1000] });
      // Every effect off: twin and closed form agree to integration error (see run-checks.spec.ts).
      expect(answer.twinVsClosedForm, file).toMatchObject({ available: true, twinStop: null });
      if (answer.twinVsClosedForm.available) expect(answer.twinVsClosedForm.max, file).toBeLessThan(1e-6);
      expect(answer.elapsedMs, file).toBeGreaterThan(0);
    }
    // The pool started a thread for them: the checks did not run on the event loop.
    expect(t.server.checkThreads()).toBeGreaterThanOrEqual(1);
  });

  it('fails superposition on the torque-limited wrist with a reason naming the limit', async () => {
    const { status, body } = await postChecks(team.members.engineer, torqueLimitedWrist());
    expect(status).toBe(200);
    const answer = body as CheckResponse;
    expect(answer.superposition.pass).toBe(false);
    expect(answer.superposition.worst).toBeGreaterThan(answer.superposition.threshold);
    expect(answer.superposition.reason).toMatch(/^torque limit ±1 N·m reached at t = 0.100 s/);
    expect(answer.linearRange.passesAtMax).toBe(false);
    expect(answer.linearRange.summary).toMatch(/^superposition holds up to input scale 0.1\d+ \(fails at/);
  });

  it('answers 400 with field errors for an invalid draft, and runs nothing', async () => {
    const broken = { ...demoScenarioDocument(), joint: { inertia: -1, damping: 0.04, stiffness: 0 } };
    let res = await postChecks(team.members.engineer, broken);
    expect(res.status).toBe(400);
    expect(res.body.error.message).toBe('The scenario cannot be checked; no checks were run.');
    expect(res.body.error.fields).toContainEqual({ field: 'scenario.joint.inertia', message: 'inertia must be positive' });

    const missing = await team.members.engineer.api.post('/api/checks', {});
    expect(missing.status).toBe(400);
    expect((await readJson(missing)).error.fields).toEqual([{ field: 'scenario', message: 'scenario is required' }]);

    // Valid for the schema, refused by the twin: an encoder needs a sampled controller.
    res = await postChecks(team.members.engineer, { ...demoScenarioDocument(), nonlinear: { encoderCounts: 4096 } });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual([{ field: 'scenario.nonlinear.encoderCounts', message: 'encoderCounts acts on a sampled measurement: set controller.samplePeriod' }]);
  });

  it('answers 401 without a session', async () => {
    const res = await apiClient(t.baseUrl, null).post('/api/checks', { scenario: demoScenarioDocument() });
    expect(res.status).toBe(401);
    expect((await readJson(res)).error.code).toBe('unauthorized');
  });

  // Decided on ordering, not speed (the latency figures are in `npm run bench`): probes answered
  // during the second half of the check's own computation prove it did not hold the event loop.
  it('keeps answering the health probe while a slow check runs', { timeout: 120_000 }, async () => {
    let finished = false;
    const check = postChecks(team.members.lead, slowWrist(5)).finally(() => (finished = true));
    const answeredAt: number[] = [];
    while (!finished) {
      const res = await fetch(`${t.baseUrl}/api/health`);
      expect(res.status).toBe(200);
      await res.json();
      if (!finished) answeredAt.push(performance.now());
    }
    const checkAnsweredAt = performance.now();
    const { status, body } = await check;
    expect(status).toBe(200);
    const answer = body as CheckResponse;
    expect(answer.superposition.pass).toBe(false);
    // The server runs in this very process: one clock for the probes and the check's answer. Had
    // the check run on the event loop, no probe could have been answered while it computed.
    const computingFrom = checkAnsweredAt - answer.elapsedMs / 2;
    const duringCheck = answeredAt.filter((at) => at >= computingFrom && at <= checkAnsweredAt);
    expect(duringCheck.length).toBeGreaterThanOrEqual(3);
  });

  it('stops the jobs of clients that went away, freeing the workers for the next check', { timeout: 60_000 }, async () => {
    // Two checks of minutes each would hold both workers; their clients give up.
    const member = team.members.engineer;
    const leaving = [new AbortController(), new AbortController()];
    const abandoned = leaving.map((controller) =>
      fetch(`${t.baseUrl}/api/checks`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', cookie: member.session.cookie, 'x-csrf-token': member.session.csrfToken },
        body: JSON.stringify({ scenario: slowWrist(600) }),
        signal: controller.signal,
      }).catch((err: unknown) => err),
    );
    // Wait until both jobs hold a worker, measured rather than slept.
    await expect.poll(() => t.server.checkThreads(), { timeout: 30_000 }).toBe(2);
    await new Promise((resolve) => setImmediate(resolve));
    leaving.forEach((controller) => controller.abort());
    expect(await Promise.all(abandoned)).toEqual([expect.objectContaining({ name: 'AbortError' }), expect.objectContaining({ name: 'AbortError' })]);
    const next = await postChecks(member, demoScenarioDocument());
    expect(next.status).toBe(200);
    // Answered at all: the abandoned jobs would have held both workers for minutes, far past
    // this test's time-out.
  });
});

describe('POST /api/checks when the pool is full', () => {
  let t: TestServer;
  let team: Awaited<ReturnType<typeof createTestTeam>>;

  beforeAll(async () => {
    t = await startTestServer({ KINETWIN_CHECK_WORKERS: '1', KINETWIN_CHECK_QUEUE: '1' });
    team = await createTestTeam(t, 'Busy lab');
  });
  afterAll(() => t.close());

  it('runs one, queues one and refuses the third with 503', async () => {
    // Sent together; whichever arrives third finds one running and one waiting.
    const answers = await Promise.all([team.members.engineer, team.members.lead, team.members.admin].map((m) => postChecks(m, slowWrist(2))));
    const statuses = answers.map((a) => a.status).sort();
    expect(statuses).toEqual([200, 200, 503]);
    const refused = answers.find((a) => a.status === 503)!;
    expect(refused.body.error).toEqual({
      code: 'checks_busy',
      message: 'The server is already running checks for others (1 running, 1 waiting, the most it takes). Try again in a minute.',
    });
    // The refusal did not wait for the running check.
    expect(refused.ms).toBeLessThan(Math.min(...answers.filter((a) => a.status === 200).map((a) => a.ms)));
    // Once they are answered, the next one is taken again.
    expect((await postChecks(team.members.viewer, demoScenarioDocument())).status).toBe(200);
  });
});

describe('POST /api/checks past the time limit', () => {
  let t: TestServer;
  let team: Awaited<ReturnType<typeof createTestTeam>>;

  beforeAll(async () => {
    t = await startTestServer({ KINETWIN_CHECK_WORKERS: '1', KINETWIN_CHECK_TIME_LIMIT_MS: '10000' });
    team = await createTestTeam(t, 'Patient lab');
  });
  afterAll(() => t.close());

  // The limit leaves the next check, which starts a fresh worker thread, ample room on a busy
  // machine; how far past the limit the 504 comes is measured in `npm run bench`.
  it('stops a check that would run for minutes, answers 504, and takes the next one', { timeout: 60_000 }, async () => {
    // 300 s of a sampled 1 ms loop: minutes of checks, stopped at 10 s.
    const { status, body, ms } = await postChecks(team.members.engineer, slowWrist(300));
    expect(status).toBe(504);
    expect(body.error.code).toBe('checks_timeout');
    expect(body.error.message).toMatch(/^The checks did not finish within 10 s \(waiting for a free worker included\) and were stopped\. .*lengthen controller\.samplePeriod/);
    // Not stopped before its limit.
    expect(ms).toBeGreaterThanOrEqual(10_000);
    // The stopped worker was ended and replaced on demand: the same one-worker pool answers again.
    const next = await postChecks(team.members.engineer, demoScenarioDocument());
    expect(next.status).toBe(200);
    expect((next.body as CheckResponse).superposition.pass).toBe(true);
  });
});

describe('the check pool when its worker fails', () => {
  it('rejects with a 500 AppError, logs the error, and keeps serving', async () => {
    const logged: unknown[] = [];
    const logger = createLogger('silent');
    logger.error = ((obj: unknown) => logged.push(obj)) as typeof logger.error;
    const failing = createCheckPool({
      workers: 1,
      queueSize: 1,
      timeLimitMs: 20_000,
      logger,
      workerFile: new URL('./testing/failing-check-worker.ts', import.meta.url).href,
    });
    const parsed = parseScenario(demoScenarioDocument());
    if (!parsed.ok) throw new Error('demo scenario invalid');
    try {
      for (let i = 0; i < 2; i++) {
        const failure = await failing.run({ kind: 'checks', scenario: parsed.value }).then(
          () => null,
          (err: unknown) => err,
        );
        expect(failure).toBeInstanceOf(AppError);
        expect(failure).toMatchObject({ status: 500, code: 'checks_failed', message: 'The checks failed in their worker thread; the error has been logged and the server is unaffected.' });
      }
      expect(logged).toHaveLength(2);
      expect(String((logged[0] as { err: Error }).err.message)).toMatch(/failing check worker refused "Wrist pitch: 0.5 rad move" on purpose/);
      expect(failing.pending()).toBe(0);
    } finally {
      await failing.close();
    }
    expect(failing.threads()).toBe(0);
    await expect(failing.run({ kind: 'checks', scenario: parsed.value })).rejects.toMatchObject({ status: 503, code: 'shutting_down' });
  });
});
