import { studentT975 } from './student-t';
import { symmetricInverse } from './symmetric-inverse';

/**
 * How well a least-squares fit determines its parameters, from the Jacobian at the optimum
 * (the linearised model, common practice; e.g. Bates & Watts, Nonlinear Regression Analysis and
 * Its Applications, ch. 2, from memory): covariance s²·(JᵀJ)⁻¹ with s² = SSR / (n − p), 95 %
 * intervals value ± t(0.975, n − p)·√cov_jj (Student's t, see student-t.ts), and correlations
 * cov_ij / √(cov_ii·cov_jj). Exact for a model linear in its parameters with independent
 * Gaussian errors of one variance; for a nonlinear model, as good as its linearisation.
 */

export interface ParameterEstimate {
  value: number;
  /** √cov_jj; null when JᵀJ is singular (the data do not determine the parameters). */
  standardError: number | null;
  /** The 95 % interval; null with standardError. */
  low: number | null;
  high: number | null;
}

export interface ParameterStatistics {
  estimates: ParameterEstimate[];
  /** Correlation matrix of the estimates (null entries when JᵀJ is singular). */
  correlation: (number | null)[][];
  /** n − p. */
  degreesOfFreedom: number;
  /** s² = SSR / (n − p), in the (weighted) units of the residuals squared. */
  residualVariance: number;
  /** The t factor the half-widths were multiplied by. */
  quantile: number;
}

/**
 * @param jacobian one column per parameter: ∂model_i/∂p_j at the optimum, in the residuals' units per parameter unit
 * @param residuals data − model at the optimum
 * @param values the parameters at the optimum
 * @example parameterStatistics([x0, x1], residuals, [a, b]).estimates[1].low
 */
export function parameterStatistics(jacobian: readonly Float64Array[], residuals: Float64Array, values: readonly number[]): ParameterStatistics {
  const p = values.length;
  const n = residuals.length;
  if (jacobian.length !== p || jacobian.some((c) => c.length !== n)) throw new RangeError('the Jacobian must have one column of n rows per parameter');
  if (n <= p) throw new RangeError(`${n} residuals cannot determine ${p} parameters with an error estimate (need more than ${p})`);
  let ssr = 0;
  for (let i = 0; i < n; i++) ssr += residuals[i]! ** 2;
  const dof = n - p;
  const variance = ssr / dof;
  const jtj = Array.from({ length: p }, (_, a) =>
    Array.from({ length: p }, (_, b) => {
      const ca = jacobian[a]!;
      const cb = jacobian[b]!;
      let sum = 0;
      for (let i = 0; i < n; i++) sum += ca[i]! * cb[i]!;
      return sum;
    }),
  );
  const inverse = symmetricInverse(jtj);
  const quantile = studentT975(dof);
  if (!inverse) {
    return {
      estimates: values.map((value) => ({ value, standardError: null, low: null, high: null })),
      correlation: values.map((_, a) => values.map((__, b) => (a === b ? 1 : null))),
      degreesOfFreedom: dof,
      residualVariance: variance,
      quantile,
    };
  }
  const se = inverse.map((row, j) => Math.sqrt(Math.max(0, variance * row[j]!)));
  return {
    estimates: values.map((value, j) => ({ value, standardError: se[j]!, low: value - quantile * se[j]!, high: value + quantile * se[j]! })),
    correlation: inverse.map((row, a) => row.map((x, b) => (a === b ? 1 : x / Math.sqrt(inverse[a]![a]! * inverse[b]![b]!)))),
    degreesOfFreedom: dof,
    residualVariance: variance,
    quantile,
  };
}
