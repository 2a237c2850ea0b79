import { LOG_UNIFORM_TOLERANCE } from './log-options';

/** How a log's time column is spaced. */
export interface LogTiming {
  start: number;
  end: number;
  /** Median of the steps between samples, s. */
  medianStep: number;
  minStep: number;
  maxStep: number;
  /** Every step within LOG_UNIFORM_TOLERANCE of the median. */
  uniform: boolean;
}

/** A step over gapFactor × the median step, between two samples (indices into the time array). */
export interface LogGap {
  /** Index of the sample before the gap. */
  index: number;
  step: number;
}

/**
 * The k-th smallest value (0-based) of `values`, reordering them: Hoare's selection ("FIND",
 * Comm. ACM 4(7), 1961) in O(n) on average, so a 2-million-sample log needs no full sort.
 */
export function selectKth(values: Float64Array, k: number): number {
  let lo = 0;
  let hi = values.length - 1;
  while (lo < hi) {
    const pivot = values[(lo + hi) >>> 1]!;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (values[i]! < pivot) i++;
      while (values[j]! > pivot) j--;
      if (i <= j) {
        const swap = values[i]!;
        values[i] = values[j]!;
        values[j] = swap;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return values[k]!;
  }
  return values[k]!;
}

/** The steps of a strictly increasing time column of at least two samples. */
export function stepsOf(time: Float64Array): Float64Array {
  const steps = new Float64Array(time.length - 1);
  for (let i = 1; i < time.length; i++) steps[i - 1] = time[i]! - time[i - 1]!;
  return steps;
}

/** Spacing of a strictly increasing time column of at least two samples. */
export function timingOf(time: Float64Array): LogTiming {
  const steps = stepsOf(time);
  let minStep = Infinity;
  let maxStep = 0;
  for (const s of steps) {
    if (s < minStep) minStep = s;
    if (s > maxStep) maxStep = s;
  }
  // The lower median: for an even count it is one of the steps, never an average of two.
  const medianStep = selectKth(steps, (steps.length - 1) >>> 1);
  const tolerance = LOG_UNIFORM_TOLERANCE * medianStep;
  return { start: time[0]!, end: time[time.length - 1]!, medianStep, minStep, maxStep, uniform: maxStep - medianStep <= tolerance && medianStep - minStep <= tolerance };
}

/** Steps over gapFactor × the median step, in time order. */
export function gapsOf(time: Float64Array, medianStep: number, gapFactor: number): LogGap[] {
  const gaps: LogGap[] = [];
  const limit = gapFactor * medianStep;
  for (let i = 1; i < time.length; i++) {
    const step = time[i]! - time[i - 1]!;
    if (step > limit) gaps.push({ index: i - 1, step });
  }
  return gaps;
}
