import type { RunFrame, RunSample } from '../../shared/protocol/run-events';
import type { TwinTrace } from '../../shared/twin/twin-run';

const floatFields = ['t', 'angle', 'velocity', 'controllerTorque', 'appliedTorque'] as const;
const flagFields = ['saturating', 'sticking'] as const;

/** An empty trace. */
export function emptyTrace(): TwinTrace {
  return {
    t: new Float64Array(0),
    angle: new Float64Array(0),
    velocity: new Float64Array(0),
    controllerTorque: new Float64Array(0),
    appliedTorque: new Float64Array(0),
    saturating: new Uint8Array(0),
    sticking: new Uint8Array(0),
  };
}

/** Samples [from, to) of a trace, sharing its memory. */
export function sliceTrace(s: TwinTrace, from: number, to: number): TwinTrace {
  const out = emptyTrace();
  for (const f of floatFields) out[f] = s[f].subarray(from, to);
  for (const f of flagFields) out[f] = s[f].subarray(from, to);
  return out;
}

/** a followed by b, in new arrays. */
export function concatTrace(a: TwinTrace, b: TwinTrace): TwinTrace {
  if (a.t.length === 0) return b;
  if (b.t.length === 0) return a;
  const out = emptyTrace();
  for (const f of floatFields) {
    const joined = new Float64Array(a[f].length + b[f].length);
    joined.set(a[f]);
    joined.set(b[f], a[f].length);
    out[f] = joined;
  }
  for (const f of flagFields) {
    const joined = new Uint8Array(a[f].length + b[f].length);
    joined.set(a[f]);
    joined.set(b[f], a[f].length);
    out[f] = joined;
  }
  return out;
}

/** Index of the first sample with t > time (the count of samples at or before it). */
export function countUpTo(s: TwinTrace, time: number): number {
  let lo = 0;
  let hi = s.t.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (s.t[mid]! <= time) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** The socket frame of a trace. */
export function toFrame(runId: string, s: TwinTrace): RunFrame {
  return {
    runId,
    t: Array.from(s.t),
    angle: Array.from(s.angle),
    velocity: Array.from(s.velocity),
    controllerTorque: Array.from(s.controllerTorque),
    appliedTorque: Array.from(s.appliedTorque),
    saturating: Array.from(s.saturating),
    sticking: Array.from(s.sticking),
  };
}

/** Sample i of a trace as one record. */
export function sampleAt(s: TwinTrace, i: number): RunSample {
  return {
    t: s.t[i]!,
    angle: s.angle[i]!,
    velocity: s.velocity[i]!,
    controllerTorque: s.controllerTorque[i]!,
    appliedTorque: s.appliedTorque[i]!,
    saturating: s.saturating[i] === 1,
    sticking: s.sticking[i] === 1,
  };
}

/**
 * The samples a live run has sent, kept for scrubbing: at most `capacity`, the oldest dropped
 * first. Chunks are kept as given (views on the twin's output, which nothing writes again), so a
 * live tick costs no copy.
 */
export class TraceHistory {
  private chunks: TwinTrace[] = [];
  private size = 0;

  constructor(private readonly capacity: number) {}

  append(s: TwinTrace): void {
    if (s.t.length === 0) return;
    this.chunks.push(s);
    this.size += s.t.length;
    while (this.size - this.chunks[0]!.t.length >= this.capacity) {
      this.size -= this.chunks.shift()!.t.length;
    }
  }

  /** Earliest time still kept, s (NaN when empty). */
  get earliest(): number {
    return this.chunks.length ? this.chunks[0]!.t[0]! : Number.NaN;
  }

  /** The kept sample nearest to `time`, or null when nothing is kept. */
  nearest(time: number): RunSample | null {
    let best: RunSample | null = null;
    let bestGap = Number.POSITIVE_INFINITY;
    for (const chunk of this.chunks) {
      const last = chunk.t.length - 1;
      if (chunk.t[last]! < time - bestGap) continue;
      const i = Math.min(countUpTo(chunk, time), last);
      for (const j of [i - 1, i]) {
        if (j < 0) continue;
        const gap = Math.abs(chunk.t[j]! - time);
        if (gap < bestGap) {
          bestGap = gap;
          best = sampleAt(chunk, j);
        }
      }
    }
    return best;
  }
}
