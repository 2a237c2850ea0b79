/** A closed-form angle trace: t in s and angle in rad, parallel arrays. */
export interface AngleTrace {
  t: Float64Array;
  angle: Float64Array;
}

/** Where the overlay draws: two SVG path strings in a width×height box and the axis ranges. */
export interface ScaledTraces {
  paths: string[];
  tMax: number;
  angleMin: number;
  angleMax: number;
}

/** Most points per drawn path: more than a chart this size can show, few enough for the DOM. */
export const MAX_PATH_POINTS = 1200;

/**
 * Scales traces into one SVG box sharing both axes (time from 0 to the longest horizon, angle
 * over the range of every trace with 5 % margin), thinning each to at most MAX_PATH_POINTS.
 * Non-finite samples break the line rather than draw to infinity.
 * @example scaleTraces([{ t: Float64Array.of(0, 1), angle: Float64Array.of(0, 1) }], 100, 50).paths[0]
 * // "M0,47.73L100,2.27"
 */
export function scaleTraces(traces: readonly AngleTrace[], width: number, height: number): ScaledTraces {
  let tMax = 0;
  let lo = Number.POSITIVE_INFINITY;
  let hi = Number.NEGATIVE_INFINITY;
  for (const trace of traces) {
    for (let i = 0; i < trace.t.length; i++) {
      const a = trace.angle[i]!;
      if (!Number.isFinite(a)) continue;
      if (a < lo) lo = a;
      if (a > hi) hi = a;
      if (trace.t[i]! > tMax) tMax = trace.t[i]!;
    }
  }
  if (!(hi >= lo)) return { paths: traces.map(() => ''), tMax, angleMin: 0, angleMax: 0 };
  // A flat trace still needs a vertical range to be drawn across the middle.
  const span = hi - lo || Math.max(Math.abs(hi), 1);
  const margin = span * 0.05;
  const angleMin = hi === lo ? lo - span / 2 : lo - margin;
  const angleMax = hi === lo ? hi + span / 2 : hi + margin;
  const x = (t: number) => (tMax > 0 ? (t / tMax) * width : 0);
  const y = (a: number) => height - ((a - angleMin) / (angleMax - angleMin)) * height;
  const paths = traces.map((trace) => {
    const step = Math.max(1, Math.ceil(trace.t.length / MAX_PATH_POINTS));
    let d = '';
    let pen = 'M';
    for (let i = 0; i < trace.t.length; i += step) {
      const a = trace.angle[i]!;
      if (!Number.isFinite(a)) {
        pen = 'M';
        continue;
      }
      d += `${pen}${round(x(trace.t[i]!))},${round(y(a))}`;
      pen = 'L';
    }
    return d;
  });
  return { paths, tMax, angleMin, angleMax };
}

function round(v: number): number {
  return Math.round(v * 100) / 100;
}
