import { describe, expect, it } from 'vitest';
import { responseAt } from './response-evaluator';
import { solved } from './testing/make-scenario';

// Ill-conditioned denominators: (s + 2)² − ε², poles −2 ± ε. Free response from θ(0−) = 1:
// Θ = (s + 4)/((s + 2)² − ε²) ↔ e^(−2t)(cosh εt + 2 sinh(εt)/ε)  (Abramowitz & Stegun 29.3.12
// combined with the shift rule, from memory), → e^(−2t)(1 + 2t) as ε → 0.
function exact(eps: number, t: number): number {
  const sinhOverEps = eps === 0 ? t : Math.sinh(eps * t) / eps;
  return Math.exp(-2 * t) * (Math.cosh(eps * t) + 2 * sinhOverEps);
}

describe('nearly repeated poles', () => {
  it.each([0, 1e-12, 1e-9, 1e-7, 3e-6, 1e-5, 3e-5, 1e-4, 1e-3, 1e-2])('gives no wild residues and an accurate response at ε = %s', (eps) => {
    const s = solved({ joint: { inertia: 1, damping: 4, stiffness: 4 - eps * eps }, initial: { angle: 1, velocity: 0 }, horizon: 10 });
    const biggest = Math.max(...s.terms.map((t) => (t.kind === 'exponential' ? Math.abs(t.coefficient) : 0)));
    // Poles within the merge tolerance (relative split ε/2·2 = ε ≤ 6e-6) give O(1) residues; split
    // ones give residues ~1/ε, large only where the poles are resolvable and the cancellation costs ≤ ~1e-11.
    expect(biggest).toBeLessThan(eps < 6e-6 ? 10 : 10 / eps);
    for (const t of [0.1, 0.5, 1, 2, 4, 8]) expect(Math.abs(responseAt(s.plan, t, 0) - exact(eps, t))).toBeLessThan(1e-9);
  });

  it('merges an exact triple pole placed by the gains into one t²e^(−2t) family', () => {
    const s = solved({ joint: { inertia: 1, damping: 0, stiffness: 0 }, controller: { mode: 'pid', kp: 12, ki: 8, kd: 6 }, inputs: [{ channel: 'reference', shape: 'step', amplitude: 1 }] });
    expect(s.poles).toEqual([{ re: expect.closeTo(-2, 12), im: 0, multiplicity: 3 }]);
    const coefficients = s.terms.map((t) => (t.kind === 'exponential' ? Math.abs(t.coefficient) : 0));
    expect(Math.max(...coefficients)).toBeLessThan(100);
    expect(s.terms.filter((t) => t.kind === 'exponential' && t.pole.re !== 0).map((t) => (t.kind === 'exponential' ? t.power : -1)).sort()).toEqual([0, 1, 2]);
  });
});
