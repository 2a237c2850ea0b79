/**
 * Step metrics read off a sampled response, for the twin (which has no closed form to solve
 * crossings on). The definitions are the closed form's (step-metrics.ts): overshoot
 * (peak − final)/|final| × 100, settling time the last exit from the band around the final value,
 * both from the step's own time. What a finite trace cannot know, it says: the final value is the
 * angle at the horizon, and it counts only if the response has stayed inside the band for the
 * last SETTLED_TAIL_FRACTION of the time from the step to the horizon.
 */

/** Share of the run after the step that must lie inside the band before a trace counts as settled. */
export const SETTLED_TAIL_FRACTION = 0.2;
/** Overshoot below this fraction of the final value is roundoff around a monotone approach (as the closed form's). */
const OVERSHOOT_FLOOR = 1e-9;

export interface TraceStepMetrics {
  /** %, null when not settled. */
  overshootPercent: number | null;
  /** s from the step, null when not settled. */
  settlingTime: number | null;
  /** The angle at the last sample, rad; null for an empty trace. */
  finalValue: number | null;
  /** Why the metrics are null, or null. */
  reason: string | null;
}

/**
 * Overshoot and settling time of a step response sampled on a uniform grid. The peak is refined
 * by the parabola through the largest sample and its neighbours (common practice), the band
 * exit by linear interpolation between the two samples around it.
 * @param band settling band as a fraction of the final value (0.02 = 2 %)
 * @example traceStepMetrics(trace.t, trace.angle, 0.1, 0.02).settlingTime // s after the step at 0.1 s
 */
export function traceStepMetrics(t: Float64Array, y: Float64Array, stepTime: number, band: number): TraceStepMetrics {
  const n = Math.min(t.length, y.length);
  let i0 = 0;
  while (i0 < n && t[i0]! < stepTime) i0++;
  if (n - i0 < 3) return { overshootPercent: null, settlingTime: null, finalValue: n > 0 ? y[n - 1]! : null, reason: 'the trace holds too few samples after the step to measure it' };
  const final = y[n - 1]!;
  if (final === 0) return { overshootPercent: null, settlingTime: null, finalValue: final, reason: 'the step response ends at zero: relative metrics are undefined' };
  const tol = band * Math.abs(final);
  let last = -1;
  for (let i = n - 1; i >= i0; i--) {
    if (Math.abs(y[i]! - final) > tol) {
      last = i;
      break;
    }
  }
  const end = t[n - 1]!;
  const tailFrom = end - SETTLED_TAIL_FRACTION * (end - stepTime);
  if (last >= 0 && t[last]! >= tailFrom) {
    return {
      overshootPercent: null,
      settlingTime: null,
      finalValue: final,
      reason: `the step response has not settled by the horizon: it is outside the ${band * 100} % band at t = ${t[last]!.toFixed(3)} s, within the last ${SETTLED_TAIL_FRACTION * 100} % of the run`,
    };
  }
  let settlingTime = 0;
  if (last >= 0) {
    const sign = y[last]! > final ? 1 : -1;
    const f0 = sign * (y[last]! - final) - tol;
    const f1 = sign * (y[last + 1]! - final) - tol;
    settlingTime = t[last]! + ((t[last + 1]! - t[last]!) * f0) / (f0 - f1) - stepTime;
  }
  let imax = i0;
  for (let i = i0 + 1; i < n; i++) if (y[i]! / final > y[imax]! / final) imax = i;
  let peak = y[imax]! / final;
  if (imax > i0 && imax < n - 1) {
    const a = y[imax - 1]! / final;
    const c = y[imax + 1]! / final;
    const curvature = a - 2 * peak + c;
    if (curvature < 0) peak -= ((a - c) * (a - c)) / (8 * curvature);
  }
  return { overshootPercent: peak - 1 > OVERSHOOT_FLOOR ? (peak - 1) * 100 : 0, settlingTime, finalValue: final, reason: null };
}

/** Whether y stays within `tolerance` of its last sample from time `from` on. */
export function traceHoldsFrom(t: Float64Array, y: Float64Array, from: number, tolerance: number): boolean {
  const n = Math.min(t.length, y.length);
  if (n === 0) return false;
  const final = y[n - 1]!;
  for (let i = n - 1; i >= 0 && t[i]! >= from; i--) if (Math.abs(y[i]! - final) > tolerance) return false;
  return true;
}
