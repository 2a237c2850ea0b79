import { describe, expect, it } from 'vitest';
import { responseAt } from './response-evaluator';
import { solved } from './testing/make-scenario';

describe('initial value theorem (θ(0+), θ′(0+) beside θ(0−), θ′(0−))', () => {
  it('shows the derivative kick N·kd·A/J of a reference step with derivative on error (kinetwin joint model)', () => {
    const J = 0.05;
    const N = 3;
    const kd = 0.2;
    const A = 0.4;
    const s = solved({
      joint: { inertia: J, damping: 0.1, stiffness: 0, gearRatio: N },
      controller: { mode: 'pid', kp: 2, ki: 1, kd },
      inputs: [{ channel: 'reference', shape: 'step', amplitude: A }],
    });
    expect(s.initialValue).toMatchObject({ applies: true, angle: 0, before: { angle: 0, velocity: 0 } });
    expect(s.initialValue.velocity).toBeCloseTo((N * kd * A) / J, 12);
    // The time-domain terms agree with the theorem at 0+.
    expect(responseAt(s.plan, 0, 1)).toBeCloseTo((N * kd * A) / J, 10);
  });

  it('shows no kick with derivative on measurement or with a derivative filter', () => {
    for (const controller of [
      { mode: 'pid' as const, kp: 2, kd: 0.2, derivativeOn: 'measurement' as const },
      { mode: 'pid' as const, kp: 2, kd: 0.2, derivativeFilter: 0.01 },
    ]) {
      const s = solved({ joint: { inertia: 0.05, damping: 0.1, stiffness: 0 }, controller, inputs: [{ channel: 'reference', shape: 'step', amplitude: 1 }] });
      expect(s.initialValue.velocity).toBeCloseTo(0, 12);
    }
  });

  it('shows the velocity jump A/J of a torque impulse, and keeps the initial state', () => {
    const s = solved({
      joint: { inertia: 2, damping: 0.5, stiffness: 3 },
      initial: { angle: 0.3, velocity: -0.1 },
      inputs: [{ channel: 'torque', shape: 'impulse', amplitude: 0.8 }],
    });
    expect(s.initialValue.angle).toBeCloseTo(0.3, 14);
    expect(s.initialValue.velocity).toBeCloseTo(-0.1 + 0.8 / 2, 14);
    expect(s.initialValue.before).toEqual({ angle: 0.3, velocity: -0.1 });
    expect(responseAt(s.plan, 0, 0)).toBeCloseTo(0.3, 13);
    expect(responseAt(s.plan, 0, 1)).toBeCloseTo(0.3, 13);
  });

  it('ignores terms that start later', () => {
    const s = solved({ inputs: [{ channel: 'torque', shape: 'impulse', amplitude: 1, delay: 0.5 }] });
    expect(s.initialValue).toMatchObject({ angle: 0, velocity: 0 });
  });
});

describe('final value theorem with its verdict', () => {
  it('gives lim sΘ(s) when every pole of sΘ(s) is in the open left half-plane', () => {
    // Open loop: θ∞ = A/k for a torque step.
    const s = solved({ joint: { inertia: 1, damping: 1, stiffness: 4 }, inputs: [{ channel: 'torque', shape: 'step', amplitude: 2 }] });
    expect(s.finalValue).toEqual({ applies: true, value: expect.closeTo(0.5, 14), reason: null });
  });

  it('gives the resting angle after an impulse on a joint without stiffness (A/b plus the free drift)', () => {
    const s = solved({ joint: { inertia: 1, damping: 2, stiffness: 0 }, initial: { angle: 0.1, velocity: 0.4 }, inputs: [{ channel: 'torque', shape: 'impulse', amplitude: 3 }] });
    expect(s.finalValue.value).toBeCloseTo(0.1 + 0.4 / 2 + 3 / 2, 14);
  });

  it('does not apply to a sinusoidal input', () => {
    const s = solved({ inputs: [{ channel: 'torque', shape: 'sine', amplitude: 1, frequency: 2 }] });
    expect(s.finalValue.applies).toBe(false);
    expect(s.finalValue.value).toBeNull();
    expect(s.finalValue.reason).toContain('imaginary axis');
    expect(s.finalValue.reason).toContain('input 0 (sine on torque');
  });

  it('does not apply to a double integrator', () => {
    const s = solved({ joint: { inertia: 1, damping: 0, stiffness: 0 }, inputs: [{ channel: 'torque', shape: 'impulse', amplitude: 1 }] });
    expect(s.finalValue).toMatchObject({ applies: false, value: null });
    expect(s.finalValue.reason).toContain('double integrator');
    expect(s.stability).toBe('unstable');
  });

  it('does not apply to a torque step on a joint without stiffness (the angle ramps)', () => {
    const s = solved({ joint: { inertia: 1, damping: 1, stiffness: 0 }, inputs: [{ channel: 'torque', shape: 'step', amplitude: 1 }] });
    expect(s.finalValue.applies).toBe(false);
    expect(s.finalValue.reason).toContain('s = 0');
    expect(s.stability).toBe('marginal');
  });

  it('does not apply to an undamped joint', () => {
    const s = solved({ joint: { inertia: 1, damping: 0, stiffness: 4 }, inputs: [{ channel: 'torque', shape: 'step', amplitude: 1 }] });
    expect(s.finalValue.applies).toBe(false);
    expect(s.finalValue.reason).toContain('undamped');
  });

  it('does not apply to an unstable loop', () => {
    // J s³ + N kp s + N ki with no damping and no derivative: Routh–Hurwitz fails (s² coefficient 0).
    const s = solved({ joint: { inertia: 1, damping: 0, stiffness: 0 }, controller: { mode: 'pid', kp: 1, ki: 10 }, inputs: [{ channel: 'reference', shape: 'step', amplitude: 1 }], horizon: 5 });
    expect(s.finalValue.applies).toBe(false);
    expect(s.finalValue.reason).toContain('unstable');
    expect(s.stable).toBe(false);
    expect(s.metrics).toEqual({ riseTime: null, overshootPercent: null, peakTime: null, settlingTime: null, steadyStateError: null });
    expect(s.metricsReason).toContain('not stable');
  });

  it('rejects a torque disturbance completely with integral action', () => {
    const s = solved({
      joint: { inertia: 0.1, damping: 0.2, stiffness: 0 },
      controller: { mode: 'pid', kp: 5, ki: 3, kd: 0.5 },
      inputs: [
        { channel: 'reference', shape: 'step', amplitude: 1 },
        { channel: 'torque', shape: 'step', amplitude: -2, delay: 1 },
      ],
    });
    expect(s.finalValue.value).toBeCloseTo(1, 13);
    expect(s.dcGain.reference).toBeCloseTo(1, 14);
    expect(s.dcGain.torque).toBe(0);
  });

  it('applies when delayed terms cancel the pole at s = 0 (a ramp minus a delayed ramp)', () => {
    // r = A(t − a1)u(t − a1) − A(t − a2)u(t − a2) → A(a2 − a1); a type-1 loop follows it exactly.
    const s = solved({
      joint: { inertia: 0.05, damping: 0.1, stiffness: 0.2, gearRatio: 5 },
      controller: { mode: 'pid', kp: 4, ki: 6, kd: 0.2, derivativeFilter: 0.002 },
      inputs: [
        { channel: 'reference', shape: 'ramp', amplitude: 1, delay: 0.2 },
        { channel: 'reference', shape: 'ramp', amplitude: -1, delay: 1.2 },
      ],
    });
    expect(s.finalValue).toEqual({ applies: true, value: expect.closeTo(1, 12), reason: null });
    expect(s.metrics.steadyStateError).toBeCloseTo(0, 12);
    expect(responseAt(s.plan, 9.5, 0)).toBeCloseTo(1, 6);
  });

  it('applies to two opposite impulses on a double integrator (the joint coasts, then stops)', () => {
    // θ = (A/J)(t − a1) − (A/J)(t − a2) → (A/J)(a2 − a1) for t > a2
    const s = solved({
      joint: { inertia: 2, damping: 0, stiffness: 0 },
      inputs: [
        { channel: 'torque', shape: 'impulse', amplitude: 1 },
        { channel: 'torque', shape: 'impulse', amplitude: -1, delay: 0.5 },
      ],
    });
    expect(s.finalValue.value).toBeCloseTo(0.25, 14);
  });

  it('gives the steady-state error of a hold under a torque disturbance (r − θ, no reference step needed)', () => {
    // PD hold, no integral: θ∞ = T/(k + N kp) for a torque step T.
    const s = solved({
      joint: { inertia: 0.9, damping: 0.6, stiffness: 0, gearRatio: 50 },
      controller: { mode: 'pid', kp: 3.2, kd: 0.5, derivativeFilter: 0.005 },
      inputs: [{ channel: 'torque', shape: 'step', amplitude: -8, delay: 0.5 }],
    });
    expect(s.finalValue.value).toBeCloseTo(-8 / (50 * 3.2), 14);
    expect(s.metrics.steadyStateError).toBeCloseTo(8 / (50 * 3.2), 14);
    expect(s.metrics.overshootPercent).toBeNull();
  });

  it('leaves the steady-state error undefined when the reference never settles', () => {
    const s = solved({
      joint: { inertia: 1, damping: 2, stiffness: 0 },
      controller: { mode: 'pid', kp: 4, ki: 1 },
      inputs: [{ channel: 'reference', shape: 'ramp', amplitude: 1 }],
    });
    expect(s.finalValue.applies).toBe(false);
    expect(s.metrics.steadyStateError).toBeNull();
  });
});

