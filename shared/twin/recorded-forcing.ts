import type { RecordedHold } from '../scenario/recorded-input-schema';
import type { TwinScenario } from './recorded-samples';

/**
 * A recorded input as the forcing terms replay it. Before its first sample the term is 0 (like
 * every term before its start); from the last sample on it holds the last value. A zero-order
 * hold jumps at every sample whose value differs from the one before: those times are
 * breakpoints, so the twin restarts exactly there. Linear interpolation is continuous but its
 * slope changes at each sample: those times are breakpoints too, so the integrator's order is
 * never spent on a kink. A cursor keeps the sample the current stretch starts from; seeking is a
 * binary search, and nothing is allocated per stretch or per evaluation.
 */
export interface RecordedTrack {
  readonly channel: 'reference' | 'torque';
  readonly hold: RecordedHold;
  /** Run times of the samples: the log's times plus the input's delay, s. */
  readonly times: Float64Array;
  readonly values: Float64Array;
  /** The sample the current stretch starts from; −1 before the first. */
  k: number;
}

/** The recorded inputs of a scenario whose samples withRecordings attached (none when absent). */
export function recordedTracks(scenario: TwinScenario): RecordedTrack[] {
  const terms = scenario.recordedInputs ?? [];
  const recordings = scenario.recordings ?? [];
  return terms.slice(0, recordings.length).map((term, i) => {
    const { t, values } = recordings[i]!;
    const times = term.delay === 0 ? t : t.map((x) => x + term.delay);
    return { channel: term.channel, hold: term.hold, times, values, k: -1 };
  });
}

/** Index of the last sample at or before `t`, −1 when `t` is before the first. */
function lastAtOrBefore(times: Float64Array, t: number): number {
  let lo = 0;
  let hi = times.length - 1;
  if (!(times[0]! <= t)) return -1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >>> 1;
    if (times[mid]! <= t) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** Slope from sample k to k + 1 (0 from the last sample on). */
function slopeAt(track: RecordedTrack, k: number): number {
  const { times, values } = track;
  if (k < 0 || k >= times.length - 1) return 0;
  return (values[k + 1]! - values[k]!) / (times[k + 1]! - times[k]!);
}

/** Adds to `into` the times before `horizon` where the track jumps or bends. */
export function addTrackEdges(track: RecordedTrack, horizon: number, into: Set<number>): void {
  const { times, values } = track;
  const n = times.length;
  for (let i = 0; i < n && times[i]! < horizon; i++) {
    const bends = i === 0 || (track.hold === 'zoh' ? values[i] !== values[i - 1] : slopeAt(track, i) !== slopeAt(track, i - 1));
    if (bends) into.add(times[i]!);
  }
}

/** Puts the cursor on the sample the stretch from `start` begins at (edges within eps reached). */
export function seekTrack(track: RecordedTrack, start: number, eps: number): void {
  track.k = lastAtOrBefore(track.times, start + eps);
}

/**
 * The track's value at t on the current stretch. The stretch keeps its start sample up to its end,
 * so at a zero-order-hold edge that closes the stretch it still reads the value from before.
 * Linear: the line through the start sample, which skipped collinear samples lie on.
 */
export function trackValue(track: RecordedTrack, t: number): number {
  const k = track.k;
  if (k < 0) return 0;
  const v = track.values[k]!;
  return track.hold === 'zoh' ? v : v + slopeAt(track, k) * (t - track.times[k]!);
}

/** d/dt of the track on the current stretch. */
export function trackRate(track: RecordedTrack): number {
  return track.hold === 'zoh' ? 0 : slopeAt(track, track.k);
}

/** Whether the track is constant over the current stretch. */
export function trackConstant(track: RecordedTrack): boolean {
  return track.hold === 'zoh' || slopeAt(track, track.k) === 0;
}

/** value(t+) − value(t−) at exactly t: every zero-order-hold sample, and the first sample of either hold. */
export function trackJumpAt(track: RecordedTrack, t: number): number {
  const i = lastAtOrBefore(track.times, t);
  if (i < 0 || track.times[i] !== t) return 0;
  if (i === 0) return track.values[0]!;
  return track.hold === 'zoh' ? track.values[i]! - track.values[i - 1]! : 0;
}
