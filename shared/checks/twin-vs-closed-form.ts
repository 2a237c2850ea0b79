/** Angle of the closed form at the given times, rad; the only thing this comparison needs of it. */
export type AngleAtTimes = (t: Float64Array) => Float64Array;

/** Twin minus closed form, on the twin's output grid. */
export interface ResidualReport {
  /** s */
  t: Float64Array;
  /** Twin angle minus closed-form angle, rad. */
  residual: Float64Array;
  /** Root mean square of the residual, rad. */
  rms: number;
  /** Largest |residual|, rad. */
  maxError: number;
  /** Time of the largest |residual|, s. */
  timeOfMaxError: number;
  /** Largest |closed-form angle|, rad. */
  peak: number;
  /** maxError / peak (0 when both are 0). */
  relativeMaxError: number;
}

/**
 * Compares twin samples with the closed form evaluated at the same times.
 * Throws a RangeError when the closed form returns the wrong number of values or a non-finite one,
 * since any figure built on that would be meaningless.
 * @param twin the twin's samples (angle in rad)
 * @example compareWithClosedForm(samples, (t) => t.map((x) => 1 - Math.exp(-x))).maxError // rad
 */
export function compareWithClosedForm(twin: { t: Float64Array; angle: Float64Array }, closedForm: AngleAtTimes): ResidualReport {
  const reference = closedForm(twin.t);
  if (reference.length !== twin.t.length) {
    throw new RangeError(`closed form returned ${reference.length} values for ${twin.t.length} times`);
  }
  const residual = new Float64Array(twin.t.length);
  let sumSquares = 0;
  let maxError = 0;
  let timeOfMaxError = 0;
  let peak = 0;
  for (let i = 0; i < residual.length; i++) {
    const exact = reference[i]!;
    if (!Number.isFinite(exact)) throw new RangeError(`closed form is not finite at t = ${twin.t[i]} s`);
    const r = twin.angle[i]! - exact;
    residual[i] = r;
    sumSquares += r * r;
    if (Math.abs(r) > maxError) {
      maxError = Math.abs(r);
      timeOfMaxError = twin.t[i]!;
    }
    peak = Math.max(peak, Math.abs(exact));
  }
  const rms = residual.length > 0 ? Math.sqrt(sumSquares / residual.length) : 0;
  // A closed form that stays at 0 has no scale: report the absolute error as relative only when it is 0 too.
  const relativeMaxError = peak > 0 ? maxError / peak : maxError === 0 ? 0 : Infinity;
  return { t: twin.t, residual, rms, maxError, timeOfMaxError, peak, relativeMaxError };
}
