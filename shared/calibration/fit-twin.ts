import type { TwinScenario } from '../twin/recorded-samples';
import type { TwinOptions } from '../twin/twin-run';
import type { Parsed } from '../validation/field-errors';
import { FIT_PARAMETERS, type FitParameterName } from './fit-parameters';
import { checkFitRequest, type CheckedFitRequest, type FitRequest } from './fit-request';
import { createFitModel, type ChannelWeights, type FitModel } from './fit-model';
import { fitWarnings } from './fit-warnings';
import { leastSquaresFit, type FitHooks, type LeastSquaresResult, type LeastSquaresStatus } from './least-squares-fit';
import { parameterStatistics } from './parameter-statistics';

/**
 * Calibration: the twin fitted to a measured trace under its recorded inputs. The scenario's
 * values are the start; Levenberg–Marquardt (least-squares-fit.ts) moves the chosen parameters
 * within their bounds to minimise the squared angle residuals (and velocity residuals, where
 * measured) over the window; the report says how well each parameter is determined.
 *
 * With velocity measured too, each channel's residuals are divided by their own RMS: first the
 * spread of the measured channel stands in, then the fit is repeated from its optimum with each
 * channel's residual RMS, so both count by their noise and the pooled variance means one thing.
 */

export interface FittedParameter {
  name: FitParameterName;
  label: string;
  unit: string;
  start: number;
  value: number;
  /** The 95 % interval (null when the data do not determine the parameter at all). */
  low: number | null;
  high: number | null;
  standardError: number | null;
  atBound: boolean;
}

export interface ChannelFit {
  /** √(mean squared residual), in the channel's unit. */
  rms: number;
  /** The largest |measured − twin| and when it occurs. */
  largest: number;
  largestAt: number;
  /** 1 − SSR/SST about the measured mean; null for a constant measurement. */
  r2: number | null;
}

export interface FitReport {
  status: LeastSquaresStatus;
  parameters: FittedParameter[];
  /** Correlation of the estimates, rows and columns in the order of `parameters`. */
  correlation: (number | null)[][];
  /** How the intervals were formed, in words. */
  intervalMethod: string;
  degreesOfFreedom: number;
  angle: ChannelFit;
  velocity: ChannelFit | null;
  /** measured − twin at the window's measured times (rad, rad/s). */
  residuals: { t: Float64Array; angle: Float64Array; velocity: Float64Array | null };
  warnings: string[];
  iterations: number;
  /** Twin runs made. */
  evaluations: number;
  /** The fitted values by name, ready to apply to the scenario (applyFit). */
  values: Partial<Record<FitParameterName, number>>;
  window: { start: number; end: number };
}

export type FitOutcome = Parsed<FitReport> | { ok: false; cancelled: true; errors: [{ field: ''; message: string }] };

/** The scenario with fitted values written in (what "apply to scenario" saves). */
export function applyFit(scenario: TwinScenario, values: Partial<Record<FitParameterName, number>>): TwinScenario {
  let s = scenario;
  for (const [name, v] of Object.entries(values) as [FitParameterName, number][]) s = FIT_PARAMETERS[name].set(s, v);
  return s;
}

/** A parameter's typical magnitude: its start, or where it starts at 0, one from the joint and its inputs. */
function scaleOf(name: FitParameterName, start: number, request: CheckedFitRequest, dt: number): number {
  if (start !== 0) return Math.abs(start);
  const inertia = request.scenario.joint.inertia;
  switch (name) {
    case 'inertia':
    case 'damping':
    case 'stiffness':
      // J per second, J per second squared: the joint's own units at 1 rad/s.
      return inertia;
    case 'coulombFriction':
    case 'staticFriction':
    case 'torqueOffset': {
      let peak = 0;
      for (const r of request.scenario.recordings ?? []) for (const v of r.values) peak = Math.max(peak, Math.abs(v));
      return peak > 0 ? 0.01 * peak : inertia;
    }
    case 'inputDelay':
      return 10 * dt;
  }
}

const spread = (x: Float64Array, from: number, to: number) => {
  let mean = 0;
  for (let i = from; i <= to; i++) mean += x[i]!;
  mean /= to - from + 1;
  let ss = 0;
  for (let i = from; i <= to; i++) ss += (x[i]! - mean) ** 2;
  return Math.sqrt(ss / (to - from + 1));
};

function channelFit(t: Float64Array, measured: Float64Array, residual: Float64Array, first: number): ChannelFit {
  let ssr = 0;
  let largest = 0;
  let largestAt = t[first]!;
  for (let i = 0; i < residual.length; i++) {
    const r = residual[i]!;
    ssr += r * r;
    if (Math.abs(r) > largest) {
      largest = Math.abs(r);
      largestAt = t[first + i]!;
    }
  }
  const sst = spread(measured, first, first + residual.length - 1) ** 2 * residual.length;
  return { rms: Math.sqrt(ssr / residual.length), largest, largestAt, r2: sst > 0 ? 1 - ssr / sst : null };
}

/**
 * Fits the twin to a measured trace.
 * @example
 * const report = fitTwin({ scenario, measured: { t, angle }, parameters: ['inertia', 'damping'] }, { onProgress: ({ iteration, cost }) => … });
 * if (report.ok) report.value.parameters[0] // { name: 'inertia', value, low, high, … }
 */
export function fitTwin(request: FitRequest, hooks: FitHooks = {}, twinOptions: TwinOptions = {}): FitOutcome {
  const checked = checkFitRequest(request);
  if (!checked.ok) return checked;
  const r = checked.value;
  const { measured, first, last, parameters: names } = r;
  const withVelocity = measured.velocity !== undefined;
  const unit = (x: number) => (x > 0 ? x : 1);
  let weights: ChannelWeights = { angle: unit(spread(measured.angle, first, last)), velocity: withVelocity ? unit(spread(measured.velocity!, first, last)) : 1 };
  let model: FitModel = createFitModel(r, weights, twinOptions);
  const scale = r.start.map((v, j) => scaleOf(names[j]!, v, r, model.dt));

  // The second pass (velocity measured) numbers its iterations on from the first's.
  let iterationBase = 0;
  const passHooks: FitHooks = {
    onProgress: hooks.onProgress && (({ iteration, cost }) => hooks.onProgress!({ iteration: iterationBase + iteration, cost })),
    isCancelled: hooks.isCancelled,
  };
  const run = (start: readonly number[], m: FitModel) =>
    leastSquaresFit({ data: m.data, model: (p) => m.model(p), start, lower: r.lower, upper: r.upper, scale }, passHooks, { maxIterations: r.maxIterations });
  let outcome = run(r.start, model);
  let iterations = 0;
  let evaluations = 0;
  if (outcome.ok && withVelocity) {
    iterations += outcome.value.iterations;
    evaluations += outcome.value.evaluations;
    iterationBase = iterations;
    const residualRms = (offset: number) => {
      const v = outcome.ok ? outcome.value : null;
      let ss = 0;
      for (let i = 0; i < model.count; i++) ss += (model.data[offset + i]! - v!.model[offset + i]!) ** 2;
      return Math.sqrt(ss / model.count);
    };
    weights = { angle: unit(weights.angle * residualRms(0)), velocity: unit(weights.velocity * residualRms(model.count)) };
    model = createFitModel(r, weights, twinOptions);
    outcome = run(outcome.value.values, model);
  }
  if (!outcome.ok) {
    if (outcome.reason === 'cancelled') return { ok: false, cancelled: true, errors: [{ field: '', message: outcome.message }] };
    return { ok: false, errors: [{ field: 'parameters', message: outcome.message }] };
  }
  const fit: LeastSquaresResult = outcome.value;
  iterations += fit.iterations;
  evaluations += fit.evaluations;

  const residual = new Float64Array(model.data.length);
  for (let i = 0; i < residual.length; i++) residual[i] = model.data[i]! - fit.model[i]!;
  const statistics = parameterStatistics(fit.jacobian, residual, fit.values);
  const count = model.count;
  const angleResidual = new Float64Array(count);
  for (let i = 0; i < count; i++) angleResidual[i] = residual[i]! * weights.angle;
  const velocityResidual = withVelocity ? Float64Array.from({ length: count }, (_, i) => residual[count + i]! * weights.velocity) : null;
  const angle = channelFit(measured.t, measured.angle, angleResidual, first);
  const velocity = velocityResidual ? channelFit(measured.t, measured.velocity!, velocityResidual, first) : null;

  const parameters: FittedParameter[] = names.map((name, j) => {
    const e = statistics.estimates[j]!;
    const { entry } = FIT_PARAMETERS[name];
    return { name, label: entry.label, unit: entry.unit, start: r.start[j]!, value: e.value, low: e.low, high: e.high, standardError: e.standardError, atBound: fit.atBound[j]! };
  });
  const warnings = fitWarnings({ names, statistics, atBound: fit.atBound, lower: r.lower, upper: r.upper, status: fit.status, iterations, angleR2: angle.r2 });
  return {
    ok: true,
    value: {
      status: fit.status,
      parameters,
      correlation: statistics.correlation,
      intervalMethod: `95 % intervals from the Jacobian at the optimum: s²·(JᵀJ)⁻¹ with s² the residual variance over n − p = ${statistics.degreesOfFreedom} degrees of freedom, times Student's t(0.975, ${statistics.degreesOfFreedom}) = ${statistics.quantile.toFixed(4)}; they assume independent errors and a model linear near the optimum`,
      degreesOfFreedom: statistics.degreesOfFreedom,
      angle,
      velocity,
      residuals: { t: measured.t.slice(first, last + 1), angle: angleResidual, velocity: velocityResidual },
      warnings,
      iterations,
      evaluations,
      values: Object.fromEntries(names.map((name, j) => [name, fit.values[j]!])),
      window: r.window,
    },
  };
}
