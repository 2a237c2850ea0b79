import type { RunFrame, RunSample } from '@kinetwin/shared/protocol/run-events';
import { MAX_CHART_POINTS } from './chart-points';

/** Samples a record starts with room for; it doubles as it fills. */
const INITIAL_CAPACITY = 1024;
/**
 * Most samples one record keeps. The chart's spacing keeps a run near MAX_CHART_POINTS; the
 * margin covers a horizon that gave no spacing (every sample kept). Past it, later samples are
 * not recorded, so a runaway stream cannot eat the page's memory.
 */
export const MAX_RECORDED_SAMPLES = 4 * MAX_CHART_POINTS;

/** The saturating and sticking flags of the newest sample the bench has seen. */
export interface SampleFlags {
  saturating: boolean;
  sticking: boolean;
}

/**
 * The samples of one run that the bench can scrub to once the server no longer holds the run:
 * the same samples the chart draws (finite time and angle, time increasing, at least
 * `minSpacing` apart, as chartBatchOfFrame keeps them), with velocity, torques and flags.
 */
export class RunRecord {
  private t = new Float64Array(INITIAL_CAPACITY);
  private angle = new Float64Array(INITIAL_CAPACITY);
  private velocity = new Float64Array(INITIAL_CAPACITY);
  private controllerTorque = new Float64Array(INITIAL_CAPACITY);
  private appliedTorque = new Float64Array(INITIAL_CAPACITY);
  private flags = new Uint8Array(INITIAL_CAPACITY);
  private count = 0;

  /** @param minSpacing s, from chartSpacing(horizon): the chart's thinning, so both hold the same samples */
  constructor(private readonly minSpacing: number) {}

  /** How many samples are recorded. */
  get size(): number {
    return this.count;
  }

  /** Time of the last recorded sample, s; -Infinity while empty. */
  get lastTime(): number {
    return this.count === 0 ? Number.NEGATIVE_INFINITY : this.t[this.count - 1];
  }

  /** Records the frame's samples that the chart keeps. */
  append(frame: RunFrame): void {
    const available = Math.min(frame.t.length, frame.angle.length);
    for (let i = 0; i < available; i++) {
      const t = frame.t[i];
      const angle = frame.angle[i];
      const last = this.lastTime;
      if (!Number.isFinite(t) || !Number.isFinite(angle) || t <= last || t - last < this.minSpacing) continue;
      if (this.count >= MAX_RECORDED_SAMPLES) return;
      if (this.count === this.t.length) this.grow();
      const at = this.count++;
      this.t[at] = t;
      this.angle[at] = angle;
      this.velocity[at] = finiteOrNaN(frame.velocity[i]);
      this.controllerTorque[at] = finiteOrNaN(frame.controllerTorque[i]);
      this.appliedTorque[at] = finiteOrNaN(frame.appliedTorque[i]);
      this.flags[at] = (frame.saturating[i] === 1 ? 1 : 0) | (frame.sticking[i] === 1 ? 2 : 0);
    }
  }

  /**
   * The recorded sample nearest to `time` (the earlier one on a tie); null while empty.
   * @param time s
   * @example record.nearest(0.5) // { t: 0.5, angle: 0.31, velocity: 0.2, ... }
   */
  nearest(time: number): RunSample | null {
    if (this.count === 0 || !Number.isFinite(time)) return null;
    let lo = 0;
    let hi = this.count - 1;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (this.t[mid] < time) lo = mid + 1;
      else hi = mid;
    }
    const at = lo > 0 && time - this.t[lo - 1] <= this.t[lo] - time ? lo - 1 : lo;
    return {
      t: this.t[at],
      angle: this.angle[at],
      velocity: this.velocity[at],
      controllerTorque: this.controllerTorque[at],
      appliedTorque: this.appliedTorque[at],
      saturating: (this.flags[at] & 1) !== 0,
      sticking: (this.flags[at] & 2) !== 0,
    };
  }

  private grow(): void {
    const size = this.t.length * 2;
    const bigger = <T extends Float64Array | Uint8Array>(old: T, make: (n: number) => T): T => {
      const next = make(size);
      next.set(old);
      return next;
    };
    this.t = bigger(this.t, (n) => new Float64Array(n));
    this.angle = bigger(this.angle, (n) => new Float64Array(n));
    this.velocity = bigger(this.velocity, (n) => new Float64Array(n));
    this.controllerTorque = bigger(this.controllerTorque, (n) => new Float64Array(n));
    this.appliedTorque = bigger(this.appliedTorque, (n) => new Float64Array(n));
    this.flags = bigger(this.flags, (n) => new Uint8Array(n));
  }
}

// A missing or broken value reads as "not a number" in the readout rather than as a made-up 0.
function finiteOrNaN(value: number | undefined): number {
  return value !== undefined && Number.isFinite(value) ? value : Number.NaN;
}

/**
 * The flags of the newest sample in a frame with a finite time; null when it has none.
 * @example latestFlags({ t: [0, 0.002], saturating: [0, 1], sticking: [0, 0] }) // { saturating: true, sticking: false }
 */
export function latestFlags(frame: Pick<RunFrame, 't' | 'saturating' | 'sticking'>): SampleFlags | null {
  for (let i = frame.t.length - 1; i >= 0; i--) {
    if (Number.isFinite(frame.t[i])) return { saturating: frame.saturating[i] === 1, sticking: frame.sticking[i] === 1 };
  }
  return null;
}
