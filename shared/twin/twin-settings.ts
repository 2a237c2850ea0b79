/** Numerical settings of a twin run, their defaults, and the caller's limits on one advance. */

/** Defaults of a twin run; the README's configuration table quotes these. */
export const TWIN_DEFAULTS: TwinSettings = {
  /** Output sample spacing, s. */
  dt: 0.001,
  /** odex relative and absolute tolerances. */
  relativeTolerance: 1e-10,
  absoluteTolerance: 1e-10,
  /**
   * Longest stretch integrated in one odex call, s. Each restart costs odex its start-up work
   * (a quarter-second chunk made a 10 s run about a third slower than 1 s chunks when measured);
   * live runs pass a short one so a kick lands close to what is on screen.
   */
  maxChunk: 1,
  /** A run stops when |angle| exceeds this, rad (a runaway joint, not a real move). */
  angleBound: 1e6,
  /** A run stops when |velocity| exceeds this, rad/s. */
  velocityBound: 1e7,
  /** odex step budget per chunk; exhausting it means the scenario is too stiff for this integrator. */
  maxStepsPerChunk: 20000,
  /** Most stick/slip switches in one run; more means the friction model is being driven in circles. */
  maxFrictionEvents: 100000,
  /**
   * The work budget, in right-hand-side and event-function evaluations: by simulated time t a
   * run may have spent workBase + workPerSecond × t + workPerSample × (output and controller
   * samples reached). Paced rather than totalled, so a scenario that grinds is stopped early
   * instead of at its horizon. The parameter catalogue refuses impossible values; this bounds
   * stiff combinations of possible ones. Sized from measurements (freeze-readme): the demo
   * scenarios spend under 1 % of workBase, a 10 s 1 ms sampled loop with every effect ~4.4 per sample.
   */
  workBase: 1_000_000,
  workPerSecond: 100_000,
  workPerSample: 20,
};

/** Numerical settings of a twin run; TWIN_DEFAULTS documents each. */
export interface TwinSettings {
  dt: number;
  relativeTolerance: number;
  absoluteTolerance: number;
  maxChunk: number;
  angleBound: number;
  velocityBound: number;
  maxStepsPerChunk: number;
  maxFrictionEvents: number;
  workBase: number;
  workPerSecond: number;
  workPerSample: number;
}

/** Settings a caller may override; the rest come from TWIN_DEFAULTS. */
export type TwinOptions = Partial<TwinSettings>;

/**
 * A wall-time limit for one advance call. shared/ reads no clock, so the caller passes its own;
 * `deadline` is in the units of `now()` (e.g. performance.now(), ms).
 */
export interface AdvanceLimits {
  deadline: number;
  now: () => number;
}
