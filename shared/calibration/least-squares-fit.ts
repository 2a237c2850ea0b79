import { levenbergMarquardt } from 'ml-levenberg-marquardt';

/**
 * Bounded nonlinear least squares by Levenberg–Marquardt (ml-levenberg-marquardt takes each
 * step), on parameters divided by their scale so that an inertia of 1e-4 kg·m² and a stiffness of
 * 1e3 N·m/rad move alike, with progress after every iteration and a cancellation check before
 * every model evaluation. The package is called one iteration at a time and the damping is kept
 * here (its own rule: down 9× after an improvement, up 11× after none), which is what lets a
 * caller watch and stop the fit. Model results are remembered for the last few parameter
 * vectors, so the package's repeated evaluations of the same point cost nothing.
 */

export interface LeastSquaresProblem {
  /** The (weighted) data the model is fitted to. */
  data: Float64Array;
  /** The model at parameters `p` (natural units): one value per datum, or why it cannot be evaluated. */
  model(p: readonly number[]): Float64Array | { failed: string };
  start: readonly number[];
  lower: readonly number[];
  upper: readonly number[];
  /** A typical magnitude of each parameter (positive). */
  scale: readonly number[];
}

export interface FitProgress {
  iteration: number;
  /** Sum of squared (weighted) residuals at the best parameters so far. */
  cost: number;
}

/** How a caller watches and stops a fit (a worker thread relays both). */
export interface FitHooks {
  onProgress?(progress: FitProgress): void;
  /** Checked before every model evaluation; true stops the fit with status "cancelled". */
  isCancelled?(): boolean;
}

export interface LeastSquaresOptions {
  maxIterations: number;
  /** Converged when an accepted step lowers the cost by less than this fraction. */
  costTolerance: number;
  /** Converged when a step moves no scaled parameter by more than this. */
  stepTolerance: number;
  /** Forward-difference step of the package's Jacobian, as a fraction of each scale. */
  differenceStep: number;
}

export const LEAST_SQUARES_DEFAULTS: LeastSquaresOptions = {
  maxIterations: 60,
  costTolerance: 1e-9,
  stepTolerance: 1e-9,
  differenceStep: 1e-5,
};

/** The package's starting damping and its bounds (its defaults). */
const DAMPING = { start: 1e-2, min: 1e-7, max: 1e7, down: 9, up: 11 } as const;
/** Rejected steps in a row after which the point is taken as the best to be had. */
const MAX_REJECTIONS = 10;
const REMEMBERED_POINTS = 24;

export type LeastSquaresStatus = 'converged' | 'iteration-limit' | 'stalled';

export interface LeastSquaresResult {
  status: LeastSquaresStatus;
  values: number[];
  cost: number;
  iterations: number;
  /** Model evaluations made (remembered ones not counted). */
  evaluations: number;
  /** The model at the optimum. */
  model: Float64Array;
  /** ∂model/∂p_j at the optimum by forward differences (backward at an upper bound), per parameter. */
  jacobian: Float64Array[];
  /** Whether each parameter ended on (within a difference step of) a bound. */
  atBound: boolean[];
}

export type LeastSquaresOutcome =
  | { ok: true; value: LeastSquaresResult }
  | { ok: false; reason: 'cancelled' | 'failed'; message: string };

class Cancelled extends Error {}

/**
 * @example const fit = leastSquaresFit({ data, model, start: [1, 0], lower: [0, -10], upper: [10, 10], scale: [1, 1] });
 */
export function leastSquaresFit(problem: LeastSquaresProblem, hooks: FitHooks = {}, options: Partial<LeastSquaresOptions> = {}): LeastSquaresOutcome {
  const o = { ...LEAST_SQUARES_DEFAULTS, ...options };
  const { data, scale } = problem;
  const p = problem.start.length;
  const n = data.length;
  const remembered = new Map<string, Float64Array>();
  let evaluations = 0;
  let lastFailure: string | null = null;
  let lastTrial: number[] = [];
  const failedModel = new Float64Array(n).fill(Number.NaN);

  /** The model at scaled parameters q (NaN everywhere where it cannot be evaluated). */
  const modelAt = (q: readonly number[]): Float64Array => {
    lastTrial = q.slice();
    const key = q.join(',');
    const known = remembered.get(key);
    if (known) return known;
    if (hooks.isCancelled?.()) throw new Cancelled();
    let values: Float64Array;
    if (q.some((x) => !Number.isFinite(x))) values = failedModel;
    else {
      evaluations++;
      const out = problem.model(q.map((x, j) => x * scale[j]!));
      if (out instanceof Float64Array) values = out;
      else {
        lastFailure = out.failed;
        values = failedModel;
      }
    }
    if (remembered.size >= REMEMBERED_POINTS) remembered.delete(remembered.keys().next().value!);
    remembered.set(key, values);
    return values;
  };
  const costOf = (values: Float64Array) => {
    let sum = 0;
    for (let i = 0; i < n; i++) sum += (data[i]! - values[i]!) ** 2;
    return sum;
  };

  const lower = problem.lower.map((x, j) => x / scale[j]!);
  const upper = problem.upper.map((x, j) => x / scale[j]!);
  const x = Float64Array.from({ length: n }, (_, i) => i);
  const pack = { x, y: data };
  const parameterized = (q: number[]) => {
    const values = modelAt(q);
    return (i: number) => values[i]!;
  };

  try {
    let q = problem.start.map((v, j) => Math.min(Math.max(v / scale[j]!, lower[j]!), upper[j]!));
    let cost = costOf(modelAt(q));
    if (!Number.isFinite(cost)) return { ok: false, reason: 'failed', message: `the model cannot be evaluated at the starting values: ${lastFailure ?? 'it gave a non-finite value'}` };
    hooks.onProgress?.({ iteration: 0, cost });
    let damping: number = DAMPING.start;
    let status: LeastSquaresStatus = 'iteration-limit';
    let rejections = 0;
    let iteration = 0;
    while (iteration < o.maxIterations) {
      iteration++;
      const step = levenbergMarquardt(pack, parameterized, {
        initialValues: q,
        minValues: lower,
        maxValues: upper,
        damping,
        maxIterations: 1,
        errorTolerance: 0,
        gradientDifference: o.differenceStep,
      });
      const trial = lastTrial;
      const moved = Math.max(...trial.map((v, j) => Math.abs(v - q[j]!)));
      if (step.parameterError < cost && Number.isFinite(step.parameterError)) {
        const decrease = (cost - step.parameterError) / cost;
        q = step.parameterValues;
        cost = step.parameterError;
        damping = Math.max(damping / DAMPING.down, DAMPING.min);
        rejections = 0;
        hooks.onProgress?.({ iteration, cost });
        if (decrease < o.costTolerance || moved < o.stepTolerance) {
          status = 'converged';
          break;
        }
      } else {
        damping = Math.min(damping * DAMPING.up, DAMPING.max);
        rejections++;
        hooks.onProgress?.({ iteration, cost });
        // A step this small that does not lower the cost: the optimum is reached to working precision.
        if (moved < o.stepTolerance) {
          status = 'converged';
          break;
        }
        if (rejections >= MAX_REJECTIONS || damping >= DAMPING.max) {
          status = 'stalled';
          break;
        }
      }
    }
    const model = modelAt(q);
    // The Jacobian for the intervals: forward differences with the package's own step (backward
    // at an upper bound), so when the fit ended by rejecting a step from the optimum, the package
    // has already evaluated every point needed and they are remembered: no extra twin run.
    const jacobian: Float64Array[] = [];
    const atBound: boolean[] = [];
    for (let j = 0; j < p; j++) {
      const h = o.differenceStep;
      const forward = q[j]! + h <= upper[j]!;
      atBound.push(q[j]! - lower[j]! < h || upper[j]! - q[j]! < h);
      const step = forward ? h : -Math.min(h, q[j]! - lower[j]!);
      if (step === 0) return { ok: false, reason: 'failed', message: 'a parameter has bounds closer together than the difference step' };
      const beside = modelAt(q.map((x0, k) => (k === j ? x0 + step : x0)));
      const column = new Float64Array(n);
      for (let i = 0; i < n; i++) column[i] = (beside[i]! - model[i]!) / (step * scale[j]!);
      if (column.some((v) => !Number.isFinite(v))) return { ok: false, reason: 'failed', message: `the model cannot be evaluated beside the optimum: ${lastFailure ?? 'a non-finite value'}` };
      jacobian.push(column);
    }
    return { ok: true, value: { status, values: q.map((v, j) => v * scale[j]!), cost, iterations: iteration, evaluations, model, jacobian, atBound } };
  } catch (err) {
    if (err instanceof Cancelled) return { ok: false, reason: 'cancelled', message: 'the fit was cancelled' };
    throw err;
  }
}
