import { describe, expect, it } from 'vitest';
import type { ScenarioInput } from '../scenario/scenario-schema';
import { buildScenario } from './testing/build-scenario';
import { createTwinRun } from './twin-run';

/** Grid samples where `inside` changes from the sample before. */
const edges = (n: number, inside: (i: number) => boolean) => {
  let count = 0;
  for (let i = 1; i < n; i++) if (inside(i) !== inside(i - 1)) count++;
  return count;
};

const runToHorizon = (patch: Partial<ScenarioInput>) => {
  const run = createTwinRun(buildScenario({ horizon: 10, ...patch }));
  const samples = run.advance(run.horizon);
  expect(run.stop).toBeNull();
  expect(run.done).toBe(true);
  return { run, samples };
};

const ringingPid = { mode: 'pid', kp: 20, ki: 10, kd: 0.05, derivativeOn: 'measurement' } as const;

// Each boundary between two regimes, driven across many times. A chattering rule switches
// thousands of times or exhausts the work budget near the first crossing; the bounds below are
// a few times what each run needs (measured counts in the comments).
describe('regime boundaries do not chatter', () => {
  it('crosses the saturation edge without anti-windup in no events: the clamp is continuous', () => {
    const { run, samples } = runToHorizon({ controller: ringingPid, nonlinear: { torqueLimit: 0.5, antiWindup: false } });
    const L = 0.5;
    // Measured: 30 crossings of ±L on the grid, 0 switches, 1.8e4 evaluations.
    expect(edges(samples.t.length, (i) => Math.abs(samples.controllerTorque[i]!) > L)).toBeGreaterThan(10);
    expect(run.switches).toEqual({ friction: 0, integrator: 0 });
    expect(run.work.evaluations).toBeLessThan(1e5);
  });

  it('crosses the saturation edge with anti-windup in about one switch per crossing', () => {
    const { run, samples } = runToHorizon({ controller: ringingPid, nonlinear: { torqueLimit: 0.5 } });
    const crossings = edges(samples.t.length, (i) => samples.saturating[i] === 1);
    // Measured: 43 crossings on the grid, 44 switches, 4.1e4 evaluations.
    expect(crossings).toBeGreaterThan(10);
    expect(run.switches.integrator).toBeLessThanOrEqual(2 * crossings + 2);
    expect(run.work.evaluations).toBeLessThan(2e5);
  });

  it('crosses the dead band edges in no events: the dead band is a continuous map', () => {
    const { run, samples } = runToHorizon({
      controller: { mode: 'pid', kp: 8, ki: 4, kd: 0.6, derivativeOn: 'measurement' },
      inputs: [{ channel: 'reference', shape: 'sine', amplitude: 0.02, frequency: 2 }],
      nonlinear: { deadBand: 0.05 },
    });
    // Measured: 14 crossings of ±0.05 N·m on the grid, 1.0e4 evaluations.
    expect(edges(samples.t.length, (i) => Math.abs(samples.controllerTorque[i]!) <= 0.05)).toBeGreaterThan(5);
    expect(run.switches).toEqual({ friction: 0, integrator: 0 });
    expect(run.work.evaluations).toBeLessThan(1e5);
  });

  it('sticks and slips under a PID loop hunting a moving reference in one event per switch', () => {
    const { run, samples } = runToHorizon({
      controller: { mode: 'pid', kp: 8, ki: 4, kd: 0.6, derivativeOn: 'measurement' },
      inputs: [{ channel: 'reference', shape: 'sine', amplitude: 0.05, frequency: 3 }],
      nonlinear: { coulombFriction: 0.05, staticFriction: 0.08 },
    });
    const sticks = edges(samples.t.length, (i) => samples.sticking[i] === 1);
    // Measured: 19 stick/slip edges on the grid, 19 friction events, 1.8e4 evaluations.
    expect(sticks).toBeGreaterThan(10);
    expect(run.switches.friction).toBeLessThanOrEqual(2 * sticks + 2);
    expect(run.work.evaluations).toBeLessThan(2e5);
  });

  it('slides on the limit with friction on, both regimes switching at located events only', () => {
    const { run } = runToHorizon({
      joint: { inertia: 0.05, damping: 5, stiffness: 0 },
      controller: { mode: 'pid', kp: 10, ki: 50, kd: 0.1, derivativeOn: 'measurement' },
      inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0.05 }],
      horizon: 4,
      nonlinear: { torqueLimit: 1, coulombFriction: 0.1, staticFriction: 0.15 },
    });
    // Measured: frozen, sliding, integrating (3) and a slip then a stick at rest (2).
    expect(run.switches).toEqual({ friction: 2, integrator: 3 });
  });
});
