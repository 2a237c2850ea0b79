import { describe, expect, it } from 'vitest';
import { parseScenario } from '../scenario/parse-scenario';
import { evaluateUniformGrid, responseAt } from './response-evaluator';
import { solveClosedForm } from './solve-closed-form';
import { fixedTalbot } from './testing/fixed-talbot';
import { scenarioTransforms } from './testing/scenario-laplace';
import { TALBOT_CASES } from './testing/talbot-scenarios';

// Independent check: the closed form against a numerical inverse Laplace transform of Θ(s)
// written straight from the joint model (Abate & Whitt 2006, fixed Talbot). Delayed terms:
// each undelayed transform is inverted and shifted. Agreement to 1e-8 relative to the peak.
const TOLERANCE = 1e-8;

function talbotAt(transforms: ReturnType<typeof scenarioTransforms>, t: number, which: 'angle' | 'velocity', nodes: number): number {
  let sum = 0;
  for (const tr of transforms) {
    if (t <= tr.delay) continue;
    sum += fixedTalbot(tr[which], t - tr.delay, nodes);
  }
  return sum;
}

describe('closed form vs fixed-Talbot inversion (Abate & Whitt 2006)', () => {
  it('covers at least 12 scenarios', () => {
    expect(TALBOT_CASES.length).toBeGreaterThanOrEqual(12);
  });

  it.each(TALBOT_CASES.map((c) => [c.title, c] as const))('%s', (_title, kase) => {
    const parsed = parseScenario(kase.scenario);
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.errors));
    const solved = solveClosedForm(parsed.value);
    if (!solved.ok) throw new Error(JSON.stringify(solved.errors));
    const transforms = scenarioTransforms(parsed.value);
    const breaks = transforms.map((t) => t.delay);
    const times = Array.from({ length: 15 }, (_, i) => (kase.until * (i + 0.7)) / 15).filter((t) => breaks.every((b) => Math.abs(t - b) > 1e-6));
    for (const which of ['angle', 'velocity'] as const) {
      const ours = times.map((t) => responseAt(solved.value.plan, t, which === 'angle' ? 0 : 1));
      // 40 nodes balance truncation (~10^(−0.6M)) against roundoff (~e^(0.4M)·ε) in double precision.
      const reference = times.map((t) => talbotAt(transforms, t, which, 40));
      const finer = times.map((t) => talbotAt(transforms, t, which, 48));
      const peak = Math.max(...reference.map(Math.abs), 1e-300);
      // The contour must enclose every pole at these times: 40 and 48 nodes then agree (up to
      // the larger roundoff of 48 nodes); a pole outside the contour breaks this by orders of magnitude.
      reference.forEach((r, i) => expect(Math.abs(r - finer[i]!) / peak, `${which} Talbot convergence at t=${times[i]}`).toBeLessThan(1e-7));
      ours.forEach((v, i) => expect(Math.abs(v - reference[i]!) / peak, `${which} at t=${times[i]}`).toBeLessThan(TOLERANCE));
    }
    // The fast grid evaluator agrees with the exact point evaluator.
    const dt = kase.until / 1000;
    const angle = new Float64Array(1001);
    const velocity = new Float64Array(1001);
    evaluateUniformGrid(solved.value.plan, dt, 1001, angle, velocity);
    const peak = Math.max(...angle.map(Math.abs), 1e-300);
    for (let i = 0; i <= 1000; i += 37) {
      expect(Math.abs(angle[i]! - responseAt(solved.value.plan, i * dt, 0)) / peak).toBeLessThan(1e-12);
    }
  });
});
