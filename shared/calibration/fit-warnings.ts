import type { FitParameterName } from './fit-parameters';
import type { LeastSquaresStatus } from './least-squares-fit';
import type { ParameterStatistics } from './parameter-statistics';

/**
 * The plain warnings of a fit report: where the data do not pin a parameter down (an interval
 * wider than the value, a correlation above CORRELATION_WARNING naming the pair, a singular
 * Jacobian), where the intervals' assumptions fail (a parameter on a bound, no convergence), and
 * where the twin explains the angle poorly.
 */

/** |correlation| above which two parameters are reported as not told apart by the data. */
export const CORRELATION_WARNING = 0.95;
/** R² of the angle below which the model is said to miss something. */
export const R2_WARNING = 0.9;

export interface WarningInput {
  names: readonly FitParameterName[];
  statistics: ParameterStatistics;
  atBound: readonly boolean[];
  lower: readonly number[];
  upper: readonly number[];
  status: LeastSquaresStatus;
  iterations: number;
  angleR2: number | null;
}

const fmt = (x: number) => Number(x.toPrecision(4)).toString();

export function fitWarnings(input: WarningInput): string[] {
  const { names, statistics, atBound, status } = input;
  const warnings: string[] = [];
  if (status === 'iteration-limit') warnings.push(`the fit stopped after ${input.iterations} iterations without converging: the values and intervals are those reached so far`);
  if (status === 'stalled') warnings.push('the fit stalled: no step lowered the cost although it had not converged; try other start values or a shorter window');
  names.forEach((name, j) => {
    const e = statistics.estimates[j]!;
    if (atBound[j]) {
      const which = Math.abs(e.value - input.lower[j]!) <= Math.abs(e.value - input.upper[j]!) ? `lower bound ${fmt(input.lower[j]!)}` : `upper bound ${fmt(input.upper[j]!)}`;
      warnings.push(`${name} ended on its ${which}: the optimum may lie beyond it, and its interval, which assumes an optimum inside the bounds, is not to be trusted`);
    }
    if (e.low === null || e.high === null) return;
    if (e.high - e.low > Math.abs(e.value)) {
      warnings.push(`${name} is not determined by these data: its 95 % interval (${fmt(e.low)} to ${fmt(e.high)}) is wider than the value itself (${fmt(e.value)}); the motion in the window hardly excites it`);
    }
  });
  if (statistics.estimates.some((e) => e.standardError === null)) {
    warnings.push(`the data cannot separate ${names.join(', ')}: the Jacobian is singular, so some parameter (or combination) does not change the response; fit fewer parameters or a richer motion`);
  }
  for (let a = 0; a < names.length; a++) {
    for (let b = a + 1; b < names.length; b++) {
      const r = statistics.correlation[a]![b];
      if (r != null && Math.abs(r) > CORRELATION_WARNING) {
        warnings.push(`${names[a]} and ${names[b]} are correlated (${r.toFixed(3)}): the data hardly tell them apart, so a change in one is made up by the other; excite the joint more widely or fix one`);
      }
    }
  }
  if (input.angleR2 !== null && input.angleR2 < R2_WARNING) {
    warnings.push(`the twin explains only ${(100 * input.angleR2).toFixed(1)} % of the measured angle's variation (R² ${input.angleR2.toFixed(3)}): an effect the scenario lacks, or a bad window or column mapping`);
  }
  return warnings;
}
