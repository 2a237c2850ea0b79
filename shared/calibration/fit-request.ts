import { MAX_HORIZON_S } from '../scenario/scenario-schema';
import { rangeViolation } from '../scenario/parameter-catalogue';
import type { TwinScenario } from '../twin/recorded-samples';
import type { FieldError, Parsed } from '../validation/field-errors';
import { FIT_PARAMETER_NAMES, FIT_PARAMETERS, isFitParameterName, type FitParameterName } from './fit-parameters';

/**
 * What a fit is asked, checked before any twin runs: the parameters by name, the measured trace
 * (times from the log's start, angle, optionally velocity, all SI), the time window, bounds, and
 * where the run's initial state comes from. Errors name the field and, for samples, the index.
 */

/** A measured trace: times in s (strictly increasing, from 0 on), angle in rad, velocity in rad/s. */
export interface MeasuredTrace {
  t: Float64Array;
  angle: Float64Array;
  velocity?: Float64Array;
}

export interface FitBounds {
  min?: number;
  max?: number;
}

export interface FitRequest {
  /** The scenario whose values are the start, its recorded inputs' samples attached (withRecordings). */
  scenario: TwinScenario;
  measured: MeasuredTrace;
  parameters: readonly string[];
  /** Seconds of run time fitted (default: the whole trace). The run always starts at 0. */
  window?: { start: number; end: number };
  /** Bounds tighter than the catalogue's, by parameter name. */
  bounds?: Readonly<Record<string, FitBounds>>;
  /**
   * 'log': the run starts from the first measured angle (and velocity where given), which suits a
   * log whose first sample is at t = 0; 'scenario': from the scenario's initial state. Default 'log'.
   */
  initialState?: 'log' | 'scenario';
  maxIterations?: number;
}

/** Most measured samples a fit takes (a 50 MB log holds about a million rows). */
export const MAX_FIT_SAMPLES = 2_000_000;
/** Most iterations a fit may be asked for. */
export const MAX_FIT_ITERATIONS = 500;
export const DEFAULT_FIT_ITERATIONS = 60;

/** The request once checked: parameters known, window and bounds resolved, indices of the window's samples. */
export interface CheckedFitRequest {
  scenario: TwinScenario;
  measured: MeasuredTrace;
  parameters: FitParameterName[];
  window: { start: number; end: number };
  /** Measured samples inside the window: indices first..last inclusive. */
  first: number;
  last: number;
  lower: number[];
  upper: number[];
  start: number[];
  initialState: 'log' | 'scenario';
  maxIterations: number;
}

function traceProblem(name: string, values: Float64Array | undefined, length: number): string | null {
  if (!(values instanceof Float64Array)) return `${name} must be a Float64Array`;
  if (values.length !== length) return `${name} has ${values.length} samples but time has ${length}`;
  for (let i = 0; i < values.length; i++) if (!Number.isFinite(values[i])) return `${name} of sample ${i} is not a finite number`;
  return null;
}

/**
 * Checks a fit request.
 * @example checkFitRequest({ scenario, measured, parameters: ['inertia', 'damping'] }) // { ok: true, value }
 */
export function checkFitRequest(request: FitRequest): Parsed<CheckedFitRequest> {
  const errors: FieldError[] = [];
  const { scenario, measured } = request;
  const names: FitParameterName[] = [];
  if (request.parameters.length === 0) errors.push({ field: 'parameters', message: `name at least one of ${FIT_PARAMETER_NAMES.join(', ')}` });
  request.parameters.forEach((name, i) => {
    if (!isFitParameterName(name)) errors.push({ field: `parameters.${i}`, message: `"${name}" is not a fittable parameter (one of ${FIT_PARAMETER_NAMES.join(', ')})` });
    else if (names.includes(name)) errors.push({ field: `parameters.${i}`, message: `"${name}" is named twice` });
    else names.push(name);
  });
  if (names.includes('inputDelay') && (scenario.recordedInputs ?? []).length === 0) {
    errors.push({ field: 'parameters', message: 'inputDelay is the dead time of the recorded inputs, and the scenario has none' });
  }

  const t = measured.t;
  const n = t instanceof Float64Array ? t.length : 0;
  if (!(t instanceof Float64Array)) errors.push({ field: 'measured.t', message: 'time must be a Float64Array' });
  else if (n < 2) errors.push({ field: 'measured.t', message: 'a fit needs at least 2 measured samples' });
  else if (n > MAX_FIT_SAMPLES) errors.push({ field: 'measured.t', message: `${n} samples is more than the ${MAX_FIT_SAMPLES} a fit takes` });
  else {
    for (let i = 0; i < n; i++) {
      if (!Number.isFinite(t[i])) {
        errors.push({ field: 'measured.t', message: `time of sample ${i} is not a finite number` });
        break;
      }
      if (i === 0 && t[0]! < 0) {
        errors.push({ field: 'measured.t', message: `time of sample 0 (${t[0]} s) is before the run's start (0 s)` });
        break;
      }
      if (i > 0 && !(t[i]! > t[i - 1]!)) {
        errors.push({ field: 'measured.t', message: `time of sample ${i} (${t[i]} s) is not after the one before (${t[i - 1]} s)` });
        break;
      }
    }
    const angle = traceProblem('angle', measured.angle, n);
    if (angle) errors.push({ field: 'measured.angle', message: angle });
    if (measured.velocity !== undefined) {
      const velocity = traceProblem('velocity', measured.velocity, n);
      if (velocity) errors.push({ field: 'measured.velocity', message: velocity });
    }
  }

  const maxIterations = request.maxIterations ?? DEFAULT_FIT_ITERATIONS;
  if (!Number.isInteger(maxIterations) || maxIterations < 1 || maxIterations > MAX_FIT_ITERATIONS) {
    errors.push({ field: 'maxIterations', message: `maxIterations must be a whole number from 1 to ${MAX_FIT_ITERATIONS}` });
  }

  const lower: number[] = [];
  const upper: number[] = [];
  const start: number[] = [];
  for (const name of names) {
    const { entry, get } = FIT_PARAMETERS[name];
    const b = request.bounds?.[name] ?? {};
    const field = `bounds.${name}`;
    for (const end of ['min', 'max'] as const) {
      const v = b[end];
      if (v === undefined) continue;
      const problem = rangeViolation(entry, v);
      if (problem) errors.push({ field: `${field}.${end}`, message: problem });
    }
    // An open lower end (inertia > 0) is approached, never reached: a millionth of the start stands in.
    const value = get(scenario);
    const floor = entry.min.inclusive ? entry.min.value : entry.min.value + Math.abs(value) * 1e-6;
    const lo = Math.max(b.min ?? -Infinity, floor);
    const hi = Math.min(b.max ?? Infinity, entry.max.value);
    if (!(lo < hi)) errors.push({ field, message: `the bounds of ${name} leave no room (${lo} to ${hi})` });
    else if (value < lo || value > hi) errors.push({ field, message: `the scenario's ${name} (${value}) is the fit's start and lies outside its bounds (${lo} to ${hi})` });
    lower.push(lo);
    upper.push(hi);
    start.push(value);
  }
  if (errors.length > 0) return { ok: false, errors };

  const window = request.window ?? { start: t[0]!, end: t[n - 1]! };
  if (!Number.isFinite(window.start) || !Number.isFinite(window.end) || window.start < 0 || !(window.start < window.end)) {
    return { ok: false, errors: [{ field: 'window', message: `the window must run forwards from 0 s on, got ${window.start} to ${window.end} s` }] };
  }
  if (window.end > MAX_HORIZON_S) return { ok: false, errors: [{ field: 'window', message: `the window must end by ${MAX_HORIZON_S} s, the longest horizon` }] };
  let first = 0;
  while (first < n && t[first]! < window.start) first++;
  let last = n - 1;
  while (last >= 0 && t[last]! > window.end) last--;
  const inside = last - first + 1;
  // More samples than parameters, with a few to spare, or the residual variance has no meaning.
  const needed = names.length + 3;
  if (inside < needed) {
    return { ok: false, errors: [{ field: 'window', message: `the window ${window.start} to ${window.end} s holds ${Math.max(0, inside)} measured samples; fitting ${names.length} parameters needs at least ${needed}` }] };
  }
  return {
    ok: true,
    value: { scenario, measured, parameters: names, window, first, last, lower, upper, start, initialState: request.initialState ?? 'log', maxIterations },
  };
}
