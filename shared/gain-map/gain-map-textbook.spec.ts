import { polynomialRoot } from 'mathjs';
import { describe, expect, it } from 'vitest';
import type { ScenarioInput } from '../scenario/scenario-schema';
import { evaluateCells } from './evaluate-cells';
import { cellGains, planGainMap, type GainMapPlan } from './gain-map-plan';
import type { GainMapRequest } from './gain-map-request';
import { allCells, scenarioOf } from './testing/spec-scenario';

// The map checked cell by cell against results from outside the code.
//
// A PD loop on an inertia J with damping b and stiffness k (gear ratio 1, no integral, no filter)
// has the closed-loop characteristic polynomial J s² + (b + kd) s + (k + kp) (joint-transfer.ts).
// - Stability: a second-order polynomial has both roots in the open left half-plane iff all three
//   coefficients are non-zero and share a sign (Routh–Hurwitz, Routh 1877; common practice).
// - Overshoot: the step response of ωn² / (s² + 2ζωn s + ωn²) overshoots by
//   exp(−ζπ/√(1−ζ²)) for 0 < ζ < 1 and not at all for ζ ≥ 1 (Ogata, Modern Control Engineering,
//   §5-3, from memory). That is exact only without a zero: with the derivative on the error the
//   reference path is (kd s + kp)/(…), whose zero at −kp/kd adds overshoot. With the derivative
//   on the measured angle the reference enters through kp alone, θ/R = kp / (J s² + (b+kd) s + k+kp),
//   the textbook form times a DC gain kp/(k+kp) — so these scenarios measure the derivative.

function pdJoint(joint: { inertia: number; damping: number; stiffness: number }, horizon: number): ScenarioInput {
  return {
    kind: 'kinetwin/scenario',
    version: 1,
    name: 'PD joint, derivative on measurement',
    joint,
    controller: { mode: 'pid', kp: 1, ki: 0, kd: 0, derivativeOn: 'measurement' },
    inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0.1 }],
    horizon,
  };
}

function planOf(s: ReturnType<typeof scenarioOf>, request: GainMapRequest): GainMapPlan {
  const plan = planGainMap(s, request);
  if (!plan.ok) throw new Error(JSON.stringify(plan.errors));
  return plan.value;
}

function cellsOf(s: ReturnType<typeof scenarioOf>, plan: GainMapPlan, method: 'closed-form' | 'sim' = 'closed-form', indices = allCells(plan.cells)) {
  const cells = evaluateCells(s, plan, method, indices);
  if (!cells.ok) throw new Error(JSON.stringify(cells.errors));
  return cells.value;
}

describe('gain map against Routh–Hurwitz (PD loop, second order)', () => {
  // Negative damping (a drive feeding energy in) and negative stiffness (a load pushing away from
  // rest) put the stability boundary inside the map on both axes: stable iff kp > 2 and kd > 0.3.
  // The counts keep grid points off the boundary lines themselves, where a computed root of
  // roundoff size could fall on either side.
  const s = scenarioOf(pdJoint({ inertia: 0.05, damping: -0.3, stiffness: -2 }, 4));
  const plan = planOf(s, { x: { gain: 'kp', min: 0, max: 9, count: 24 }, y: { gain: 'kd', min: 0, max: 1.55, count: 16 } });
  const cells = cellsOf(s, plan);

  it('finds a cell stable exactly where every coefficient of J s² + (b + kd) s + (k + kp) is positive', () => {
    let stable = 0;
    for (const cell of cells) {
      const { kp, kd } = cellGains(plan, cell.index);
      const coefficients = [s.joint.inertia, s.joint.damping + kd!, s.joint.stiffness + kp!];
      const routh = coefficients.every((c) => c > 0) || coefficients.every((c) => c < 0);
      expect({ kp, kd, stable: cell.metrics.stable }).toEqual({ kp, kd, stable: routh });
      if (routh) stable++;
    }
    // Both sides of the boundary are on the map.
    expect(stable).toBeGreaterThan(50);
    expect(cells.length - stable).toBeGreaterThan(50);
  });

  it('gives the slowest pole’s real part from the quadratic formula, and no step metrics where unstable', () => {
    for (const cell of cells) {
      const { kp, kd } = cellGains(plan, cell.index);
      const a = s.joint.inertia;
      const b = s.joint.damping + kd!;
      const c = s.joint.stiffness + kp!;
      const disc = b * b - 4 * a * c;
      const slowest = disc >= 0 ? (-b + Math.sqrt(disc)) / (2 * a) : -b / (2 * a);
      expect(cell.metrics.slowestPoleReal).toBeCloseTo(slowest, 9);
      if (!cell.metrics.stable) {
        expect(cell.metrics.overshootPercent).toBeNull();
        expect(cell.metrics.settlingTime).toBeNull();
        expect(cell.reason).toBeTruthy();
      }
    }
  });
});

describe('gain map against the second-order overshoot exp(−ζπ/√(1−ζ²))', () => {
  // ζ = (b + kd) / (2√(J kp)) runs from about 0.06 to past 2 over this map.
  const s = scenarioOf(pdJoint({ inertia: 0.02, damping: 0.05, stiffness: 0 }, 6));
  const plan = planOf(s, { x: { gain: 'kp', min: 0.5, max: 40, count: 15 }, y: { gain: 'kd', min: 0.001, max: 1.5, count: 12, spacing: 'log' } });
  const cells = cellsOf(s, plan);

  it('matches the formula in every cell, under- and overdamped', () => {
    let under = 0;
    for (const cell of cells) {
      const { kp, kd } = cellGains(plan, cell.index);
      const zeta = (s.joint.damping + kd!) / (2 * Math.sqrt(s.joint.inertia * kp!));
      const expected = zeta < 1 ? 100 * Math.exp((-zeta * Math.PI) / Math.sqrt(1 - zeta * zeta)) : 0;
      if (zeta < 1) under++;
      expect(cell.metrics.stable).toBe(true);
      // stepMetrics scans until the transient's envelope is under a tenth of the 2 % band, so a
      // peak later than that (ζ just under 1) is under 0.2 % and may read as 0; above it, exact.
      if (expected >= 0.2) expect(Math.abs(cell.metrics.overshootPercent! - expected)).toBeLessThan(1e-6);
      else {
        expect(cell.metrics.overshootPercent!).toBeGreaterThanOrEqual(0);
        expect(cell.metrics.overshootPercent!).toBeLessThanOrEqual(expected + 1e-6);
      }
      // A type-0 loop with no integral: θ(∞) = A·kp/(k + kp) = A here (k = 0), so no error.
      expect(Math.abs(cell.metrics.steadyStateError!)).toBeLessThan(1e-12);
    }
    expect(under).toBeGreaterThan(20);
    expect(cells.length - under).toBeGreaterThan(10);
  });
});

describe('gain map of a PID loop against mathjs polynomial roots', () => {
  // J s³ + (b + kd) s² + kp s + ki for a PID on an inertia with damping (k = 0, no filter).
  // mathjs's polynomialRoot solves the cubic by Cardano's formula, an implementation
  // independent of the closed form's root finder.
  const s = scenarioOf({ ...pdJoint({ inertia: 0.012, damping: 0.04, stiffness: 0 }, 5), controller: { mode: 'pid', kp: 1, ki: 0, kd: 0, derivativeOn: 'error' } });
  const plan = planOf(s, { x: { gain: 'ki', min: 0.5, max: 400, count: 12, spacing: 'log' }, y: { gain: 'kd', min: 0.001, max: 0.5, count: 10, spacing: 'log' }, z: { gain: 'kp', value: 4 } });
  const cells = cellsOf(s, plan);

  it('agrees on stability and the slowest pole in every cell', () => {
    let unstable = 0;
    for (const cell of cells) {
      const { kp, ki, kd } = cellGains(plan, cell.index);
      const roots = polynomialRoot(ki!, kp!, s.joint.damping + kd!, s.joint.inertia).map((r) => (typeof r === 'number' ? r : r.re));
      const slowest = Math.max(...roots);
      expect(cell.metrics.slowestPoleReal! - slowest).toBeCloseTo(0, 6);
      expect(cell.metrics.stable).toBe(slowest < 0);
      if (slowest >= 0) unstable++;
    }
    expect(unstable).toBeGreaterThan(5);
    expect(cells.length - unstable).toBeGreaterThan(5);
  });
});

describe('gain map by the twin against the closed form, effects off', () => {
  // The twin's final value is its angle at the horizon: 4 s leaves the slowest cell (pole at
  // −3.3 /s) within 1e-5 of its true final value, so the two agree to the sampling's precision.
  const s = scenarioOf({ ...pdJoint({ inertia: 0.012, damping: 0.04, stiffness: 0 }, 4), controller: { mode: 'pid', kp: 1, ki: 0, kd: 0, derivativeOn: 'measurement' } });
  const plan = planOf(s, { x: { gain: 'kp', min: 2, max: 12, count: 3 }, y: { gain: 'kd', min: 0.1, max: 0.6, count: 2 } });
  const byForm = cellsOf(s, plan);
  const byTwin = cellsOf(s, plan, 'sim');

  it('measures the same overshoot, settling time and steady-state error off the trace', () => {
    byTwin.forEach((twin, i) => {
      const form = byForm[i]!;
      expect(twin.index).toBe(form.index);
      expect(twin.metrics.stable).toBe(true);
      expect(twin.metrics.superpositionPass).toBe(true);
      expect(twin.metrics.slowestPoleReal).toBe(form.metrics.slowestPoleReal);
      // The trace is sampled every 1 ms: the peak by a parabola, the band exit by a line.
      expect(Math.abs(twin.metrics.overshootPercent! - form.metrics.overshootPercent!)).toBeLessThan(0.01);
      expect(Math.abs(twin.metrics.settlingTime! - form.metrics.settlingTime!)).toBeLessThan(1e-3);
      expect(Math.abs(twin.metrics.steadyStateError! - form.metrics.steadyStateError!)).toBeLessThan(1e-4);
    });
  });

  it('sees superposition fail where a torque limit clips the drive, and hold where it does not', () => {
    // kp·A at the step: 2 × 0.5 = 1 N·m at the smallest kp, 6 N·m at the largest; α·u1 doubles it.
    const limited = scenarioOf({ ...pdJoint({ inertia: 0.012, damping: 0.04, stiffness: 0 }, 2), controller: { mode: 'pid', kp: 1, kd: 0, derivativeOn: 'measurement' }, nonlinear: { torqueLimit: 2.5 } });
    const cells = cellsOf(limited, plan, 'sim', [0, 2]);
    expect(cells.map((c) => c.metrics.superpositionPass)).toEqual([true, false]);
  });
});
