import { describe, expect, it } from 'vitest';
import { gaussianSource } from '../twin/seeded-noise';
import { leastSquaresFit, type LeastSquaresProblem } from './least-squares-fit';
import { parameterStatistics } from './parameter-statistics';
import { NORMAL_975, studentT975 } from './student-t';
import { symmetricInverse } from './symmetric-inverse';

/** A straight line a + b·x as a least-squares problem over the given points. */
function lineProblem(x: readonly number[], y: readonly number[], start = [0, 0]): LeastSquaresProblem {
  return {
    data: Float64Array.from(y),
    model: ([a, b]) => Float64Array.from(x, (xi) => a! + b! * xi),
    start,
    lower: [-1e6, -1e6],
    upper: [1e6, 1e6],
    scale: [1, 1],
  };
}

function fittedLine(x: readonly number[], y: readonly number[], start = [0, 0]) {
  const fit = leastSquaresFit(lineProblem(x, y, start));
  if (!fit.ok) throw new Error(fit.message);
  const residual = Float64Array.from(y, (yi, i) => yi - fit.value.model[i]!);
  return { fit: fit.value, stats: parameterStatistics(fit.value.jacobian, residual, fit.value.values), residual };
}

describe('the confidence-interval machinery against straight-line regression', () => {
  // Textbook least squares for y = a + b·x (Draper & Smith, Applied Regression Analysis, ch. 1,
  // from memory): b = Sxy/Sxx, a = ȳ − b·x̄, s² = SSR/(n − 2), Var b = s²/Sxx,
  // Var a = s²(1/n + x̄²/Sxx), Cov(a, b) = −x̄·s²/Sxx; exact for a model linear in its parameters.
  it('gives the exact estimates, standard errors and correlation of a noisy line', () => {
    const noise = gaussianSource(42);
    const x = Array.from({ length: 25 }, (_, i) => 0.4 * i);
    const y = x.map((xi) => 1.5 - 0.8 * xi + 0.3 * noise.next());
    const { fit, stats } = fittedLine(x, y);
    const n = x.length;
    const xm = x.reduce((s, v) => s + v, 0) / n;
    const ym = y.reduce((s, v) => s + v, 0) / n;
    const sxx = x.reduce((s, v) => s + (v - xm) ** 2, 0);
    const sxy = x.reduce((s, v, i) => s + (v - xm) * (y[i]! - ym), 0);
    const b = sxy / sxx;
    const a = ym - b * xm;
    const s2 = y.reduce((s, v, i) => s + (v - a - b * x[i]!) ** 2, 0) / (n - 2);
    expect(fit.status).toBe('converged');
    expect(fit.values[0]).toBeCloseTo(a, 8);
    expect(fit.values[1]).toBeCloseTo(b, 8);
    expect(stats.degreesOfFreedom).toBe(n - 2);
    expect(stats.residualVariance).toBeCloseTo(s2, 10);
    expect(stats.estimates[1]!.standardError! / Math.sqrt(s2 / sxx)).toBeCloseTo(1, 6);
    expect(stats.estimates[0]!.standardError! / Math.sqrt(s2 * (1 / n + xm ** 2 / sxx))).toBeCloseTo(1, 6);
    expect(stats.correlation[0]![1]).toBeCloseTo(-xm / Math.sqrt(xm ** 2 + sxx / n), 6);
    const t = studentT975(n - 2);
    expect(stats.estimates[1]!.high! - stats.estimates[1]!.value).toBeCloseTo(t * Math.sqrt(s2 / sxx), 8);
  });

  // Anscombe's quartet, data set I (F. J. Anscombe, "Graphs in Statistical Analysis", The
  // American Statistician 27, 1973, from memory): y = 3.00 + 0.500·x, residual SS 13.75 on
  // 9 degrees of freedom, standard error of the slope 0.118, R² 0.667.
  it('reproduces the published regression of Anscombe’s data set I', () => {
    const x = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
    const y = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];
    const { fit, stats, residual } = fittedLine(x, y, [1, 1]);
    expect(fit.values[0]).toBeCloseTo(3.0, 2);
    expect(fit.values[1]).toBeCloseTo(0.5, 3);
    expect(residual.reduce((s, r) => s + r * r, 0)).toBeCloseTo(13.75, 1);
    expect(stats.degreesOfFreedom).toBe(9);
    expect(stats.estimates[1]!.standardError).toBeCloseTo(0.118, 3);
    const ym = y.reduce((s, v) => s + v, 0) / y.length;
    const sst = y.reduce((s, v) => s + (v - ym) ** 2, 0);
    expect(1 - residual.reduce((s, r) => s + r * r, 0) / sst).toBeCloseTo(0.667, 3);
  });

  it('says the data do not determine parameters that act only together', () => {
    // a·x and b·x: only a + b is seen.
    const x = [1, 2, 3, 4, 5];
    const stats = parameterStatistics([Float64Array.from(x), Float64Array.from(x)], Float64Array.of(0.1, -0.1, 0.05, 0, -0.05), [1, 2]);
    expect(stats.estimates.map((e) => e.standardError)).toEqual([null, null]);
  });
});

describe('Student’s t quantile', () => {
  // Two-sided 95 % points of Student's t (any statistics table, e.g. Abramowitz & Stegun
  // Table 26.10, from memory, 3 decimals): within the table's rounding (5e-4) and, at ν = 3 and
  // 5, the expansion's stated error on top.
  it.each([
    [1, 12.706, 5e-4],
    [2, 4.303, 5e-4],
    [3, 3.182, 5e-4 + 0.0012 * 3.182],
    [5, 2.571, 5e-4 + 0.0001 * 2.571],
    [10, 2.228, 5e-4],
    [30, 2.042, 5e-4],
    [120, 1.98, 5e-4],
  ])('t(0.975, %i) = %f', (nu, table, within) => {
    expect(Math.abs(studentT975(nu) - table)).toBeLessThan(within);
  });

  it('tends to the normal quantile and refuses nonsense degrees of freedom', () => {
    expect(studentT975(1e7)).toBeCloseTo(NORMAL_975, 6);
    expect(() => studentT975(0)).toThrow(RangeError);
    expect(() => studentT975(2.5)).toThrow(RangeError);
  });
});

describe('symmetric inverse', () => {
  it('inverts a positive definite matrix and refuses a singular one', () => {
    const inv = symmetricInverse([[4, 2], [2, 3]])!;
    expect(inv[0]![0]).toBeCloseTo(0.375, 14);
    expect(inv[0]![1]).toBeCloseTo(-0.25, 14);
    expect(inv[1]![1]).toBeCloseTo(0.5, 14);
    expect(symmetricInverse([[1, 2], [2, 4]])).toBeNull();
    expect(symmetricInverse([[0, 0], [0, 1]])).toBeNull();
  });
});

describe('the least-squares driver', () => {
  const x = Array.from({ length: 30 }, (_, i) => i / 10);
  // An exponential decay y = A·e^(−k·x): nonlinear in k, with A and k of very different sizes.
  const problem = (hooks = {}) => {
    const y = x.map((xi) => 2000 * Math.exp(-0.003 * 1000 * xi));
    return {
      problem: {
        data: Float64Array.from(y),
        model: ([A, k]: readonly number[]) => Float64Array.from(x, (xi) => A! * Math.exp(-k! * 1000 * xi)),
        start: [1500, 0.002],
        lower: [0, 0],
        upper: [1e6, 1],
        scale: [1500, 0.002],
      },
      hooks,
    };
  };

  it('converges on parameters of very different magnitudes from their scaled start', () => {
    const { problem: p } = problem();
    const fit = leastSquaresFit(p);
    expect(fit.ok && fit.value.status).toBe('converged');
    if (!fit.ok) return;
    expect(fit.value.values[0]).toBeCloseTo(2000, 4);
    expect(fit.value.values[1]).toBeCloseTo(0.003, 9);
  });

  it('reports progress with a cost that never rises, and stops when cancelled', () => {
    const costs: number[] = [];
    const fit = leastSquaresFit(problem().problem, { onProgress: ({ iteration, cost }) => costs.push(iteration, cost) });
    expect(fit.ok).toBe(true);
    const iterations = costs.filter((_, i) => i % 2 === 0);
    const values = costs.filter((_, i) => i % 2 === 1);
    expect(iterations[0]).toBe(0);
    expect(iterations).toEqual([...iterations].sort((a, b) => a - b));
    for (let i = 1; i < values.length; i++) expect(values[i]).toBeLessThanOrEqual(values[i - 1]!);
    let progress = 0;
    const cancelled = leastSquaresFit(problem().problem, { onProgress: () => progress++, isCancelled: () => progress >= 2 });
    expect(cancelled).toEqual({ ok: false, reason: 'cancelled', message: 'the fit was cancelled' });
  });

  it('keeps parameters within their bounds and says which ended on one', () => {
    const { problem: p } = problem();
    const fit = leastSquaresFit({ ...p, upper: [1800, 1] });
    expect(fit.ok).toBe(true);
    if (!fit.ok) return;
    expect(fit.value.values[0]).toBeLessThanOrEqual(1800);
    expect(fit.value.atBound).toEqual([true, false]);
  });

  it('fails plainly when the model cannot be evaluated at the start', () => {
    const { problem: p } = problem();
    const fit = leastSquaresFit({ ...p, model: () => ({ failed: 'the twin stopped: runaway' }) });
    expect(fit).toEqual({ ok: false, reason: 'failed', message: 'the model cannot be evaluated at the starting values: the twin stopped: runaway' });
  });
});
