import type { RunFrame } from '@kinetwin/shared/protocol/run-events';

/**
 * Most points the angle chart holds for one run. A 10 s run at the default 2 ms spacing stays
 * under it untouched; an hour-long horizon is thinned so the browser keeps drawing smoothly.
 */
export const MAX_CHART_POINTS = 20_000;

/** Samples ready for the chart: time (s) and angle (rad), parallel arrays in time order. */
export interface ChartBatch {
  t: number[];
  angle: number[];
}

/** A frame mapped for the chart, with the time of the last sample kept so far. */
export interface ChartBatchResult {
  batch: ChartBatch;
  /** Time of the last sample kept, s; pass it back in with the next frame. */
  lastTime: number;
  /** Samples refused because t or angle was not finite, or time went backwards. */
  rejected: number;
}

/**
 * Smallest time step between two charted samples for a run of `horizon` seconds, so that a whole
 * run stays within MAX_CHART_POINTS.
 * @param horizon run length, s
 * @example chartSpacing(10) // 0.0005 s
 */
export function chartSpacing(horizon: number): number {
  // A horizon that is not a positive finite number cannot size anything: keep every sample.
  if (!(horizon > 0) || !Number.isFinite(horizon)) return 0;
  return horizon / MAX_CHART_POINTS;
}

/**
 * Maps one streamed frame into chart arrays. Keeps a sample only when both its time and angle are
 * finite and it lies at least `minSpacing` after the last kept sample (strictly after when the
 * spacing is 0), so replays, reordering and non-finite values never reach the plot.
 * @param frame the frame as received; its arrays are read up to the shorter of `t` and `angle`
 * @param lastTime time of the last sample already charted, s (-Infinity before the first)
 * @param minSpacing s, from chartSpacing(horizon)
 * @example chartBatchOfFrame({ t: [0, 0.002], angle: [0, 0.1], ... }, -Infinity, 0).batch // { t: [0, 0.002], angle: [0, 0.1] }
 */
export function chartBatchOfFrame(frame: Pick<RunFrame, 't' | 'angle'>, lastTime: number, minSpacing: number): ChartBatchResult {
  const count = Math.min(frame.t.length, frame.angle.length);
  const batch: ChartBatch = { t: [], angle: [] };
  let rejected = Math.max(frame.t.length, frame.angle.length) - count;
  let kept = lastTime;
  for (let i = 0; i < count; i++) {
    const t = frame.t[i];
    const angle = frame.angle[i];
    if (!Number.isFinite(t) || !Number.isFinite(angle) || t <= kept) {
      rejected++;
      continue;
    }
    if (t - kept < minSpacing) continue; // thinned, not wrong
    batch.t.push(t);
    batch.angle.push(angle);
    kept = t;
  }
  return { batch, lastTime: kept, rejected };
}

/**
 * The newest finite angle in a frame with a finite time, rad, for the 3D view; null when it has none.
 * @example latestAngle({ t: [0, 0.002], angle: [0.1, NaN] }) // 0.1
 */
export function latestAngle(frame: Pick<RunFrame, 't' | 'angle'>): number | null {
  for (let i = Math.min(frame.t.length, frame.angle.length) - 1; i >= 0; i--) {
    if (Number.isFinite(frame.t[i]) && Number.isFinite(frame.angle[i])) return frame.angle[i];
  }
  return null;
}

/** The time of the newest finite sample in a frame, s; null when it has none. */
export function latestTime(frame: Pick<RunFrame, 't' | 'angle'>): number | null {
  for (let i = Math.min(frame.t.length, frame.angle.length) - 1; i >= 0; i--) {
    if (Number.isFinite(frame.t[i]) && Number.isFinite(frame.angle[i])) return frame.t[i];
  }
  return null;
}
