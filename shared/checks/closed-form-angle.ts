import { responseAt, solveClosedForm, type ClosedFormSolution } from '../closed-form';
import type { Scenario } from '../scenario/scenario-schema';
import type { Parsed } from '../validation/field-errors';
import { simulateTwin, type TwinOptions } from '../twin/twin-run';
import { compareWithClosedForm, type AngleAtTimes, type ResidualReport } from './twin-vs-closed-form';

/**
 * The closed form's angle as the comparison needs it (exact evaluation at each time).
 * @example compareWithClosedForm(samples, closedFormAngle(solution))
 */
export function closedFormAngle(solution: ClosedFormSolution): AngleAtTimes {
  return (t) => {
    const angle = new Float64Array(t.length);
    for (let i = 0; i < t.length; i++) angle[i] = responseAt(solution.plan, t[i]!, 0);
    return angle;
  };
}

/**
 * Runs the twin and the closed form of one scenario and compares their angles. With every
 * nonlinear effect off and a continuous loop the residual is integration error only.
 * @example const r = twinAgainstClosedForm(scenario); if (r.ok) r.value.relativeMaxError // < 1e-6
 */
export function twinAgainstClosedForm(scenario: Scenario, options: TwinOptions = {}): Parsed<ResidualReport & { twinStop: string | null }> {
  const solved = solveClosedForm(scenario);
  if (!solved.ok) return solved;
  const twin = simulateTwin(scenario, options);
  const report = compareWithClosedForm(twin.samples, closedFormAngle(solved.value));
  return { ok: true, value: { ...report, twinStop: twin.stop?.message ?? null } };
}
