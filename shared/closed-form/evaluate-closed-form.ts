import { type Parsed } from '../validation/field-errors';
import { type ClosedFormSolution } from './closed-form-solution';
import { evaluateUniformGrid } from './response-evaluator';

/** A sampled response: parallel arrays, t in s, angle in rad, velocity in rad/s. */
export interface SampledResponse {
  t: Float64Array;
  angle: Float64Array;
  velocity: Float64Array;
}

/** Most grid points one call will produce (80 MB of output arrays). */
export const MAX_GRID_POINTS = 10_000_000;

/**
 * Number of points of the uniform grid 0, dt, …, up to and including the horizon
 * (a horizon within 1e-9 steps of a grid time counts as on it, so roundoff in horizon/dt
 * does not drop the last sample).
 * @example gridPointCount(2, 0.001) // 2001
 */
export function gridPointCount(horizon: number, dt: number): number {
  return Math.floor(horizon / dt + 1e-9) + 1;
}

/**
 * Samples the closed form on t_i = i·dt from 0 to the horizon (allocates the three arrays; use
 * evaluateUniformGrid with your own arrays for an allocation-free loop). A non-positive or
 * non-finite dt or horizon, or more than MAX_GRID_POINTS points, is an error naming the field.
 * @param dt grid spacing, s
 * @param horizon last time, s
 * @example evaluateClosedForm(solution, 0.001, 2) // { ok: true, value: { t, angle, velocity } } with 2001 points
 */
export function evaluateClosedForm(solution: ClosedFormSolution, dt: number, horizon: number): Parsed<SampledResponse> {
  if (!(Number.isFinite(dt) && dt > 0)) return { ok: false, errors: [{ field: 'dt', message: `dt must be a positive finite number of seconds, got ${dt}` }] };
  if (!(Number.isFinite(horizon) && horizon >= 0)) return { ok: false, errors: [{ field: 'horizon', message: `horizon must be a finite number of seconds ≥ 0, got ${horizon}` }] };
  const n = gridPointCount(horizon, dt);
  if (n > MAX_GRID_POINTS) return { ok: false, errors: [{ field: 'dt', message: `dt ${dt} s gives ${n} points over ${horizon} s; at most ${MAX_GRID_POINTS} are allowed` }] };
  const t = new Float64Array(n);
  for (let i = 0; i < n; i++) t[i] = i * dt;
  const angle = new Float64Array(n);
  const velocity = new Float64Array(n);
  evaluateUniformGrid(solution.plan, dt, n, angle, velocity);
  return { ok: true, value: { t, angle, velocity } };
}
