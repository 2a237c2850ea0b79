import { describe, expect, it } from 'vitest';
import { responseAt } from './response-evaluator';
import { solved } from './testing/make-scenario';

// A P loop on an inertia with damping and no stiffness is the standard second-order system:
// J θ'' + b θ' + kp θ = kp r  ⇒  ωn = √(kp/J), ζ = b/(2√(kp·J)), unit DC gain.
// Closed forms from Ogata, Modern Control Engineering, 5th ed., §5-3 (from memory).
function secondOrder(zeta: number, wn: number) {
  const J = 1;
  return solved({
    joint: { inertia: J, damping: 2 * zeta * wn * J, stiffness: 0 },
    controller: { mode: 'pid', kp: wn * wn * J },
    inputs: [{ channel: 'reference', shape: 'step', amplitude: 1 }],
    horizon: 20,
  });
}

const TIMES = [0.05, 0.4, 1, 1.7, 2.5, 4, 6.3, 9];

describe('second-order step response (Ogata, Modern Control Engineering, §5-3, from memory)', () => {
  it('underdamped: c(t) = 1 − e^(−ζωn t)(cos ωd t + ζ/√(1−ζ²) sin ωd t)', () => {
    const zeta = 0.3;
    const wn = 2;
    const s = secondOrder(zeta, wn);
    const wd = wn * Math.sqrt(1 - zeta * zeta);
    for (const t of TIMES) {
      const exact = 1 - Math.exp(-zeta * wn * t) * (Math.cos(wd * t) + (zeta / Math.sqrt(1 - zeta * zeta)) * Math.sin(wd * t));
      expect(responseAt(s.plan, t, 0)).toBeCloseTo(exact, 13);
    }
    // Maximum overshoot Mp = e^(−ζπ/√(1−ζ²)), peak time tp = π/ωd (Ogata eqs. 5-19/5-21, from memory).
    expect(s.metrics.overshootPercent).toBeCloseTo(100 * Math.exp((-zeta * Math.PI) / Math.sqrt(1 - zeta * zeta)), 9);
    expect(s.metrics.peakTime).toBeCloseTo(Math.PI / wd, 9);
    expect(s.metrics.steadyStateError).toBeCloseTo(0, 14);
    expect(s.dominantPair).toMatchObject({ zeta: expect.closeTo(zeta, 14), naturalFrequency: expect.closeTo(wn, 14), dampedFrequency: expect.closeTo(wd, 14), dominant: true });
    expect(s.dominantPair!.estimates.overshootPercent).toBeCloseTo(s.metrics.overshootPercent!, 9);
  });

  it('critically damped: c(t) = 1 − e^(−ωn t)(1 + ωn t), no overshoot, no peak time', () => {
    const wn = 1.5;
    const s = secondOrder(1, wn);
    expect(s.poles).toEqual([{ re: expect.closeTo(-wn, 13), im: 0, multiplicity: 2 }]);
    for (const t of TIMES) expect(responseAt(s.plan, t, 0)).toBeCloseTo(1 - Math.exp(-wn * t) * (1 + wn * t), 13);
    expect(s.metrics.overshootPercent).toBe(0);
    expect(s.metrics.peakTime).toBeNull();
    // 10–90 % rise of the critically damped response is ≈ 3.358/ωn (tabulated rise times, from memory).
    expect(s.metrics.riseTime! * wn).toBeCloseTo(3.357908, 5);
    expect(s.dominantPair).toBeNull();
  });

  it('overdamped: c(t) = 1 + ωn/(2√(ζ²−1))·(e^(−s1 t)/s1 − e^(−s2 t)/s2)', () => {
    const zeta = 2;
    const wn = 1;
    const s = secondOrder(zeta, wn);
    const r = Math.sqrt(zeta * zeta - 1);
    const s1 = (zeta + r) * wn;
    const s2 = (zeta - r) * wn;
    for (const t of TIMES) {
      const exact = 1 + (wn / (2 * r)) * (Math.exp(-s1 * t) / s1 - Math.exp(-s2 * t) / s2);
      expect(responseAt(s.plan, t, 0)).toBeCloseTo(exact, 13);
    }
    expect(s.metrics.overshootPercent).toBe(0);
  });

  it('finds rise and settling crossings on the closed form itself', () => {
    const s = secondOrder(0.5, 3);
    const { rise } = s.metricsBasis!;
    expect(responseAt(s.plan, rise!.from, 0)).toBeCloseTo(0.1, 13);
    expect(responseAt(s.plan, rise!.to, 0)).toBeCloseTo(0.9, 13);
    const ts = s.metrics.settlingTime!;
    expect(Math.abs(responseAt(s.plan, ts, 0) - 1)).toBeCloseTo(0.02, 13);
    // After the settling time the response stays inside the band (dense check, 20 000 points).
    for (let i = 1; i <= 20000; i++) expect(Math.abs(responseAt(s.plan, ts + i * 5e-4, 0) - 1)).toBeLessThanOrEqual(0.02 + 1e-12);
    // And the textbook estimate 4/(ζωn) lands near the exact value (ζ = 0.5).
    expect(s.dominantPair!.estimates.settlingTime).toBeCloseTo(4 / 1.5, 12);
  });

  it('offers a 5 % band', () => {
    const two = secondOrder(0.4, 2);
    const s5 = solved(
      {
        joint: { inertia: 1, damping: 1.6, stiffness: 0 },
        controller: { mode: 'pid', kp: 4 },
        inputs: [{ channel: 'reference', shape: 'step', amplitude: 1 }],
      },
      { settlingBand: 0.05 },
    );
    expect(s5.metrics.settlingTime!).toBeLessThan(two.metrics.settlingTime!);
    expect(Math.abs(responseAt(s5.plan, s5.metrics.settlingTime!, 0) - 1)).toBeCloseTo(0.05, 12);
    expect(s5.dominantPair!.estimates.settlingTime).toBeCloseTo(3 / (0.4 * 2), 12);
  });

  it('measures times from the step\'s own time and scales with the amplitude', () => {
    const base = secondOrder(0.3, 2);
    const shifted = solved({
      joint: { inertia: 1, damping: 1.2, stiffness: 0 },
      controller: { mode: 'pid', kp: 4 },
      inputs: [{ channel: 'reference', shape: 'step', amplitude: -0.25, delay: 1.5 }],
    });
    expect(shifted.metrics.peakTime).toBeCloseTo(base.metrics.peakTime!, 12);
    expect(shifted.metrics.overshootPercent).toBeCloseTo(base.metrics.overshootPercent!, 9);
    expect(shifted.metricsBasis).toMatchObject({ delay: 1.5, amplitude: -0.25, finalValue: expect.closeTo(-0.25, 14) });
  });

  it('reports the steady-state error of a loop without integral action on a stiff joint', () => {
    // J θ'' + b θ' + (k + kp) θ = kp r ⇒ θ∞ = kp/(k + kp)·A
    const s = solved({
      joint: { inertia: 1, damping: 2, stiffness: 1 },
      controller: { mode: 'pid', kp: 4 },
      inputs: [{ channel: 'reference', shape: 'step', amplitude: 2 }],
    });
    expect(s.metrics.steadyStateError).toBeCloseTo(2 - (4 / 5) * 2, 14);
    expect(s.finalValue.value).toBeCloseTo(1.6, 14);
  });
});
