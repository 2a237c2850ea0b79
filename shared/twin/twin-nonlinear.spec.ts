import { describe, expect, it } from 'vitest';
import { quantizeAngle } from './joint-effects';
import { buildScenario } from './testing/build-scenario';
import { createTwinRun, simulateTwin } from './twin-run';

const max = (a: ArrayLike<number>) => Array.from(a).reduce((m, v) => Math.max(m, v), -Infinity);
const count = (a: ArrayLike<number>) => Array.from(a).reduce((m, v) => m + v, 0);
const switches = (flags: Uint8Array) => flags.reduce((n, f, i) => (i > 0 && f !== flags[i - 1] ? n + 1 : n), 0);

describe('torque limit and anti-windup', () => {
  it('clamps the applied torque, flags the samples, and accelerates at limit/J while saturated', () => {
    const s = buildScenario({ joint: { inertia: 0.05, damping: 0, stiffness: 0 }, nonlinear: { torqueLimit: 0.5 } });
    const { samples } = simulateTwin(s, { dt: 0.001 });
    expect(max(samples.appliedTorque.map(Math.abs))).toBeLessThanOrEqual(0.5);
    samples.t.forEach((t, i) => {
      const over = Math.abs(samples.controllerTorque[i]!) > 0.5;
      expect(samples.saturating[i]).toBe(over ? 1 : 0);
      if (over) expect(Math.abs(samples.appliedTorque[i]!)).toBe(0.5);
    });
    // kp·0.5 = 4 N·m asked at first: saturated from rest, θ = L·t²/(2J) (Newton, common practice).
    expect(samples.saturating[0]).toBe(1);
    for (const i of [0, 20, 40, 60]) {
      const t = samples.t[i]!;
      expect(samples.saturating[i]).toBe(1);
      expect(samples.angle[i]).toBeCloseTo((0.5 * t * t) / (2 * 0.05), 10);
    }
    expect(count(samples.saturating)).toBeLessThan(samples.t.length);
  });

  it('keeps the integrator bounded with clamping and overshoots less than without', () => {
    const controller = { mode: 'pid', kp: 8, ki: 20, kd: 0.6, derivativeOn: 'measurement' } as const;
    const run = (antiWindup: boolean) =>
      simulateTwin(buildScenario({ controller, horizon: 4, nonlinear: { torqueLimit: 0.6, antiWindup } }), { dt: 0.001 }).samples;
    // Unfiltered derivative on measurement: I = (u/N − kp·e + kd·θ′)/ki recovers the integral.
    const integral = (x: ReturnType<typeof run>) => x.angle.map((a, i) => (x.controllerTorque[i]! - 8 * (0.5 - a) + 0.6 * x.velocity[i]!) / 20);
    const clamped = run(true);
    const windup = run(false);
    const iClamped = max(integral(clamped).map(Math.abs));
    const iWindup = max(integral(windup).map(Math.abs));
    expect(iClamped).toBeLessThan(0.5 * iWindup);
    expect(max(clamped.angle) - 0.5).toBeLessThan(max(windup.angle) - 0.5);
    // Both settle on the reference: integral action removes the steady error either way.
    expect(clamped.angle.at(-1)).toBeCloseTo(0.5, 3);
    // While saturated with the error pushing further, a clamped integrator does not move.
    const ic = integral(clamped);
    for (let i = 1; i < 100; i++) if (clamped.saturating[i] && clamped.saturating[i - 1]) expect(ic[i]).toBeCloseTo(ic[i - 1]!, 9);
  });
});

describe('Coulomb friction with stiction', () => {
  it('holds the joint still below breakaway without chatter, then slides under torque minus Coulomb', () => {
    // Open loop, torque ramp τ = t: stuck until τ reaches 0.5 N·m at t = 0.5 s, then
    // J·θ″ = t − 0.3, so θ′ = ((t − 0.3)² − 0.2²)/(2J) (Newton with constant sliding friction, common practice).
    const s = buildScenario({
      joint: { inertia: 0.2, damping: 0, stiffness: 0 },
      controller: { mode: 'open-loop' },
      inputs: [{ channel: 'torque', shape: 'ramp', amplitude: 1 }],
      horizon: 1,
      nonlinear: { coulombFriction: 0.3, staticFriction: 0.5 },
    });
    const { samples, effects } = simulateTwin(s, { dt: 0.001 });
    samples.t.forEach((t, i) => {
      if (t < 0.5 - 1e-9) {
        expect(samples.angle[i]).toBe(0);
        expect(samples.velocity[i]).toBe(0);
        expect(samples.sticking[i]).toBe(1);
      } else if (t > 0.5 + 1e-9) {
        expect(samples.sticking[i]).toBe(0);
        expect(samples.velocity[i]).toBeCloseTo(((t - 0.3) ** 2 - 0.04) / 0.4, 8);
      }
    });
    expect(switches(samples.sticking)).toBe(1);
    expect(effects.map((e) => e.effect)).toEqual(['stiction', 'friction']);
  });

  // Den Hartog, Mechanical Vibrations, Coulomb damping: each half cycle of period π/ω loses 2τc/k
  // of amplitude (from memory). 0.105 → −0.085 → 0.065 → −0.045 → 0.025 → −0.005, where the spring
  // torque 0.5 N·m is below the 1 N·m breakaway: stuck from t = 5π/10 s on. The second case runs
  // it under a sampled loop with zero gains and output at the sample instants: every stretch is
  // one sample long with no grid point inside, and each slide ends inside one, which the twin
  // must still find.
  it.each([
    ['in open loop', { mode: 'open-loop' }],
    ['with the integrator restarted at every sample', { mode: 'pid', kp: 0, ki: 0, kd: 0, samplePeriod: 0.0005 }],
  ] as const)('lets a spring–mass ring down linearly by 2τc/k per half cycle and stop where k·|θ| ≤ τs, %s', (_case, controller) => {
    const s = buildScenario({
      joint: { inertia: 1, damping: 0, stiffness: 100 },
      controller,
      inputs: [],
      initial: { angle: 0.105, velocity: 0 },
      horizon: 3,
      nonlinear: { coulombFriction: 1 },
    });
    const { samples } = simulateTwin(s, { dt: 0.0005 });
    const half = Math.PI / 10;
    [0.105, -0.085, 0.065, -0.045, 0.025, -0.005].forEach((amplitude, k) => {
      const i = Math.round((k * half) / 0.0005);
      expect(samples.angle[i]).toBeCloseTo(amplitude, 6);
    });
    const stopIndex = Math.ceil((5 * half) / 0.0005);
    for (let i = stopIndex; i < samples.t.length; i++) {
      expect(samples.angle[i]).toBeCloseTo(-0.005, 9);
      expect(samples.sticking[i]).toBe(1);
    }
    expect(samples.sticking.slice(0, stopIndex - 1).every((f) => f === 0)).toBe(true);
  });
});

describe('gravity load', () => {
  it('settles at the equilibrium sin(θ + offset) = τ/(m·g·l) under a constant torque', () => {
    const mgl = 0.4 * 9.80665 * 0.25;
    const s = buildScenario({
      joint: { inertia: 0.05, damping: 0.5, stiffness: 0 },
      controller: { mode: 'open-loop' },
      inputs: [{ channel: 'torque', shape: 'step', amplitude: 0.5 * mgl }],
      horizon: 12,
      nonlinear: { gravity: { mass: 0.4, arm: 0.25, offset: 0.2 } },
    });
    const { samples } = simulateTwin(s, { dt: 0.01 });
    // Static balance of torques (common practice): m·g·l·sin(θ + offset) = τ.
    expect(samples.angle.at(-1)).toBeCloseTo(Math.asin(0.5) - 0.2, 6);
  });

  it('is held on the reference by a PID loop with integral action', () => {
    const s = buildScenario({
      controller: { mode: 'pid', kp: 20, ki: 30, kd: 1, derivativeOn: 'measurement' },
      horizon: 8,
      nonlinear: { gravity: { mass: 0.5, arm: 0.2, offset: Math.PI / 2 } },
    });
    const { samples, effects } = simulateTwin(s, { dt: 0.01 });
    expect(samples.angle.at(-1)).toBeCloseTo(0.5, 5);
    // The integral carries the gravity torque m·g·l·sin(0.5 + π/2) at rest.
    expect(samples.controllerTorque.at(-1)).toBeCloseTo(0.5 * 9.80665 * 0.2 * Math.cos(0.5), 4);
    expect(effects[0]).toMatchObject({ effect: 'gravity', time: 0 });
  });
});

describe('drive dead band', () => {
  it('passes nothing within ±deadBand and τ − deadBand beyond it', () => {
    const run = (torque: number) =>
      simulateTwin(
        buildScenario({
          joint: { inertia: 0.5, damping: 0, stiffness: 0 },
          controller: { mode: 'open-loop' },
          inputs: [{ channel: 'torque', shape: 'step', amplitude: torque }],
          horizon: 1,
          nonlinear: { deadBand: 0.2 },
        }),
        { dt: 0.01 },
      ).samples;
    const small = run(0.15);
    expect(max(small.angle.map(Math.abs))).toBe(0);
    expect(max(small.appliedTorque.map(Math.abs))).toBe(0);
    const large = run(-0.5);
    large.t.forEach((t, i) => expect(large.angle[i]).toBeCloseTo((-0.3 * t * t) / (2 * 0.5), 10));
  });
});

describe('sampled measurement', () => {
  const sampledP = (nonlinear: object) =>
    buildScenario({
      controller: { mode: 'pid', kp: 8, kd: 0, derivativeOn: 'measurement', samplePeriod: 0.01 },
      joint: { inertia: 0.05, damping: 0.8, stiffness: 0 },
      horizon: 1,
      nonlinear,
    });

  it('quantizes the measured angle to whole encoder counts', () => {
    const { samples, effects } = simulateTwin(sampledP({ encoderCounts: 64 }), { dt: 0.01 });
    const count = (2 * Math.PI) / 64;
    samples.t.forEach((_, i) => {
      // P only: u = kp·(r − measured), so the measurement is r − u/kp.
      const measured = 0.5 - samples.controllerTorque[i]! / 8;
      expect(measured).toBeCloseTo(quantizeAngle(samples.angle[i]!, 64), 12);
      expect(Math.abs(measured / count - Math.round(measured / count))).toBeLessThan(1e-9);
    });
    // 0.5 rad is between counts 5 and 6 (0.49 and 0.59 rad): the loop cannot settle on it exactly.
    expect(Math.abs(samples.angle.at(-1)! - 0.5)).toBeGreaterThan(1e-3);
    expect(effects.some((e) => e.effect === 'quantization')).toBe(true);
  });

  it('draws reproducible noise: the same seed repeats the run, another seed does not', () => {
    const a = simulateTwin(sampledP({ noiseStdDev: 0.002, noiseSeed: 42 }), { dt: 0.01 }).samples;
    const b = simulateTwin(sampledP({ noiseStdDev: 0.002, noiseSeed: 42 }), { dt: 0.01 }).samples;
    const c = simulateTwin(sampledP({ noiseStdDev: 0.002, noiseSeed: 43 }), { dt: 0.01 }).samples;
    expect(Array.from(b.angle)).toEqual(Array.from(a.angle));
    expect(Array.from(c.angle)).not.toEqual(Array.from(a.angle));
    const noise = a.angle.map((angle, i) => 0.5 - a.controllerTorque[i]! / 8 - angle);
    expect(max(noise.map(Math.abs))).toBeGreaterThan(0.002);
    expect(max(noise.map(Math.abs))).toBeLessThan(0.002 * 6);
  });

  it('applies each torque one period late with a compute delay', () => {
    const prompt = simulateTwin(sampledP({}), { dt: 0.01 }).samples;
    const late = simulateTwin(sampledP({ computeDelay: true }), { dt: 0.01 }).samples;
    expect(prompt.controllerTorque[0]).toBeCloseTo(4, 12);
    expect(late.controllerTorque[0]).toBe(0);
    expect(late.controllerTorque[1]).toBeCloseTo(4, 12);
    expect(late.angle[1]).toBe(0);
    expect(prompt.angle[1]).toBeGreaterThan(0);
  });
});

describe('every effect at once', () => {
  it('streams the same samples in pieces as in one go, and stays finite', () => {
    const s = buildScenario({
      controller: { mode: 'pid', kp: 8, ki: 4, kd: 0.6, derivativeOn: 'measurement', samplePeriod: 0.002 },
      inputs: [
        { channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0.05 },
        { channel: 'torque', shape: 'pulse', amplitude: -0.3, delay: 0.8, width: 0.2 },
      ],
      nonlinear: {
        torqueLimit: 1.5,
        coulombFriction: 0.05,
        staticFriction: 0.08,
        gravity: { mass: 0.3, arm: 0.15, offset: Math.PI / 2 },
        deadBand: 0.01,
        computeDelay: true,
        encoderCounts: 4096,
        noiseStdDev: 2e-4,
        noiseSeed: 5,
      },
    });
    const whole = simulateTwin(s, { dt: 0.001 });
    expect(whole.stop).toBeNull();
    const run = createTwinRun(s, { dt: 0.001 });
    const angle: number[] = [];
    for (let until = 0.03; !run.done; until += 0.03) angle.push(...run.advance(until).angle);
    expect(angle).toEqual(Array.from(whole.samples.angle));
    expect(whole.samples.angle.every(Number.isFinite)).toBe(true);
    // Stiction with integral action hunts around the set-point (stick, wind up, break away).
    expect(Math.abs(whole.samples.angle.at(-1)! - 0.5)).toBeLessThan(0.05);
    expect(new Set(whole.effects.map((e) => e.effect))).toEqual(new Set(['torqueLimit', 'deadBand', 'friction', 'stiction', 'gravity', 'quantization', 'noise']));
  });
});
