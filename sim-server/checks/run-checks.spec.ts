import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { CHECK_DEFAULTS } from '../../shared/checks/check-verdict';
import { parseScenario } from '../../shared/scenario/parse-scenario';
import type { Scenario } from '../../shared/scenario/scenario-schema';
import { closedFormResidualBody, runChecks, verdictBody } from './run-checks';

function demo(file: string, change: (doc: Record<string, unknown>) => Record<string, unknown> = (doc) => doc): Scenario {
  const doc = JSON.parse(readFileSync(new URL(`../../scenarios/${file}`, import.meta.url), 'utf8')) as Record<string, unknown>;
  const parsed = parseScenario(change(doc));
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.errors));
  return parsed.value;
}

// Demo data (invented numbers): the wrist demo behind a 1 N·m drive limit. Its PD on the
// measurement asks kp·0.5 rad = 3 N·m at the reference step, so the limit bites at once.
const torqueLimited = demo('wrist-pitch-step.json', (doc) => ({ ...doc, nonlinear: { torqueLimit: 1 } }));

// Demo data (invented numbers): J = 1, no damping, kp = 1, ki = 100 and no derivative. The loop's
// characteristic polynomial s³ + s + 100 fails the Routh–Hurwitz test (common practice: for
// a3·s³ + a2·s² + a1·s + a0 every coefficient must be positive and a2·a1 > a3·a0; here a2 = 0).
const unstable = parseScenario({
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'Runaway integrator',
  joint: { inertia: 1, damping: 0, stiffness: 0 },
  controller: { mode: 'pid', kp: 1, ki: 100 },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.1 }],
  horizon: 400,
});

describe('runChecks', () => {
  it('passes the superposition and shift checks of a linear demo, over the whole range tried, and agrees with the closed form', () => {
    const result = runChecks(demo('wrist-pitch-step.json'));
    expect(result.superposition).toMatchObject({ pass: true, threshold: CHECK_DEFAULTS.threshold });
    expect(result.superposition.reason).toMatch(/^superposition holds/);
    expect(result.shift.pass).toBe(true);
    expect(result.shift.reason).toMatch(/^time invariance holds for a shift of 0.5 s/);
    expect(result.linearRange).toEqual({
      scale: 1000,
      smallestScale: null,
      passesAtMax: true,
      summary: 'superposition holds at every end of the range tried, 0.001 to 1000',
      triedScales: [0.001, 1000],
    });
    const residual = result.twinVsClosedForm;
    if (!residual.available) throw new Error(residual.reason);
    // Every effect off: the twin is the linear model, so the residual is integration error
    // (shared/checks/twin-vs-closed-form.spec.ts holds the twin to 1e-6 of the peak).
    expect(residual.max).toBeLessThan(1e-6 * 0.5);
    expect(residual.rms).toBeLessThanOrEqual(residual.max);
    expect(residual.twinStop).toBeNull();
    expect(result.elapsedMs).toBeGreaterThan(0);
  });

  it('fails superposition under a torque limit, names the limit, and finds where linearity ends', () => {
    const result = runChecks(torqueLimited);
    expect(result.superposition.pass).toBe(false);
    expect(result.superposition.worst).toBeGreaterThan(result.superposition.threshold);
    expect(result.superposition.reason).toMatch(/^torque limit ±1 N·m reached at t = 0.100 s/);
    // Delaying the input delays the saturation with it: time invariance survives a torque limit.
    expect(result.shift.pass).toBe(true);
    // The 2·u1 run asks 2·kp·0.5·s = 6·s N·m at the step, so the limit bites from s = 1/6 (Newton,
    // common practice). Just past it the clipped torque changes the angle by less than the 1e-4
    // threshold, so the passing scale may sit a little above 1/6 (as in shared/checks/checks.spec.ts).
    expect(result.linearRange.passesAtMax).toBe(false);
    expect(result.linearRange.scale).toBeGreaterThan((1 / 6) * 0.99);
    expect(result.linearRange.scale).toBeLessThan((1 / 6) * 1.1);
    expect(result.linearRange.summary).toMatch(/^superposition holds up to input scale 0.1[67]\d* \(fails at 0.1\d+: torque limit ±1 N·m reached/);
    // The closed form ignores the limit: the residual is the limit's effect, far above integration error.
    expect(result.twinVsClosedForm).toMatchObject({ available: true, twinStop: null });
    if (result.twinVsClosedForm.available) expect(result.twinVsClosedForm.max).toBeGreaterThan(0.01);
  });

  it('answers a runaway loop with null figures and reasons, all of it JSON-safe', () => {
    if (!unstable.ok) throw new Error(JSON.stringify(unstable.errors));
    const result = runChecks(unstable.value);
    expect(result.superposition).toMatchObject({ pass: false, worst: null });
    expect(result.superposition.reason).toMatch(/^the u1 run stopped before its horizon: angle left ±1000000 rad/);
    expect(result.shift).toMatchObject({ pass: false, worst: null });
    expect(result.linearRange).toMatchObject({ scale: null, smallestScale: null, passesAtMax: false });
    expect(result.twinVsClosedForm).toEqual({ available: false, reason: expect.stringMatching(/^the scenario has no closed form: "horizon": the response grows past/) });
    // JSON.stringify turns Infinity and NaN into null silently: the round trip must change nothing.
    expect(JSON.parse(JSON.stringify(result))).toEqual(result);
  });
});

describe('verdictBody', () => {
  it('sends an infinite deviation as null and keeps the rest', () => {
    const reason = 'the u1 run stopped before its horizon';
    expect(verdictBody({ pass: false, worst: Infinity, threshold: 1e-4, worstTime: 2, reason })).toEqual({ pass: false, worst: null, threshold: 1e-4, worstTime: 2, reason });
    expect(verdictBody({ pass: true, worst: 3e-9, threshold: 1e-4, worstTime: 0.5, reason: 'holds' }).worst).toBe(3e-9);
  });
});

describe('closedFormResidualBody', () => {
  it('compares on the checks grid, so a long horizon stays within the sample cap', () => {
    // 100 s at 1 ms would be 100 001 samples; the checks grid uses 100 s / 20 000 = 5 ms.
    const body = closedFormResidualBody({ ...demo('wrist-pitch-step.json'), horizon: 100 });
    expect(body).toMatchObject({ available: true, twinStop: null });
    if (body.available) expect(body.timeOfMax % 0.005).toBeCloseTo(0, 9);
  });
});
