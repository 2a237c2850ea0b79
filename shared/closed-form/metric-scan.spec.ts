import { describe, expect, it } from 'vitest';
import { invertScenario } from './inverse-response';
import { angleOnScan, metricScan, type ScanMode } from './metric-scan';
import { compileResponsePlan, responseAt } from './response-evaluator';
import { makeScenario } from './testing/make-scenario';

/** The step the scan's rule asks for after time t: stepPerSpeed over the fastest live speed, times stretch, at most end/minPoints. */
function ruleStep(modes: readonly ScanMode[], t: number, stepPerSpeed: number, coarsest: number, stretch: number): number {
  let speed = 0;
  for (const m of modes) if (m.until > t) speed = Math.max(speed, m.speed);
  return Math.min(speed > 0 ? (stepPerSpeed / speed) * stretch : Infinity, coarsest);
}

describe('metricScan', () => {
  it.each([
    ['one slow mode', [{ speed: 2, until: 9 }], 10, 1000, 1 << 18],
    ['a fast mode dying early', [{ speed: 2, until: 9 }, { speed: 400, until: 0.05 }, { speed: 40, until: 0.6 }], 10, 1000, 1 << 18],
    ['capped, every step stretched', [{ speed: 5000, until: 3 }], 4, 100, 2000],
    ['no live mode', [], 1, 10, 100],
  ])('takes every step by the rule, from the step before: %s', (_name, modes, end, minPoints, maxPoints) => {
    const scan = metricScan(modes, end, 0.1, minPoints, maxPoints);
    const t = scan.times;
    const n = t.length - 1;
    // With no cap the stretch is 1; under a cap every step is widened by the same factor.
    const unstretched = ruleStep(modes, 0, 0.1, end / minPoints, 1);
    const stretch = (t[1]! - t[0]!) / unstretched;
    if (n < maxPoints) expect(stretch).toBeCloseTo(1, 12);
    // The stretch widens the fine steps only; the coarse ones (end/minPoints) add at most minPoints.
    else expect(n).toBeLessThanOrEqual(maxPoints + minPoints + scan.stretches.length);
    for (let i = 1; i < n; i++) {
      // Points sit at t0 + j·h: a step is the rule's up to the roundoff of that product.
      expect(Math.abs(t[i]! - t[i - 1]! - ruleStep(modes, t[i - 1]!, 0.1, end / minPoints, stretch))).toBeLessThanOrEqual(1e-12 * end);
    }
    // The last step may be cut short by the end.
    expect(t[n]).toBe(end);
    expect(t[n]! - t[n - 1]!).toBeLessThanOrEqual(ruleStep(modes, t[n - 1]!, 0.1, end / minPoints, stretch) * (1 + 1e-12));
  });

  it('evaluates the closed form by recurrence as responseAt does point by point', () => {
    const scenario = makeScenario({
      joint: { inertia: 0.012, damping: 0.04, stiffness: 0 },
      controller: { mode: 'pid', kp: 25, ki: 1, kd: 0.05, derivativeOn: 'error', derivativeFilter: 0.002 },
      inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5 }],
      horizon: 2,
    });
    const inverted = invertScenario(scenario);
    if (!inverted.ok) throw new Error(JSON.stringify(inverted.errors));
    const step = inverted.value.pieces.find((p) => p.source.kind === 'input')!;
    const plan = compileResponsePlan([{ ...step, delay: 0 }]);
    const modes = step.modes.filter((m) => m.pole.re !== 0 || m.pole.im !== 0).map((m) => ({ speed: Math.hypot(m.pole.re, m.pole.im), until: 8 }));
    modes[0]!.until = 0.3;
    const scan = metricScan(modes, 10, 0.1, 1000, 1 << 18);
    const angle = angleOnScan(plan, scan);
    let worst = 0;
    scan.times.forEach((t, i) => (worst = Math.max(worst, Math.abs(angle[i]! - responseAt(plan, t, 0)))));
    expect(scan.times.length).toBeGreaterThan(2000);
    expect(worst).toBeLessThan(1e-12);
  });
});
