import { type InputTerm, type Scenario } from '../scenario/scenario-schema';
import { findBracketedRoot } from './bracketed-root';
import { absComplex } from './complex-number';
import { type InvertedPiece, type InvertedResponse } from './inverse-response';
import { multiplyPolynomials } from './polynomial';
import { formatPole, poleLocation } from './pole-location';
import { valueAtZero } from './rational-function';
import { angleOnScan, metricScan, type MetricScan } from './metric-scan';
import { compileResponsePlan, responseAt } from './response-evaluator';

/** Settling bands the engine offers: 2 % (the default) or 5 % of the final value. */
export const SETTLING_BANDS = [0.02, 0.05] as const;
export type SettlingBand = (typeof SETTLING_BANDS)[number];
/** The 2 % band (common practice). */
export const DEFAULT_SETTLING_BAND: SettlingBand = 0.02;
/** Most points of the bracketing scan; past it the scan step grows (a guard against runaway cost). */
export const MAX_METRIC_SCAN_POINTS = 1 << 18;
/** Fewest points of the bracketing scan. */
export const MIN_METRIC_SCAN_POINTS = 1000;
/** Scan step as a fraction of 1/|p| of the fastest pole still alive: ~60 points per oscillation. */
const SCAN_STEP_PER_POLE = 0.1;
const ZERO_RESPONSE = 'the step response settles at zero: relative metrics are undefined';
/** Overshoot below this fraction of the final value is roundoff around a monotone approach, not a peak. */
const OVERSHOOT_FLOOR = 1e-9;

/** Step metrics of the reference step (keys are a stable interface). Times in s from the step's own time. */
export interface StepMetrics {
  /** 10–90 % rise time, s. */
  riseTime: number | null;
  /** (peak − final)/|final| × 100; 0 for a monotone approach. */
  overshootPercent: number | null;
  /** Time of the first maximum, s; null when there is no overshoot. */
  peakTime: number | null;
  /** Last time the response leaves the settling band around the final value, s. */
  settlingTime: number | null;
  /** lim t→∞ (r(t) − θ(t)) over the whole scenario by the final value theorem, rad; null when r or θ has no final value. */
  steadyStateError: number | null;
}

/** The metrics with what they were measured on, or why they are undefined. */
export interface StepMetricsReport {
  metrics: StepMetrics;
  /** What the metrics were measured on; null with a reason when they are undefined. */
  basis: {
    inputIndex: number;
    /** rad. */
    amplitude: number;
    /** The step's own time, s. */
    delay: number;
    /** Final angle of the step's own response, rad. */
    finalValue: number;
    settlingBand: SettlingBand;
    /** Crossing times of 10 % and 90 %, s from the step. */
    rise: { from: number; to: number } | null;
  } | null;
  reason: string | null;
}

/**
 * Step metrics of the loop's response to the scenario's first reference step alone (zero initial
 * state, other inputs left out, as the textbook definitions assume); the steady-state error is
 * the whole scenario's, passed in (see referenceFinalValue and finalValue). Crossings are bracketed on a
 * scan of the closed form and then solved on the closed form itself; the scan runs until the
 * transient's envelope is provably inside a tenth of the band, whatever the horizon, with a step
 * set by the fastest pole whose term is still alive (fast poles are sampled finely only while
 * they matter).
 * @example stepMetrics(inverted, scenario, 0, 0.02).metrics.overshootPercent // 16.3 for ζ = 0.5
 */
export function stepMetrics(inverted: InvertedResponse, scenario: Scenario, steadyStateError: number | null, band: SettlingBand = DEFAULT_SETTLING_BAND): StepMetricsReport {
  const NO_METRICS: StepMetrics = { riseTime: null, overshootPercent: null, peakTime: null, settlingTime: null, steadyStateError };
  const stepIndex = firstReferenceStepIndex(scenario.inputs);
  if (stepIndex === null) return { metrics: NO_METRICS, basis: null, reason: 'no reference step in the scenario: rise, overshoot, peak and settling need one' };
  // No piece: no gain carries the reference to the angle, so the step's response is zero.
  const step = inverted.pieces.find((p) => p.source.kind === 'input' && p.source.index === stepIndex);
  if (!step) return { metrics: NO_METRICS, basis: null, reason: ZERO_RESPONSE };
  const term = scenario.inputs[step.source.kind === 'input' ? step.source.index : 0]!;
  const unstable = inverted.loopPoles.filter((c) => poleLocation(c.center) !== 'left');
  if (unstable.length > 0) {
    return { metrics: NO_METRICS, basis: null, reason: `the loop is not stable (pole at ${formatPole(unstable[0]!.center)}): the step response does not settle` };
  }
  const final = valueAtZero({ num: multiplyPolynomials([0, 1], step.transform.num), den: step.transform.den });
  const amplitude = term.amplitude;
  if (final === null || final === 0 || amplitude === 0) {
    return { metrics: NO_METRICS, basis: null, reason: ZERO_RESPONSE };
  }
  const plan = compileResponsePlan([{ ...step, delay: 0 }]);
  const transient = step.modes.filter((m) => !(m.pole.re === 0 && m.pole.im === 0));
  const scan = scanOf(transient, band * Math.abs(final));
  const times = scan.times;
  const n = times.length - 1;
  const g = angleOnScan(plan, scan, 1 / final);
  const y = (t: number) => responseAt(plan, t, 0) / final;
  const yv = (t: number) => responseAt(plan, t, 1) / final;
  const crossing = (level: number, from: number): { time: number; index: number } | null => {
    for (let i = Math.max(from, 1); i <= n; i++) {
      if (g[i]! >= level) return { time: findBracketedRoot((t) => y(t) - level, times[i - 1]!, times[i]!), index: i };
    }
    return null;
  };
  const c10 = crossing(0.1, 1);
  const c90 = c10 === null ? null : crossing(0.9, c10.index);
  const t10 = c10?.time ?? null;
  const t90 = c90?.time ?? null;
  let imax = 0;
  for (let i = 1; i <= n; i++) if (g[i]! > g[imax]!) imax = i;
  let peakTime: number | null = null;
  let overshootPercent = 0;
  if (g[imax]! - 1 > OVERSHOOT_FLOOR) {
    const lo = times[Math.max(imax - 1, 0)]!;
    const hi = times[Math.min(imax + 1, n)]!;
    peakTime = yv(lo) > 0 && yv(hi) < 0 ? findBracketedRoot(yv, lo, hi) : times[imax]!;
    overshootPercent = (y(peakTime) - 1) * 100;
  }
  let last = -1;
  for (let i = n; i >= 0; i--) {
    if (Math.abs(g[i]! - 1) > band) {
      last = i;
      break;
    }
  }
  let settlingTime = 0;
  if (last >= 0) {
    const sign = g[last]! > 1 ? 1 : -1;
    const f = (t: number) => sign * (y(t) - 1) - band;
    settlingTime = last >= n ? times[n]! : findBracketedRoot(f, times[last]!, times[last + 1]!);
  }
  return {
    metrics: {
      riseTime: t10 !== null && t90 !== null ? t90 - t10 : null,
      overshootPercent,
      peakTime,
      settlingTime,
      steadyStateError,
    },
    basis: {
      inputIndex: step.source.kind === 'input' ? step.source.index : -1,
      amplitude,
      delay: step.delay,
      finalValue: final,
      settlingBand: band,
      rise: t10 !== null && t90 !== null ? { from: t10, to: t90 } : null,
    },
    reason: null,
  };
}

/** The scan 0 … end, spaced by SCAN_STEP_PER_POLE/|p| of the fastest mode still above its share of the band. */
function scanOf(modes: InvertedPiece['modes'], band: number): MetricScan {
  const end = settledTime(modes, band);
  const live = modes.map((m) => ({ speed: absComplex(m.pole), until: settledTime([m], band / Math.max(modes.length, 1)) }));
  return metricScan(live, end, SCAN_STEP_PER_POLE, MIN_METRIC_SCAN_POINTS, MAX_METRIC_SCAN_POINTS);
}

/**
 * Which input the step metrics are measured on: the earliest reference step with a non-zero
 * amplitude (the first listed among equally early ones), or null. The closed form and the
 * gain map's twin cells both take the step from here.
 * @example firstReferenceStepIndex(scenario.inputs) // 0
 */
export function firstReferenceStepIndex(inputs: readonly InputTerm[]): number | null {
  let best: number | null = null;
  inputs.forEach((term, i) => {
    if (term.channel !== 'reference' || term.shape !== 'step' || term.amplitude === 0) return;
    if (best === null || term.delay < inputs[best]!.delay) best = i;
  });
  return best;
}

/**
 * A time past which the transient's envelope Σ|c_j| t^j e^(σt) stays below a tenth of the band
 * (each term decreasing there). Doubling is capped at 200 steps, far past any double range.
 */
function settledTime(modes: InvertedPiece['modes'], band: number): number {
  if (modes.length === 0) return 1;
  let slowest = -Infinity;
  let monotoneFrom = 0;
  for (const m of modes) {
    slowest = Math.max(slowest, m.pole.re);
    monotoneFrom = Math.max(monotoneFrom, (m.angle.length - 1) / -m.pole.re);
  }
  let t = Math.max(monotoneFrom, 1 / -slowest);
  // |c_j| once, not per doubling: this runs for every mode of every gain-map cell.
  const terms = modes.map((m) => ({ re: m.pole.re, size: m.angle.map((c) => (m.pole.im > 0 ? 2 : 1) * absComplex(c)) }));
  for (let k = 0; k < 200; k++) {
    let envelope = 0;
    for (const m of terms) {
      const decay = Math.exp(m.re * t);
      let power = 1;
      for (let j = 0; j < m.size.length; j++) {
        envelope += m.size[j]! * power * decay;
        power *= t;
      }
    }
    if (envelope <= 0.1 * band) return t;
    t *= 2;
  }
  return t;
}
