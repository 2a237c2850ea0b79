import { describe, expect, it } from 'vitest';
import { createTwinSolver, type TwinDerivative } from './twin-solver';
import { TWIN_DEFAULTS } from './twin-settings';

// Reference solutions are the exact ones of linear systems: y′ = −a·y gives y0·e^(−a t), and
// y″ = −y gives cos t, −sin t (common practice).
const decay =
  (rate: number): TwinDerivative =>
  (_t, y, out) => {
    out[0] = -rate * y[0]!;
  };
const oscillator: TwinDerivative = (_t, y, out) => {
  out[0] = y[1]!;
  out[1] = -y[0]!;
};

describe('the twin solver on odex 3', () => {
  it('integrates a stretch to the tolerance and reports where it ended', () => {
    const solver = createTwinSolver(oscillator, 2, TWIN_DEFAULTS, false);
    const result = solver.stretch(0, [1, 0], 2, 1e-3, 1000);
    expect(result.outcome).toBe('converged');
    expect(result.x).toBe(2);
    expect(Math.abs(result.y[0]! - Math.cos(2))).toBeLessThan(1e-9);
    expect(Math.abs(result.y[1]! + Math.sin(2))).toBeLessThan(1e-9);
  });

  it('starts each stretch from the step it is given (an odex 3 internal the twin relies on)', () => {
    const solver = createTwinSolver(decay(1), 1, TWIN_DEFAULTS, false);
    for (const first of [0.01, 0.2, 1e-3]) {
      const steps: number[] = [];
      solver.stretch(0, [1], 1, first, 1000, (xOld, x) => {
        steps.push(x - xOld);
      });
      // odex starts with the given step, at least 1e-4 s and at most half the stretch.
      expect(steps[0]).toBeCloseTo(first, 15);
    }
  });

  it('counts rejected attempts toward the step bound (an odex 3 internal the twin relies on)', () => {
    const solver = createTwinSolver(decay(1e4), 1, TWIN_DEFAULTS, false);
    let accepted = 0;
    const result = solver.stretch(0, [1], 1, 0.4, 20000, () => {
      accepted++;
    });
    expect(result.outcome).toBe('converged');
    // A first step of 0.4 s on a 1e-4 s time constant is refused before any is accepted.
    expect(result.steps).toBeGreaterThan(accepted);
    expect(Math.abs(result.y[0]!)).toBeLessThan(1e-9);
  });

  it('stops at the step bound before an observer that halts at every step', () => {
    const solver = createTwinSolver(decay(1e4), 1, TWIN_DEFAULTS, false);
    const bounded = solver.stretch(0, [1], 1, 1e-4, 1, () => false);
    expect(bounded.outcome).toBe('max-steps');
    expect(bounded.x).toBeLessThan(1);
    const halted = solver.stretch(0, [1], 1, 1e-4, 1000, () => false);
    expect(halted.outcome).toBe('halted');
    expect(halted.steps).toBeLessThan(1000);
  });

  it('gives the dense interpolant only where asked for, accurate inside the step', () => {
    const dense = createTwinSolver(oscillator, 2, TWIN_DEFAULTS, true);
    let worst = 0;
    dense.stretch(0, [1, 0], 3, 1e-3, 1000, (xOld, x, _state, interpolate) => {
      const mid = (xOld + x) / 2;
      worst = Math.max(worst, Math.abs(interpolate!(0, mid) - Math.cos(mid)));
    });
    expect(worst).toBeLessThan(1e-8);
    const plain = createTwinSolver(oscillator, 2, TWIN_DEFAULTS, false);
    plain.stretch(0, [1, 0], 0.1, 1e-3, 1000, (_xOld, _x, _state, interpolate) => {
      expect(interpolate).toBeNull();
    });
  });

  it('takes a short smooth stretch in one step, to the same tolerance, and leaves its start untouched', () => {
    const solver = createTwinSolver(oscillator, 2, TWIN_DEFAULTS, false);
    const start = [1, 0];
    const state = solver.wholeStep(0, start, 1e-3);
    expect(state).not.toBeNull();
    expect(Math.abs(state![0]! - Math.cos(1e-3))).toBeLessThan(1e-12);
    expect(Math.abs(state![1]! + Math.sin(1e-3))).toBeLessThan(1e-12);
    expect(start).toEqual([1, 0]);
  });

  it('declines one step where odex would not accept it, so the caller integrates the stretch', () => {
    const solver = createTwinSolver(decay(1e4), 1, TWIN_DEFAULTS, false);
    expect(solver.wholeStep(0, [1], 0.5)).toBeNull();
  });
});
