import { describe, expect, it } from 'vitest';
import { makeScenario } from '../closed-form/testing/make-scenario';
import { solveClosedForm } from '../closed-form';
import { gravityTorque } from '../twin/joint-effects';
import { simulateTwin } from '../twin/twin-run';
import { linearizeAbout } from './operating-point';
import { operatingRange } from './operating-range';

const g = 9.80665;
const [mass, arm] = [2, 0.3];
const W = mass * g * arm;
const arm60 = makeScenario({
  name: 'elbow on a gravity load',
  joint: { inertia: 0.2, damping: 0.5, stiffness: 0.8 },
  controller: { mode: 'pid', kp: 40, kd: 3, derivativeOn: 'measurement' },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.05, delay: 0.1 }],
  nonlinear: { gravity: { mass, arm } },
  horizon: 3,
});
const theta0 = Math.PI / 3;

function linearized(angle = theta0, holding: 'feed-forward' | 'disturbance' = 'feed-forward') {
  const r = linearizeAbout(arm60, { angle, holding });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

describe('linearizing a gravity-loaded joint about an operating angle', () => {
  it('the effective stiffness is k + m·g·l·cos θ0 and the holding torque k·θ0 + m·g·l·sin θ0 (a pendulum linearized about θ0; common practice)', () => {
    const p = linearized();
    expect(p.effectiveStiffness).toBeCloseTo(0.8 + W * Math.cos(theta0), 12);
    expect(p.holdingTorque).toBeCloseTo(0.8 * theta0 + W * Math.sin(theta0), 12);
    expect(p.linear.joint.stiffness).toBe(p.effectiveStiffness);
    expect(p.linear.nonlinear?.gravity).toBeUndefined();
  });

  it("agrees with a central finite difference of the twin's own gravity torque (the right-hand side's only nonlinear term here)", () => {
    const h = 1e-6;
    const slope = (gravityTorque(theta0 + h, W, 0) - gravityTorque(theta0 - h, W, 0)) / (2 * h);
    // Linear joint: J δ″ + b δ′ + k_eff δ = …, and the load's slope enters with the opposite sign.
    expect(linearized().effectiveStiffness).toBeCloseTo(0.8 - slope, 7);
  });

  it("agrees with a central finite difference of the twin's own acceleration about θ0 (the twin run itself, open loop, from θ0 ± h at rest)", () => {
    const p = linearized();
    const J = p.nonlinear.joint.inertia;
    // Open loop, holding terms only: the acceleration at rest is the net torque over J.
    const openLoop = { ...p.nonlinear, controller: { ...p.nonlinear.controller, mode: 'open-loop' as const }, inputs: p.nonlinear.inputs.slice(p.moves.length), horizon: 1e-3 };
    const [h, t] = [1e-4, 1e-5];
    const accelerationAt = (delta: number) => {
      const run = simulateTwin({ ...openLoop, initial: { angle: delta, velocity: 0 } }, { dt: t });
      // v(t) = a·t + O(t²) from rest.
      return run.samples.velocity[1]! / t;
    };
    const slope = (accelerationAt(h) - accelerationAt(-h)) / (2 * h);
    expect(-J * slope / p.effectiveStiffness).toBeCloseTo(1, 3);
  });

  it('above horizontal the effective stiffness is negative: an unstable plant, said in the notes', () => {
    const p = linearized((2 * Math.PI) / 3 + 0.3);
    expect(p.effectiveStiffness).toBeLessThan(0);
    expect(p.notes.join(' ')).toMatch(/the open-loop plant is unstable/);
    const cf = solveClosedForm(p.linear);
    expect(cf.ok && cf.value.notes.some((n) => n.startsWith('negative stiffness'))).toBe(true);
  });

  it('with feed-forward θ0 is an equilibrium of the nonlinear twin: without a move it does not stir', () => {
    const p = linearized();
    const still = simulateTwin({ ...p.nonlinear, inputs: p.nonlinear.inputs.slice(p.moves.length) }, { dt: 0.01 });
    expect(Math.max(...still.samples.angle.map(Math.abs))).toBeLessThan(1e-12);
  });

  it('as a disturbance the holding torque is a constant torque on the linear model, and the loop droops by H/(N·kp + k_eff) (final value theorem)', () => {
    const p = linearized(theta0, 'disturbance');
    expect(p.linear.inputs.at(-1)).toMatchObject({ channel: 'torque', shape: 'step', amplitude: -p.holdingTorque, delay: 0 });
    const cf = solveClosedForm({ ...p.linear, inputs: p.linear.inputs.slice(p.moves.length) });
    if (!cf.ok) throw new Error('closed form');
    expect(cf.value.finalValue.value).toBeCloseTo(-p.holdingTorque / (40 + p.effectiveStiffness), 10);
  });

  it('the linear model holds for small moves and not for large ones; a looser tolerance admits a larger move', () => {
    const p = linearized();
    const moves = [0.001, 0.01, 0.1].map((tolerance) => {
      const r = operatingRange(p, { tolerance, minScale: 0.01, maxScale: 100 });
      if (!r.ok) throw new Error(JSON.stringify(r.errors));
      expect(r.value.summary).toMatch(/agrees with the twin within .* for moves up to/);
      return r.value.largestMove!;
    });
    expect(moves[0]!).toBeLessThan(moves[1]!);
    expect(moves[1]!).toBeLessThan(moves[2]!);
    // The first neglected term of sin is cubic: at 1 % the move is a fraction of a radian.
    expect(moves[1]!).toBeGreaterThan(0.01);
    expect(moves[1]!).toBeLessThan(1);
  });

  it('refuses what it cannot linearize, naming the field', () => {
    const flat = linearizeAbout(makeScenario({}), { angle: 0.3, holding: 'feed-forward' });
    expect(flat.ok === false && flat.errors.map((e) => e.field)).toEqual(['nonlinear.gravity']);
    const nan = linearizeAbout(arm60, { angle: Number.NaN, holding: 'sideways' as never });
    expect(nan.ok === false && nan.errors.map((e) => e.field)).toEqual(['angle', 'holding']);
    const noMoves = operatingRange(linearized(), { tolerance: 0.01 });
    expect(noMoves.ok).toBe(true);
    const empty = linearizeAbout({ ...arm60, inputs: [] }, { angle: theta0, holding: 'feed-forward' });
    if (!empty.ok) throw new Error('refused');
    const r = operatingRange(empty.value, { tolerance: 0.01 });
    expect(r.ok === false && r.errors[0]!.field).toBe('inputs');
    expect(operatingRange(linearized(), { tolerance: 2 }).ok).toBe(false);
  });
});
