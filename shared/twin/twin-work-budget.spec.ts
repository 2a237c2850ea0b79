import { describe, expect, it } from 'vitest';
import type { Scenario, ScenarioInput } from '../scenario/scenario-schema';
import { buildScenario } from './testing/build-scenario';
import { createTwinRun, simulateTwin, TWIN_DEFAULTS, type TwinTrace } from './twin-run';

const scenario = (patch: Partial<ScenarioInput>): Scenario => buildScenario({ horizon: 3, ...patch });

/**
 * In range for the parameter catalogue, yet a grind for the twin: the largest kd on a 1 g·m²
 * joint, a 1 µs sampled loop and friction, so the drive flips the joint through stiction almost
 * every sample.
 */
const grinding = () =>
  scenario({
    joint: { inertia: 1e-3, damping: 0.08, stiffness: 0 },
    controller: { mode: 'pid', kp: 10, ki: 2, kd: 1e7, derivativeOn: 'measurement', samplePeriod: 1e-6 },
    inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.8, delay: 0.2 }],
    nonlinear: { torqueLimit: 1.5, coulombFriction: 0.05, staticFriction: 0.08 },
  });

/** A run with friction, a sampled loop and a kick of every kind of edge: what a live run may slice. */
const everyEdge = () =>
  scenario({
    joint: { inertia: 0.03, damping: 0.08, stiffness: 0.2 },
    controller: { mode: 'pid', kp: 10, ki: 2, kd: 0.9, derivativeOn: 'measurement', samplePeriod: 0.002 },
    inputs: [
      { channel: 'reference', shape: 'step', amplitude: 0.8, delay: 0.2 },
      { channel: 'torque', shape: 'pulse', amplitude: -0.5, delay: 1, width: 0.3 },
    ],
    nonlinear: { torqueLimit: 1.5, coulombFriction: 0.05, staticFriction: 0.08, gravity: { mass: 0.3, arm: 0.15 } },
  });

const concat = (parts: TwinTrace[], key: 't' | 'angle' | 'velocity') => Float64Array.from(parts.flatMap((p) => Array.from(p[key])));

describe('the twin’s work budget', () => {
  it('stops an in-range scenario that grinds, naming the budget and the simulated time', () => {
    // A smaller allowance keeps the test short; TWIN_DEFAULTS' would stop it later, the same way.
    const { stop, samples } = simulateTwin(grinding(), { workBase: 2e5, workPerSample: 5 });
    expect(stop).toMatchObject({ reason: 'bound', message: expect.stringMatching(/^work budget: .* evaluations by t = 0\.\d{4} s, over the twin's allowance of 200000 \+ 100000 per simulated second \+ 5 per sample; the scenario is too stiff/) });
    // The grind starts with the reference step at 0.2 s and is stopped well before the horizon.
    expect(stop!.time).toBeGreaterThanOrEqual(0.2);
    expect(stop!.time).toBeLessThan(1);
    // Samples up to the stop are kept, finite.
    expect(samples.t[samples.t.length - 1]!).toBeLessThanOrEqual(stop!.time + 1e-12);
    expect(samples.angle.every(Number.isFinite)).toBe(true);
  });

  it('reports the work spent against the allowance reached; ordinary scenarios stay far inside it', () => {
    const run = createTwinRun(everyEdge());
    run.advance(run.horizon);
    expect(run.stop).toBeNull();
    expect(run.work.evaluations).toBeGreaterThan(0);
    expect(run.work.allowance).toBe(TWIN_DEFAULTS.workBase + TWIN_DEFAULTS.workPerSecond * 3 + TWIN_DEFAULTS.workPerSample * (3001 + 1501));
    expect(run.work.evaluations).toBeLessThan(run.work.allowance / 10);
  });
});

describe('advance with a wall-time deadline', () => {
  it('returns at a step boundary once the deadline has passed, still making progress, and resumes to the same run', () => {
    const whole = simulateTwin(everyEdge(), { maxChunk: 0.05 }).samples;
    const sliced = createTwinRun(everyEdge(), { maxChunk: 0.05 });
    const parts: TwinTrace[] = [];
    let calls = 0;
    let last = -1;
    // A deadline already passed: every call stops after its first integrator step (or stretch).
    while (!sliced.done) {
      parts.push(sliced.advance(sliced.time + 0.05, { deadline: 0, now: () => 1 }));
      expect(sliced.time).toBeGreaterThan(last);
      last = sliced.time;
      calls++;
    }
    expect(calls).toBeGreaterThan(1000);
    expect(sliced.stop).toBeNull();
    const t = concat(parts, 't');
    const angle = concat(parts, 'angle');
    expect(Array.from(t)).toEqual(Array.from(whole.t));
    // Restarting odex at a step boundary changes the result only at the integrator's tolerance (1e-10).
    let worst = 0;
    for (let i = 0; i < angle.length; i++) worst = Math.max(worst, Math.abs(angle[i]! - whole.angle[i]!));
    expect(worst).toBeLessThan(1e-8);
  });

  it('does not look at the clock when no deadline is given, and a far deadline changes nothing', () => {
    const whole = simulateTwin(everyEdge()).samples;
    const run = createTwinRun(everyEdge());
    let looked = 0;
    const samples = run.advance(run.horizon, { deadline: Infinity, now: () => ++looked });
    expect(run.done).toBe(true);
    expect(looked).toBeGreaterThan(0);
    expect(Array.from(samples.angle)).toEqual(Array.from(whole.angle));
  });

  it('keeps the per-stretch step bound across interruptions', () => {
    const stiff = scenario({
      joint: { inertia: 1e-4, damping: 0, stiffness: 1e10 },
      controller: { mode: 'open-loop' },
      inputs: [{ channel: 'torque', shape: 'step', amplitude: 1 }],
      horizon: 10,
    });
    const run = createTwinRun(stiff, { maxStepsPerChunk: 2000 });
    let calls = 0;
    while (!run.done && calls < 100_000) {
      run.advance(run.time + 0.05, { deadline: 0, now: () => 1 });
      calls++;
    }
    expect(run.stop?.message).toMatch(/^integrator work bound: odex used its 2000 steps between t = 0\.0000 s/);
  });
});
