import { responseAt, solveClosedForm } from '@kinetwin/shared/closed-form/index';
import { largestResidual } from './residual';

describe('largestResidual', () => {
  it('finds the largest absolute difference and its time', () => {
    const twin = { t: [0, 0.5, 1, 1.5], angle: [0, 0.4, 1.3, 1.5] };
    const peak = largestResidual(twin, (t) => t);
    expect(peak).not.toBeNull();
    expect(peak!.maxAbs).toBeCloseTo(0.3, 12);
    expect(peak!.time).toBe(1);
    expect(peak!.samples).toBe(4);
  });

  it('counts a twin below the closed form the same as one above it', () => {
    const peak = largestResidual({ t: [0, 1, 2], angle: [0, -0.7, 2.2] }, () => 0);
    expect(peak).toEqual({ maxAbs: 2.2, time: 2, samples: 3 });
  });

  it('keeps the earliest time when two samples tie', () => {
    expect(largestResidual({ t: [0.1, 0.2], angle: [1, -1] }, () => 0)?.time).toBe(0.1);
  });

  it('skips non-finite samples on either side and reads mismatched arrays up to the shorter', () => {
    const twin = { t: [0, Number.NaN, 2, 3, 4], angle: [0.1, 99, Number.POSITIVE_INFINITY, 0.2] };
    const peak = largestResidual(twin, (t) => (t === 3 ? Number.NaN : 0));
    expect(peak).toEqual({ maxAbs: 0.1, time: 0, samples: 1 });
  });

  it('gives null when nothing could be compared', () => {
    expect(largestResidual({ t: [], angle: [] }, () => 0)).toBeNull();
    expect(largestResidual({ t: [Number.NaN], angle: [1] }, () => 0)).toBeNull();
  });

  it('reads zero against the closed form for samples of the textbook second-order step response', () => {
    // Open-loop joint J θ'' + b θ' + k θ = A·u(t), from rest: θ(t) = (A/k)·[1 − e^(−ζωn t)(cos ωd t + ζ/√(1−ζ²)·sin ωd t)]
    // with ωn = √(k/J), ζ = b/(2√(kJ)), ωd = ωn√(1−ζ²) (Ogata, Modern Control Engineering, ch. 5, from memory).
    // Invented demo values: ωn = 10 rad/s, ζ = 0.25.
    const J = 0.02;
    const k = 2;
    const b = 0.1;
    const A = 0.5;
    const solved = solveClosedForm({
      kind: 'kinetwin/scenario',
      version: 1,
      name: 'Textbook second order',
      joint: { inertia: J, damping: b, stiffness: k, gearRatio: 1 },
      controller: { mode: 'open-loop' },
      inputs: [{ channel: 'torque', shape: 'step', amplitude: A, delay: 0 }],
      horizon: 2,
    });
    if (!solved.ok) throw new Error(JSON.stringify(solved.errors));
    const wn = Math.sqrt(k / J);
    const zeta = b / (2 * Math.sqrt(k * J));
    const wd = wn * Math.sqrt(1 - zeta * zeta);
    const t = Array.from({ length: 1001 }, (_, i) => i * 0.002);
    const angle = t.map((x) => (A / k) * (1 - Math.exp(-zeta * wn * x) * (Math.cos(wd * x) + (zeta / Math.sqrt(1 - zeta * zeta)) * Math.sin(wd * x))));
    const exact = largestResidual({ t, angle }, (x) => responseAt(solved.value.plan, x, 0));
    expect(exact!.samples).toBe(1001);
    expect(exact!.maxAbs).toBeLessThan(1e-12);

    // A twin 1 mrad off from t = 1 s shows exactly that residual, first at t = 1 s.
    const shifted = angle.map((value, i) => (t[i] >= 1 ? value + 1e-3 : value));
    const off = largestResidual({ t, angle: shifted }, (x) => responseAt(solved.value.plan, x, 0));
    expect(off!.maxAbs).toBeCloseTo(1e-3, 10);
    expect(off!.time).toBeGreaterThanOrEqual(1);
  });
});
