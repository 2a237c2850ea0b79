import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { frequencyResponseOf } from '../../shared/frequency/frequency-response';
import type { OperatingRangeResponse, SineSweepResponse } from '../../shared/protocol/check-api';
import { parseScenario } from '../../shared/scenario/parse-scenario';
import { createTestTeam, demoScenarioDocument, readJson, startTestServer, type TestServer } from '../testing/test-server';

const g = 9.80665;

describe('the pool\'s other batch work: the measured sweep and the operating range', () => {
  let t: TestServer;
  let team: Awaited<ReturnType<typeof createTestTeam>>;

  beforeAll(async () => {
    t = await startTestServer({ KINETWIN_CHECK_WORKERS: '2' });
    team = await createTestTeam(t, 'Batch lab');
  });
  afterAll(() => t.close());

  it('measures the twin at log-spaced frequencies on both worker threads, in the order asked, equal to the closed form with every effect off', async () => {
    const scenario = demoScenarioDocument('wrist-pitch-step.json');
    const res = await team.members.viewer.api.post('/api/checks/sine-sweep', { scenario, from: 2, to: 50, points: 3 });
    expect(res.status).toBe(200);
    const body = (await readJson(res)) as SineSweepResponse;
    expect(body.channel).toBe('reference');
    // Dealt round-robin over the two threads and put back in order.
    expect(body.points.map((p) => p.frequency)).toEqual([2, expect.closeTo(10, 9), 50]);
    const parsed = parseScenario(scenario);
    if (!parsed.ok) throw new Error('demo invalid');
    for (const p of body.points) {
      const cf = frequencyResponseOf(parsed.value, { from: p.frequency, to: p.frequency * (1 + 1e-9), points: 2 });
      if (!cf.ok) throw new Error('closed form refused');
      expect(p.reason).toBeNull();
      expect(Math.abs(10 ** ((p.magnitudeDb! - cf.value.referenceToAngle!.magnitudeDb[0]!) / 20) - 1)).toBeLessThan(1e-3);
    }
    expect(body.elapsedMs).toBeGreaterThan(0);
    expect(t.server.checkThreads()).toBe(2);
  });

  it('refuses a bad sweep with field errors and runs nothing', async () => {
    const scenario = demoScenarioDocument();
    const api = team.members.engineer.api;
    const tooMany = await api.post('/api/checks/sine-sweep', { scenario, from: 1, to: 10, points: 500 });
    expect(tooMany.status).toBe(400);
    expect((await readJson(tooMany)).error.fields[0].field).toBe('points');
    const upside = await api.post('/api/checks/sine-sweep', { scenario, from: 10, to: 1, points: 5 });
    expect((await readJson(upside)).error.fields[0].field).toBe('to');
    // The worker refuses what has no steady state, with the reason, as a 400.
    const unstable = { ...scenario, joint: { inertia: 1, damping: 0, stiffness: 0 }, controller: { mode: 'pid', kp: 1, ki: 10 } };
    const r = await api.post('/api/checks/sine-sweep', { scenario: unstable, from: 1, to: 2, points: 2 });
    expect(r.status).toBe(400);
    expect((await readJson(r)).error.fields[0].message).toMatch(/unstable/);
  });

  it('linearizes a gravity-loaded joint at 60° and says how large a move the linear model describes', async () => {
    const [mass, arm] = [0.4, 0.15];
    const scenario = { ...demoScenarioDocument('wrist-pitch-step.json'), nonlinear: { gravity: { mass, arm } } };
    const res = await team.members.engineer.api.post('/api/checks/operating-range', { scenario, angle: Math.PI / 3, tolerance: 0.01 });
    expect(res.status).toBe(200);
    const body = (await readJson(res)) as OperatingRangeResponse;
    const k = (scenario as unknown as { joint: { stiffness: number } }).joint.stiffness;
    expect(body.effectiveStiffness).toBeCloseTo(k + mass * g * arm * 0.5, 10);
    expect(parseScenario(body.linear).ok).toBe(true);
    expect(body.range?.summary).toMatch(/the linear model agrees with the twin within 1 % of the peak/);
    expect(body.notes[0]).toMatch(/^linearized about θ0 = 1\.0472 rad \(60°\)/);
  });

  it('refuses to linearize a joint without gravity, naming the field', async () => {
    const res = await team.members.engineer.api.post('/api/checks/operating-range', { scenario: demoScenarioDocument(), angle: 0.5 });
    expect(res.status).toBe(400);
    const body = await readJson(res);
    expect(body.error.message).toBe('The joint cannot be linearized there; nothing was run.');
    expect(body.error.fields).toEqual([{ field: 'nonlinear.gravity', message: expect.stringMatching(/no gravity load/) }]);
  });
});
