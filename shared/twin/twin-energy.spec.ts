import { describe, expect, it } from 'vitest';
import { buildScenario } from './testing/build-scenario';
import { simulateTwin } from './twin-run';

const G = 9.80665;

describe('energy bookkeeping of the open-loop joint', () => {
  // E = ½·J·θ′² + ½·k·θ² + m·g·l·(1 − cos(θ + offset)); dE/dt = −b·θ′² (work–energy theorem, common practice).
  const energy = (J: number, k: number, mgl: number, offset: number, angle: number, velocity: number) =>
    0.5 * J * velocity * velocity + 0.5 * k * angle * angle + mgl * (1 - Math.cos(angle + offset));

  it('keeps kinetic plus potential energy constant without damping, gravity included', () => {
    const s = buildScenario({
      joint: { inertia: 0.08, damping: 0, stiffness: 2 },
      controller: { mode: 'open-loop' },
      inputs: [],
      initial: { angle: 1.2, velocity: 0.5 },
      horizon: 5,
      nonlinear: { gravity: { mass: 0.3, arm: 0.4 } },
    });
    const { samples } = simulateTwin(s, { dt: 0.005 });
    const mgl = 0.3 * G * 0.4;
    const e0 = energy(0.08, 2, mgl, 0, 1.2, 0.5);
    let drift = 0;
    samples.t.forEach((_, i) => {
      drift = Math.max(drift, Math.abs(energy(0.08, 2, mgl, 0, samples.angle[i]!, samples.velocity[i]!) - e0));
    });
    expect(drift / e0).toBeLessThan(1e-8);
  });

  it('loses exactly the damping work ∫ b·θ′² dt', () => {
    const b = 0.05;
    const dt = 0.0005;
    const s = buildScenario({
      joint: { inertia: 0.08, damping: b, stiffness: 2 },
      controller: { mode: 'open-loop' },
      inputs: [],
      initial: { angle: 0.8, velocity: 0 },
      horizon: 3,
      nonlinear: { gravity: { mass: 0.3, arm: 0.4, offset: 0.3 } },
    });
    const { samples } = simulateTwin(s, { dt });
    const mgl = 0.3 * G * 0.4;
    const e = (i: number) => energy(0.08, 2, mgl, 0.3, samples.angle[i]!, samples.velocity[i]!);
    // Composite Simpson's rule on the even number of intervals (Abramowitz & Stegun 25.4.6).
    const last = samples.t.length - 1;
    expect(last % 2).toBe(0);
    let work = 0;
    for (let i = 0; i <= last; i++) {
      const weight = i === 0 || i === last ? 1 : i % 2 === 1 ? 4 : 2;
      work += weight * b * samples.velocity[i]! ** 2;
    }
    work *= dt / 3;
    const lost = e(0) - e(last);
    expect(lost).toBeGreaterThan(0.1 * e(0));
    expect(Math.abs(lost - work) / e(0)).toBeLessThan(1e-9);
  });
});
