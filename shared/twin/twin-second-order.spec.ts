import { describe, expect, it } from 'vitest';
import { buildScenario } from './testing/build-scenario';
import { simulateTwin } from './twin-run';

// Loop J·θ″ + (b + N·kd)·θ′ + N·kp·θ = N·kp·A (PD on measurement), every nonlinear effect off.
// Ogata, Modern Control Engineering (5th ed.), §5-3, unit-step responses of the standard second-order
// system (from memory): critically damped y = 1 − e^(−ωn·t)·(1 + ωn·t); overdamped
// y = 1 + ωn/(2√(ζ²−1))·(e^(−s1·t)/s1 − e^(−s2·t)/s2), s1,2 = (ζ ± √(ζ²−1))·ωn.
describe('twin against the published second-order step formulas', () => {
  const run = (kd: number) => {
    const s = buildScenario({ joint: { inertia: 0.05, damping: 0.02, stiffness: 0 }, controller: { mode: 'pid', kp: 8, kd, derivativeOn: 'measurement' }, horizon: 2 });
    const { samples, stop } = simulateTwin(s, { dt: 0.001 });
    expect(stop).toBeNull();
    const wn = Math.sqrt(8 / 0.05);
    const zeta = (0.02 + kd) / (2 * 0.05 * wn);
    return { samples, wn, zeta };
  };

  it('critically damped', () => {
    const kd = 2 * 0.05 * Math.sqrt(8 / 0.05) - 0.02;
    const { samples, wn, zeta } = run(kd);
    expect(zeta).toBeCloseTo(1, 12);
    samples.t.forEach((t, i) => expect(Math.abs(samples.angle[i]! - 0.5 * (1 - Math.exp(-wn * t) * (1 + wn * t)))).toBeLessThan(1e-9));
  });

  it('overdamped', () => {
    const { samples, wn, zeta } = run(3);
    expect(zeta).toBeGreaterThan(1);
    const root = Math.sqrt(zeta * zeta - 1);
    const s1 = (zeta + root) * wn;
    const s2 = (zeta - root) * wn;
    samples.t.forEach((t, i) => {
      const exact = 0.5 * (1 + (wn / (2 * root)) * (Math.exp(-s1 * t) / s1 - Math.exp(-s2 * t) / s2));
      expect(Math.abs(samples.angle[i]! - exact)).toBeLessThan(1e-9);
    });
  });
});
