import type { TwinTrace } from './twin-types';

/**
 * The output buffers of one advance call. Sized up front for every grid point the call can
 * reach, so recording a sample never reallocates on the twin's hot path; the trace handed out
 * is a view of the part filled.
 */
export class TraceRecorder {
  private readonly out: TwinTrace;
  private count = 0;

  /** @param capacity most samples this call can record */
  constructor(capacity: number) {
    this.out = {
      t: new Float64Array(capacity),
      angle: new Float64Array(capacity),
      velocity: new Float64Array(capacity),
      controllerTorque: new Float64Array(capacity),
      appliedTorque: new Float64Array(capacity),
      saturating: new Uint8Array(capacity),
      sticking: new Uint8Array(capacity),
    };
  }

  /** Appends one grid sample; the units are TwinTrace's. */
  record(t: number, angle: number, velocity: number, controllerTorque: number, appliedTorque: number, saturating: boolean, sticking: boolean): void {
    const out = this.out;
    const k = this.count;
    out.t[k] = t;
    out.angle[k] = angle;
    out.velocity[k] = velocity;
    out.controllerTorque[k] = controllerTorque;
    out.appliedTorque[k] = appliedTorque;
    out.saturating[k] = saturating ? 1 : 0;
    out.sticking[k] = sticking ? 1 : 0;
    this.count = k + 1;
  }

  /** The samples recorded so far, as views of the buffers (no copy). */
  trace(): TwinTrace {
    const { out, count } = this;
    return {
      t: out.t.subarray(0, count),
      angle: out.angle.subarray(0, count),
      velocity: out.velocity.subarray(0, count),
      controllerTorque: out.controllerTorque.subarray(0, count),
      appliedTorque: out.appliedTorque.subarray(0, count),
      saturating: out.saturating.subarray(0, count),
      sticking: out.sticking.subarray(0, count),
    };
  }
}
