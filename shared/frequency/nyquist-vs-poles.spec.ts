import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { polynomialRoots } from '../closed-form/polynomial-roots';
import { makeScenario } from '../closed-form/testing/make-scenario';
import { frequencyResponseOf } from './frequency-response';
import { loopChannelsOf } from './loop-channels';

// The Nyquist count on the frequency response (used when the loop holds a delay) against the
// closed-loop poles (Routh–Hurwitz's question answered by the roots): with a delay far below
// every time constant of the loop, both must give the same verdict.
describe('Nyquist verdict against the closed-loop poles', () => {
  // A generous time-out for a busy machine: 200 cases take well under a second when idle.
  it('agrees on random PID loops whose poles are clear of the imaginary axis', { timeout: 30_000 }, () => {
    // Zero or a value of a real joint (no subnormal gains); damping above 0 keeps the plant's own
    // poles off the imaginary axis, where the delayed verdict is undetermined by design.
    const zeroOr = (min: number, max: number) => fc.oneof(fc.constant(0), fc.double({ min, max, noNaN: true }));
    const gain = zeroOr(0.01, 200);
    fc.assert(
      fc.property(
        fc.record({
          inertia: fc.double({ min: 0.01, max: 2, noNaN: true }),
          damping: fc.double({ min: 0.05, max: 5, noNaN: true }),
          stiffness: zeroOr(0.1, 50),
        }),
        fc.record({ kp: gain, ki: gain, kd: zeroOr(0.001, 5), derivativeFilter: fc.constantFrom(0, 0.002, 0.01) }),
        (joint, gains) => {
          const continuous = makeScenario({ joint, controller: { mode: 'pid', ...gains } });
          const roots = polynomialRoots(loopChannelsOf(continuous).characteristic);
          if (!roots.ok || roots.roots.length === 0) return;
          const clear = roots.roots.every((p) => Math.abs(p.re) > 1e-3 * Math.hypot(p.re, p.im) && Math.hypot(p.re, p.im) < 1e4);
          if (!clear) return;
          // 1 µs: its half-sample delay turns the phase by under 0.3° at 10^4 rad/s.
          const sampled = makeScenario({ joint, controller: { mode: 'pid', ...gains, samplePeriod: 1e-6 } });
          const grid = { from: 0.1, to: 100, points: 10 };
          const a = frequencyResponseOf(continuous, grid);
          const b = frequencyResponseOf(sampled, grid);
          if (!a.ok || !b.ok) throw new Error('refused');
          expect(b.value.stability).toBe(a.value.stability);
        },
      ),
      { numRuns: 200, seed: 20261203 },
    );
  });
});
