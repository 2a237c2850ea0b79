import { EVALUATOR_ANCHOR_INTERVAL, type ResponsePlan } from './response-evaluator';

/**
 * The step metrics' bracketing scan as uniform stretches. The scan's step is set by the fastest
 * mode still alive, so it is constant between the times modes die out: each stretch is
 * t0 + j·h for j = 1 … count (the last point of the scan clamped to its end). Kept as stretches,
 * the scan is laid out without a per-point search and evaluated by recurrence (one complex
 * multiply per mode and point) instead of an exp, cos and sin per point.
 */
export interface ScanStretch {
  t0: number;
  h: number;
  count: number;
}

export interface MetricScan {
  /** 0, then every stretch's points; ascending, ends at `end`. */
  times: Float64Array;
  stretches: ScanStretch[];
}

/** One mode's say in the scan: its speed |p| and the time after which it no longer matters. */
export interface ScanMode {
  speed: number;
  until: number;
}

/**
 * The scan 0 … end: the step is min(stepPerSpeed / fastest live speed × stretch, end / minPoints),
 * a mode being live at t while t < until; `stretch` (≥ 1) widens every step so the scan holds at
 * most maxPoints points.
 */
export function metricScan(modes: readonly ScanMode[], end: number, stepPerSpeed: number, minPoints: number, maxPoints: number): MetricScan {
  const coarsest = end / minPoints;
  const stepAt = (t: number, stretch: number) => {
    let speed = 0;
    for (const m of modes) if (m.until > t) speed = Math.max(speed, m.speed);
    return Math.min(speed > 0 ? (stepPerSpeed / speed) * stretch : Infinity, coarsest);
  };
  // A mode's death is where the step may change: stretches run between those times.
  const edges = [...new Set(modes.map((m) => m.until).filter((u) => u > 0 && u < end))].sort((a, b) => a - b);
  edges.push(end);
  const layout = (stretch: number): ScanStretch[] => {
    const out: ScanStretch[] = [];
    let t = 0;
    for (const edge of edges) {
      if (t >= edge) continue;
      const h = stepAt(t, stretch);
      // Points are taken while the point before lies short of the edge.
      const count = Math.max(1, Math.ceil((edge - t) / h));
      out.push({ t0: t, h, count });
      t += count * h;
      if (t >= end) break;
    }
    return out;
  };
  let stretches = layout(1);
  const total = stretches.reduce((s, x) => s + x.count, 0);
  if (total > maxPoints) stretches = layout(total / maxPoints);
  const n = stretches.reduce((s, x) => s + x.count, 0);
  const times = new Float64Array(n + 1);
  let i = 0;
  for (const s of stretches) for (let j = 1; j <= s.count; j++) times[++i] = Math.min(end, s.t0 + j * s.h);
  return { times, stretches };
}

/**
 * Angle of a one-segment plan (a piece compiled from t = 0) at every scan time, by recurrence
 * along each stretch, re-anchored exactly at each stretch's start and every
 * EVALUATOR_ANCHOR_INTERVAL points, as the grid evaluator does. The clamped last point is exact.
 * Every value is multiplied by `scale` (the step metrics divide by the final value).
 */
export function angleOnScan(plan: ResponsePlan, scan: MetricScan, scale = 1): Float64Array {
  const { times, stretches } = scan;
  const out = new Float64Array(times.length);
  const groups = plan.segmentGroup[1] ?? 0;
  const end = times[times.length - 1]!;
  // Locals, not imported bindings or property reads, inside the per-point loop: the loop is the
  // gain map's hot path.
  const anchorEvery = EVALUATOR_ANCHOR_INTERVAL;
  const cRe = plan.angleRe.map((c) => c * scale);
  const cIm = plan.angleIm.map((c) => c * scale);
  for (let g = 0; g < groups; g++) {
    const pr = plan.groupRe[g]!;
    const pi = plan.groupIm[g]!;
    const c0 = plan.groupCoef[g]!;
    const last = plan.groupCoef[g + 1]! - 1;
    out[0] += cRe[c0]!;
    let i = 0;
    for (let k = 0; k < stretches.length; k++) {
      const s = stretches[k]!;
      const wm = Math.exp(pr * s.h);
      const wr = pi === 0 ? wm : wm * Math.cos(pi * s.h);
      const wi = pi === 0 ? 0 : wm * Math.sin(pi * s.h);
      let zr = 0;
      let zi = 0;
      for (let j = 1; j <= s.count; j++) {
        const t = times[++i]!;
        if ((j - 1) % anchorEvery === 0 || t === end) {
          const m = Math.exp(pr * t);
          zr = pi === 0 ? m : m * Math.cos(pi * t);
          zi = pi === 0 ? 0 : m * Math.sin(pi * t);
        } else {
          const nr = zr * wr - zi * wi;
          zi = zr * wi + zi * wr;
          zr = nr;
          // Flush to zero before subnormals (see response-evaluator.ts).
          if (zr < 1e-290 && zr > -1e-290 && zi < 1e-290 && zi > -1e-290) {
            zr = 0;
            zi = 0;
          }
        }
        let ar = cRe[last]!;
        let ai = cIm[last]!;
        for (let c = last - 1; c >= c0; c--) {
          ar = ar * t + cRe[c]!;
          ai = ai * t + cIm[c]!;
        }
        out[i] += ar * zr - ai * zi;
      }
    }
  }
  return out;
}
