import { describe, expect, it } from 'vitest';
import type { ScenarioInput } from '../scenario/scenario-schema';
import { buildScenario } from './testing/build-scenario';
import { createTwinRun, simulateTwin } from './twin-run';

// Issue 10 §1: a joint creeping at its torque limit, whose request falls back to the limit while
// the error is still 0.1 rad. Clamping as a switch inside the right-hand side chattered there.
const J = 0.05;
const b = 5;
const kp = 10;
const ki = 50;
const kd = 0.1;
const L = 1;
const A = 0.5;
const STEP_AT = 0.05;

const issueScenario = (patch: Partial<ScenarioInput> = {}) =>
  buildScenario({
    joint: { inertia: J, damping: b, stiffness: 0 },
    controller: { mode: 'pid', kp, ki, kd, derivativeOn: 'measurement' },
    inputs: [{ channel: 'reference', shape: 'step', amplitude: A, delay: STEP_AT }],
    horizon: 4,
    nonlinear: { torqueLimit: L, antiWindup: true },
    ...patch,
  });

/** Finds where f turns from ≤ 0 to > 0 on [lo, hi] by bisection (common practice). */
function crossing(f: (t: number) => number, lo: number, hi: number): number {
  let a = lo;
  let c = hi;
  for (let i = 0; i < 200 && c - a > 1e-15; i++) {
    const m = 0.5 * (a + c);
    if (f(m) > 0) c = m;
    else a = m;
  }
  return c;
}

/**
 * The sliding-motion solution written out by hand. At the limit the joint obeys
 * J·θ″ = L − b·θ′, so from rest at the step θ′ = (L/b)(1 − e^(−bτ/J)) and
 * θ = (L/b)(τ − (J/b)(1 − e^(−bτ/J))) (first-order lag, common practice). Frozen: I = 0 until
 * u = kp·e − kd·θ′ falls to L. Sliding (Filippov's motion, u held at L): I = (L − kp·e + kd·θ′)/ki,
 * so I′ = (kp·θ′ + kd·θ″)/ki, until I′ reaches e. Then the loop is linear,
 * J·θ″ = kp·e + ki·I − (kd + b)·θ′, I′ = e, integrated here with classical RK4 (Kutta 1901, common
 * practice) at 1e-5 s. Returns θ on the grid k·dt and the phase boundaries.
 */
function slidingReference(horizon: number, dt: number) {
  const tau = (t: number) => t - STEP_AT;
  const velocity = (t: number) => (L / b) * (1 - Math.exp((-b * tau(t)) / J));
  const angle = (t: number) => (L / b) * (tau(t) - (J / b) * (1 - Math.exp((-b * tau(t)) / J)));
  const acceleration = (t: number) => (L / J) * Math.exp((-b * tau(t)) / J);
  const request = (t: number) => kp * (A - angle(t)) - kd * velocity(t);
  const slideFrom = crossing((t) => L - request(t), STEP_AT + 0.01, horizon);
  const slideTo = crossing((t) => (kp * velocity(t) + kd * acceleration(t)) / ki - (A - angle(t)), slideFrom, horizon);

  const h = 1e-5;
  const rates = ([th, v, i]: number[]) => [v!, (kp * (A - th!) + ki * i! - (kd + b) * v!) / J, A - th!];
  const rk4 = (x: number[], step: number) => {
    const k1 = rates(x);
    const k2 = rates(x.map((xi, j) => xi + 0.5 * step * k1[j]!));
    const k3 = rates(x.map((xi, j) => xi + 0.5 * step * k2[j]!));
    const k4 = rates(x.map((xi, j) => xi + step * k3[j]!));
    return x.map((xi, j) => xi + (step / 6) * (k1[j]! + 2 * k2[j]! + 2 * k3[j]! + k4[j]!));
  };
  const angles: number[] = [];
  let x = [angle(slideTo), velocity(slideTo), (L - kp * (A - angle(slideTo)) + kd * velocity(slideTo)) / ki];
  let at = slideTo;
  let largestLinearRequest = 0;
  for (let k = 0; k <= Math.round(horizon / dt); k++) {
    const t = k * dt;
    if (t < STEP_AT) angles.push(0);
    else if (t < slideTo) angles.push(angle(t));
    else {
      while (at < t - 1e-15) {
        const step = Math.min(h, t - at);
        x = rk4(x, step);
        at += step;
        largestLinearRequest = Math.max(largestLinearRequest, Math.abs(kp * (A - x[0]!) + ki * x[2]! - kd * x[1]!));
      }
      angles.push(x[0]!);
    }
  }
  return { angles, slideFrom, slideTo, largestLinearRequest };
}

describe('anti-windup on the limit: the sliding motion', () => {
  it('runs the issue’s scenario to its 4 s horizon in three located integrator switches', () => {
    const run = createTwinRun(issueScenario());
    const samples = run.advance(run.horizon);
    expect(run.stop).toBeNull();
    expect(run.done).toBe(true);
    expect(samples.t.length).toBe(4001);
    // Frozen at the step, sliding from ≈ 2.05 s, integrating again from ≈ 2.36 s; a chattering
    // rule would switch thousands of times (it used odex's 20000 steps in one second).
    expect(run.switches).toEqual({ friction: 0, integrator: 3 });
    expect(run.work.evaluations).toBeLessThan(run.work.allowance / 100);
  });

  it('matches the sliding-motion solution written out by hand (analytic at the limit, RK4 after)', () => {
    const { samples } = simulateTwin(issueScenario(), { dt: 0.001 });
    const reference = slidingReference(4, 0.001);
    // The hand solution's own premise: after the slide the request stays inside the limit.
    expect(reference.largestLinearRequest).toBeLessThan(L);
    // With the lag long settled (θ′ = 0.2 rad/s, θ = 0.2τ − 0.002): u = L at e = 0.102, τ = 2;
    // I′ = kp·θ′/ki = 0.04 rad reaches e at e = 0.04, τ = 2.31.
    expect(reference.slideFrom).toBeCloseTo(2.05, 9);
    expect(reference.slideTo).toBeCloseTo(2.36, 9);
    const peak = Math.max(...reference.angles.map(Math.abs));
    let worst = 0;
    reference.angles.forEach((angle, k) => (worst = Math.max(worst, Math.abs(samples.angle[k]! - angle))));
    // The issue asks for 1e-6 of the peak; measured 6e-11 rad (RK4's and odex's errors together).
    expect(worst).toBeLessThan(1e-6 * peak);
    expect(worst).toBeLessThan(1e-9);
  });

  it('holds |u| on the limit to 1e-9 while sliding, the integral moving at α·e with 0 ≤ α ≤ 1', () => {
    const { samples } = simulateTwin(issueScenario(), { dt: 0.001 });
    const { slideFrom, slideTo } = slidingReference(4, 0.001);
    // Unfiltered derivative on measurement: I = (u − kp·e + kd·θ′)/ki recovers the integral.
    const integral = (i: number) => (samples.controllerTorque[i]! - kp * (A - samples.angle[i]!) + kd * samples.velocity[i]!) / ki;
    let inside = 0;
    for (let i = 0; i + 1 < samples.t.length; i++) {
      const t = samples.t[i]!;
      if (t <= slideFrom + 0.002 || samples.t[i + 1]! >= slideTo - 0.002) continue;
      inside++;
      expect(samples.saturating[i]).toBe(1);
      expect(samples.appliedTorque[i]).toBe(L);
      expect(Math.abs(samples.controllerTorque[i]! - L)).toBeLessThan(1e-9);
      // Central difference against e at the midpoint, both second-order accurate in dt.
      const rate = (integral(i + 1) - integral(i)) / 0.001;
      const midError = A - 0.5 * (samples.angle[i]! + samples.angle[i + 1]!);
      expect(rate).toBeGreaterThan(0);
      expect(rate).toBeLessThan(midError + 1e-6);
    }
    expect(inside).toBeGreaterThan(250);
  });

  it('is the limit a sampled loop converges to as its period shrinks, the gap in proportion to the period', { timeout: 120_000 }, () => {
    // The twin's sampled controller applies the same clamping rule once per period; between
    // samples it cannot chatter, and its average over the boundary is the sliding motion (Utkin,
    // Sliding Modes in Control and Optimization, 1992, ch. 2, from memory). Compared over 3 s,
    // which holds the slide and the way out of it.
    const horizon = 3;
    const continuous = simulateTwin(issueScenario({ horizon }), { dt: 0.001 }).samples;
    const gaps = [1e-3, 1e-4, 1e-5].map((samplePeriod) => {
      const { samples, stop } = simulateTwin(issueScenario({ horizon, controller: { mode: 'pid', kp, ki, kd, derivativeOn: 'measurement', samplePeriod } }), { dt: 0.001 });
      expect(stop).toBeNull();
      let gap = 0;
      for (let i = 0; i < continuous.t.length; i++) gap = Math.max(gap, Math.abs(samples.angle[i]! - continuous.angle[i]!));
      return gap;
    });
    // First order: each tenth of the period leaves about a tenth of the gap (measured 8.8e-5, 8.9e-6, 9.8e-7).
    expect(gaps[0]).toBeLessThan(2e-4);
    expect(gaps[1]! / gaps[0]!).toBeGreaterThan(0.05);
    expect(gaps[1]! / gaps[0]!).toBeLessThan(0.2);
    expect(gaps[2]! / gaps[1]!).toBeGreaterThan(0.05);
    expect(gaps[2]! / gaps[1]!).toBeLessThan(0.2);
  });

  it('keeps its regime across sliced advances: a deadline passed at every call gives the same run', () => {
    const whole = createTwinRun(issueScenario(), { maxChunk: 0.05 });
    const expected = whole.advance(whole.horizon);
    const sliced = createTwinRun(issueScenario(), { maxChunk: 0.05 });
    const angle: number[] = [];
    while (!sliced.done) angle.push(...sliced.advance(sliced.time + 0.05, { deadline: 0, now: () => 1 }).angle);
    expect(sliced.stop).toBeNull();
    expect(sliced.switches).toEqual(whole.switches);
    expect(angle).toHaveLength(expected.angle.length);
    // A restart at a step boundary changes the run only at the integrator's tolerance (1e-10).
    angle.forEach((a, i) => expect(Math.abs(a - expected.angle[i]!)).toBeLessThan(1e-8));
  });

  it('takes a kick while sliding as if the kick had been in the scenario from the start', () => {
    // Stretches of 50 ms: the first advance ends inside the slide, where the kick starts.
    const live = createTwinRun(issueScenario(), { maxChunk: 0.05 });
    const angle = Array.from(live.advance(2.2).angle);
    expect(live.time).toBeGreaterThan(2.1);
    expect(live.time).toBeLessThan(2.3);
    const added = live.kick({ channel: 'torque', shape: 'step', amplitude: 0.3 });
    if (!added.ok) throw new Error(JSON.stringify(added.errors));
    angle.push(...live.advance(live.horizon).angle);
    expect(live.stop).toBeNull();
    const planned = simulateTwin(issueScenario({ inputs: [...live.inputs] }), { maxChunk: 0.05 });
    expect(planned.stop).toBeNull();
    expect(angle).toHaveLength(planned.samples.angle.length);
    // Samples after the kick instant agree; the one at the instant itself was sent before it.
    const from = Math.floor(added.value.delay / 0.001) + 1;
    for (let i = from; i < angle.length; i++) expect(Math.abs(angle[i]! - planned.samples.angle[i]!)).toBeLessThan(1e-8);
  });

  it('slides on −L as on +L: the mirrored step gives the mirrored run', () => {
    const up = simulateTwin(issueScenario()).samples;
    const down = simulateTwin(issueScenario({ inputs: [{ channel: 'reference', shape: 'step', amplitude: -A, delay: STEP_AT }] }));
    expect(down.stop).toBeNull();
    up.angle.forEach((angle, i) => expect(down.samples.angle[i]).toBeCloseTo(-angle, 12));
  });

  // The sliding rate needs D′: from the filter state with Tf > 0, from θ″ and r″ without one.
  // A wrong D′ would drift u off the limit at once (kd·r″ alone is 0.018 N·m/s here).
  it.each([
    ['a derivative filter (Tf = 10 ms), on measurement', { derivativeOn: 'measurement', derivativeFilter: 0.01 }, [], 1e-8],
    ['derivative on error under a sine on the reference', { derivativeOn: 'error' }, [{ channel: 'reference', shape: 'sine', amplitude: 0.02, frequency: 3 }], 1e-9],
    ['a filtered derivative on error under a sine', { derivativeOn: 'error', derivativeFilter: 0.01 }, [{ channel: 'reference', shape: 'sine', amplitude: 0.02, frequency: 3 }], 1e-8],
    ['derivative on error under a ramp', { derivativeOn: 'error' }, [{ channel: 'reference', shape: 'ramp', amplitude: 0.05, delay: STEP_AT }], 1e-9],
  ] as const)('holds the request on the limit with %s', (_case, derivative, extra, tolerance) => {
    const s = issueScenario({
      controller: { mode: 'pid', kp, ki, kd, ...derivative },
      inputs: [{ channel: 'reference', shape: 'step', amplitude: A, delay: STEP_AT }, ...extra],
    });
    const run = createTwinRun(s);
    const samples = run.advance(run.horizon);
    expect(run.stop).toBeNull();
    expect(run.switches.integrator).toBeLessThan(10);
    // The longest stretch of consecutive samples on the limit to the tolerance: the slide.
    let longest = 0;
    let current = 0;
    for (let i = 0; i < samples.t.length; i++) {
      const onLimit = samples.saturating[i] === 1 && Math.abs(Math.abs(samples.controllerTorque[i]!) - L) < tolerance;
      current = onLimit ? current + 1 : 0;
      longest = Math.max(longest, current);
    }
    expect(longest).toBeGreaterThan(250);
  });
});
