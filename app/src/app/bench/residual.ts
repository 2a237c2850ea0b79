/** Where the twin strays furthest from the closed form over one run. */
export interface ResidualPeak {
  /** max |twin − closed form| over the compared samples, rad. */
  maxAbs: number;
  /** Time of that largest difference, s (the earliest one on a tie). */
  time: number;
  /** How many twin samples were compared. */
  samples: number;
}

/**
 * The largest difference between the twin's angle samples and the closed form evaluated at the
 * same instants. Samples with a non-finite time or angle on either side are skipped rather than
 * compared, so a stray NaN cannot hide or fake a residual.
 * @param twin the run's samples: time (s) and angle (rad), parallel arrays read up to the shorter
 * @param closedFormAngleAt the closed-form angle at time t, rad
 * @returns null when no sample could be compared
 * @example largestResidual({ t: [0, 1], angle: [0, 1.5] }, (t) => t) // { maxAbs: 0.5, time: 1, samples: 2 }
 */
export function largestResidual(twin: { t: readonly number[]; angle: readonly number[] }, closedFormAngleAt: (t: number) => number): ResidualPeak | null {
  const count = Math.min(twin.t.length, twin.angle.length);
  let maxAbs = -1;
  let time = Number.NaN;
  let samples = 0;
  for (let i = 0; i < count; i++) {
    const t = twin.t[i];
    const angle = twin.angle[i];
    if (!Number.isFinite(t) || !Number.isFinite(angle)) continue;
    const expected = closedFormAngleAt(t);
    if (!Number.isFinite(expected)) continue;
    samples++;
    const difference = Math.abs(angle - expected);
    if (difference > maxAbs) {
      maxAbs = difference;
      time = t;
    }
  }
  return samples === 0 ? null : { maxAbs, time, samples };
}
