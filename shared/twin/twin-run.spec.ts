import { describe, expect, it } from 'vitest';
import type { Scenario, ScenarioInput } from '../scenario/scenario-schema';
import { buildScenario } from './testing/build-scenario';
import { createTwinRun, simulateTwin } from './twin-run';

// The shared test joint, with a 3 s horizon unless a test sets its own.
const scenario = (patch: Partial<ScenarioInput>): Scenario => buildScenario({ horizon: 3, ...patch });

const maxAbs = (a: ArrayLike<number>) => Array.from(a).reduce((m, v) => Math.max(m, Math.abs(v)), 0);

describe('twin run, all effects off', () => {
  it('matches the textbook underdamped step response of J·θ″ + (b + N·kd)·θ′ + N·kp·θ = N·kp·A', () => {
    // Ogata, Modern Control Engineering (5th ed.), §5-3, underdamped unit-step response (from memory):
    // y = y∞·[1 − e^(−ζωn·t)·(cos ωd·t + ζ/√(1−ζ²)·sin ωd·t)].
    const s = scenario({ joint: { inertia: 0.05, damping: 0.02, stiffness: 0, gearRatio: 2 } });
    const { samples, stop } = simulateTwin(s, { dt: 0.001 });
    expect(stop).toBeNull();
    const n = 2;
    const wn = Math.sqrt((n * 8) / 0.05);
    const zeta = (0.02 + n * 0.6) / (2 * 0.05 * wn);
    expect(zeta).toBeLessThan(1);
    const wd = wn * Math.sqrt(1 - zeta * zeta);
    let worst = 0;
    samples.t.forEach((t, i) => {
      const exact = 0.5 * (1 - Math.exp(-zeta * wn * t) * (Math.cos(wd * t) + (zeta / Math.sqrt(1 - zeta * zeta)) * Math.sin(wd * t)));
      worst = Math.max(worst, Math.abs(samples.angle[i]! - exact));
    });
    expect(samples.t.length).toBe(3001);
    expect(samples.t[3000]).toBeCloseTo(3, 12);
    expect(worst).toBeLessThan(1e-8 * 0.5);
  });

  it('moves a free inertia under a delayed torque step as θ = τ·(t − a)²/(2J)', () => {
    // Newton's second law with constant torque (common practice).
    const s = scenario({
      joint: { inertia: 2, damping: 0, stiffness: 0 },
      controller: { mode: 'open-loop' },
      inputs: [{ channel: 'torque', shape: 'step', amplitude: 4, delay: 0.5 }],
      horizon: 2,
    });
    const { samples } = simulateTwin(s, { dt: 0.01 });
    samples.t.forEach((t, i) => {
      const exact = t >= 0.5 ? (4 * (t - 0.5) ** 2) / 4 : 0;
      expect(Math.abs(samples.angle[i]! - exact)).toBeLessThan(1e-8);
    });
  });

  it('turns a torque impulse into a velocity jump A/J that decays as e^(−b·t/J)', () => {
    // J·θ″ + b·θ′ = A·δ(t − a): θ′ = (A/J)·e^(−b(t−a)/J), θ = (A/b)·(1 − e^(−b(t−a)/J)) (common practice).
    const s = scenario({
      joint: { inertia: 0.5, damping: 0.25, stiffness: 0 },
      controller: { mode: 'open-loop' },
      inputs: [{ channel: 'torque', shape: 'impulse', amplitude: 0.1, delay: 0.3 }],
      horizon: 2,
    });
    const { samples } = simulateTwin(s, { dt: 0.1 });
    samples.t.forEach((t, i) => {
      const tau = t - 0.3;
      const v = tau >= -1e-12 ? 0.2 * Math.exp(-0.5 * tau) : 0;
      const x = tau >= -1e-12 ? 0.4 * (1 - Math.exp(-0.5 * tau)) : 0;
      expect(samples.velocity[i]).toBeCloseTo(v, 9);
      expect(samples.angle[i]).toBeCloseTo(x, 9);
    });
  });

  it('gives the derivative kick N·kd·A/J and the response of the extra zero under derivative on error', () => {
    const base = { joint: { inertia: 0.05, damping: 0.02, stiffness: 0.3, gearRatio: 1.5 }, horizon: 2 } as const;
    const onMeasurement = simulateTwin(scenario({ ...base }), { dt: 0.001 }).samples;
    const onError = simulateTwin(scenario({ ...base, controller: { mode: 'pid', kp: 8, kd: 0.6, derivativeOn: 'error' } }), { dt: 0.001 }).samples;
    expect(onError.velocity[0]).toBeCloseTo((1.5 * 0.6 * 0.5) / 0.05, 9);
    expect(onMeasurement.velocity[0]).toBe(0);
    // Numerator kp + kd·s = kp·(1 + (kd/kp)·s): the on-error response is the on-measurement one
    // plus kd/kp times its derivative (linearity and the derivative rule, common practice).
    let worst = 0;
    onError.angle.forEach((a, i) => {
      worst = Math.max(worst, Math.abs(a - (onMeasurement.angle[i]! + (0.6 / 8) * onMeasurement.velocity[i]!)));
    });
    expect(worst).toBeLessThan(1e-8);
  });

  it('streams the same samples in pieces as in one go', () => {
    const s = scenario({
      inputs: [
        { channel: 'reference', shape: 'pulse', amplitude: 0.4, delay: 0.2, width: 0.5 },
        { channel: 'torque', shape: 'sine', amplitude: 0.05, frequency: 9, delay: 0.37 },
      ],
      controller: { mode: 'pid', kp: 8, ki: 2, kd: 0.6, derivativeFilter: 0.01 },
    });
    const whole = simulateTwin(s, { dt: 0.002 }).samples;
    const run = createTwinRun(s, { dt: 0.002 });
    const pieces: number[] = [];
    const times: number[] = [];
    for (let until = 0.033; !run.done; until += 0.033) {
      const chunk = run.advance(until);
      pieces.push(...chunk.angle);
      times.push(...chunk.t);
    }
    expect(times).toEqual(Array.from(whole.t));
    expect(maxAbs(pieces.map((v, i) => v - whole.angle[i]!))).toBeLessThan(1e-9);
  });
});

describe('twin run bounds', () => {
  it('stops a runaway loop at the angle or velocity bound with the samples so far', () => {
    // s³ + kp·s + ki has no s² term: unstable by the Routh criterion (common practice).
    const s = scenario({
      joint: { inertia: 1, damping: 0, stiffness: 0 },
      controller: { mode: 'pid', kp: 1, ki: 100, kd: 0 },
      horizon: 600,
    });
    const { samples, stop } = simulateTwin(s, { dt: 0.01 });
    expect(stop?.reason).toBe('bound');
    expect(stop?.message).toMatch(/runs away/);
    expect(samples.t.length).toBeGreaterThan(10);
    expect(samples.angle.every(Number.isFinite)).toBe(true);
    expect(stop!.time).toBeLessThan(600);
  });

  it('stops a stiff scenario at the integrator work bound instead of hanging', () => {
    const s = scenario({
      joint: { inertia: 1e-4, damping: 0, stiffness: 1e10 },
      controller: { mode: 'open-loop' },
      inputs: [{ channel: 'torque', shape: 'step', amplitude: 1 }],
      horizon: 10,
    });
    const { stop } = simulateTwin(s, { maxStepsPerChunk: 2000 });
    expect(stop?.message).toMatch(/integrator work bound/);
  });
});
