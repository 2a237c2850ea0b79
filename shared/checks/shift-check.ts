import type { Scenario } from '../scenario/scenario-schema';
import { resolveNonlinear } from '../scenario/nonlinear-schema';
import { simulateTwin, type TwinOptions } from '../twin/twin-run';
import { CHECK_DEFAULTS, checkDt, delayTerms, formatRatio, zeroStateWith, type CheckVerdict } from './check-verdict';
import { explainBreak, type RunEffect } from './superposition-check';

/** Defaults of the shift check; the README quotes these. */
export const SHIFT_DEFAULTS = {
  /** Default shift as a fraction of the horizon (rounded to whole sample periods when the controller is sampled). */
  shiftFraction: 1 / 4,
} as const;

/** The shift and how strictly to compare; every field has a default. */
export interface ShiftOptions {
  /** Time shift a, s, with 0 < a < horizon. */
  shift?: number;
  threshold?: number;
  twin?: TwinOptions;
}

/** The verdict plus the shift and grid used and the effects met. */
export interface ShiftResult extends CheckVerdict {
  /** The shift a used, s. */
  shift: number;
  /** Output spacing of both runs, s: a whole fraction of a so y1(t − a) falls on the grid. */
  dt: number;
  peak: number;
  firstExceeded: number | null;
  effects: RunEffect[];
}

/**
 * Shift check: zero-state runs of u(t) and u(t − a); y2(t) must equal y1(t − a) (and 0 before a)
 * for a time-invariant system (time-shift property, common practice). A sampled controller is
 * periodic in time, not time-invariant: when a is not a whole number of sample periods the
 * shifted input meets the sample grid at another phase, and the failure says so.
 * Both runs use an output spacing that divides a, so the comparison needs no interpolation.
 * @example shiftCheck(scenario, { shift: 0.25 }).pass
 */
export function shiftCheck(scenario: Scenario, options: ShiftOptions = {}): ShiftResult {
  const threshold = options.threshold ?? CHECK_DEFAULTS.threshold;
  const period = scenario.controller.mode === 'pid' ? scenario.controller.samplePeriod : null;
  const shift = options.shift ?? defaultShift(scenario.horizon, period);
  if (!(shift > 0 && shift < scenario.horizon)) {
    throw new RangeError(`shift must lie between 0 and the horizon (${scenario.horizon} s), got ${shift}`);
  }
  const wanted = checkDt(scenario.horizon, options.twin ?? {});
  const steps = Math.ceil(shift / wanted - 1e-9);
  const dt = shift / steps;
  const twin: TwinOptions = { ...options.twin, dt };
  const first = simulateTwin(zeroStateWith(scenario, scenario.inputs), twin);
  const second = simulateTwin(zeroStateWith(scenario, delayTerms(scenario.inputs, shift)), twin);
  const effects: RunEffect[] = [
    ...first.effects.map((e) => ({ ...e, run: 'u(t)' })),
    ...second.effects.map((e) => ({ ...e, run: 'u(t − a)' })),
  ].sort((a, b) => a.time - b.time);
  const base = { shift, dt, threshold, effects };
  const stopped = first.stop ?? second.stop;
  if (stopped) {
    return { ...base, pass: false, worst: Infinity, worstTime: stopped.time, peak: Infinity, firstExceeded: stopped.time, reason: `a run stopped before its horizon: ${stopped.message}` };
  }
  const y1 = first.samples.angle;
  const y2 = second.samples.angle;
  const t = second.samples.t;
  let peak = 0;
  for (let i = 0; i < y2.length; i++) peak = Math.max(peak, Math.abs(y2[i]!));
  for (let i = 0; i + steps < y2.length; i++) peak = Math.max(peak, Math.abs(y1[i]!));
  if (peak === 0) {
    return { ...base, pass: true, worst: 0, worstTime: 0, peak, firstExceeded: null, reason: 'neither run moved the joint (peak 0 rad): the shift check holds trivially' };
  }
  let worst = 0;
  let worstTime = 0;
  let firstExceeded: number | null = null;
  for (let i = 0; i < y2.length; i++) {
    const expected = i >= steps ? y1[i - steps]! : 0;
    const d = Math.abs(y2[i]! - expected) / peak;
    if (d > worst) {
      worst = d;
      worstTime = t[i]!;
    }
    if (firstExceeded === null && d > threshold) firstExceeded = t[i]!;
  }
  const pass = worst <= threshold;
  const measured = `y2(t) departs from y1(t − ${shift}) by ${formatRatio(worst)} of the peak at t = ${worstTime.toFixed(3)} s (threshold ${formatRatio(threshold)})`;
  const reason = pass ? `time invariance holds for a shift of ${shift} s: worst deviation ${formatRatio(worst)} of the peak` : `${explainShift(scenario, shift, effects, firstExceeded!)}; ${measured}`;
  return { ...base, pass, worst, worstTime, peak, firstExceeded, reason };
}

/** horizon/4, rounded to whole sample periods for a sampled controller so the default is a fair test. */
function defaultShift(horizon: number, period: number | null): number {
  const raw = horizon * SHIFT_DEFAULTS.shiftFraction;
  if (period === null) return raw;
  const periods = Math.max(1, Math.round(raw / period));
  return periods * period < horizon ? periods * period : raw;
}

function explainShift(scenario: Scenario, shift: number, effects: readonly RunEffect[], firstExceeded: number): string {
  const period = scenario.controller.mode === 'pid' ? scenario.controller.samplePeriod : null;
  if (period !== null) {
    const periods = shift / period;
    if (Math.abs(periods - Math.round(periods)) > 1e-9 * Math.max(1, periods)) {
      return (
        `the controller samples every ${period} s and the shift ${shift} s is ${+periods.toFixed(4)} sample periods, not a whole number: ` +
        `the shifted input meets the sample grid at another phase, and a sampled loop is periodic in time rather than time-invariant ` +
        `(shift by a multiple of ${period} s to compare like with like)`
      );
    }
  }
  if (resolveNonlinear(scenario.nonlinear).noiseStdDev > 0) {
    return 'measurement noise is drawn sample by sample from a fixed seed, so the shifted run meets a different noise sequence';
  }
  const early = effects.find((e) => e.run === 'u(t − a)' && e.time < shift);
  if (early) return `the joint does not stay at rest before the shifted input: ${early.description} at t = ${early.time.toFixed(3)} s`;
  return explainBreak(effects, firstExceeded);
}
