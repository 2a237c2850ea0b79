/**
 * The discrete PID law of the twin's sampled controller, run once per sample instant t_k = k·T:
 *   u_k = kp·e_k + ki·I_k + kd·D_k,   I_{k+1} = I_k + T·e_k   (forward rectangle rule),
 *   D_k = (x_k − x_{k−1}) / T                                 (backward difference), or with the
 *   derivative filter Tf: D_k = (Tf·D_{k−1} + x_k − x_{k−1}) / (Tf + T) (backward Euler of
 *   Tf·D′ + D = x′), where x is the error or minus the measured angle.
 * Åström & Wittenmark, Computer-Controlled Systems (3rd ed.), §8.3, discretized PID (from memory).
 * x_{−1} is minus the first measurement (r(0−) = 0), so a reference step at t = 0 gives the
 * discrete derivative kick kd·A/T for one sample, the sampled counterpart of the continuous one.
 */
export interface SampledPidState {
  /** Integral of the error, rad·s. */
  integral: number;
  /** x_{k−1}: previous derivative input, rad. */
  previousInput: number;
  /** D_{k−1}: previous (filtered) derivative, rad/s. */
  derivative: number;
  /** False until the first sample has been taken. */
  started: boolean;
}

export interface SampledPidGains {
  kp: number;
  ki: number;
  kd: number;
  /** Derivative filter time constant, s (0: unfiltered). */
  derivativeFilter: number;
  derivativeOnError: boolean;
  /** Sample period T, s. */
  period: number;
  /** Gear ratio N: the result is the torque at the joint. */
  gearRatio: number;
  /** Symmetric drive limit at the joint, N·m (Infinity: none). */
  torqueLimit: number;
  antiWindup: boolean;
}

/** A controller that has taken no sample yet. */
export function initialSampledPidState(): SampledPidState {
  return { integral: 0, previousInput: 0, derivative: 0, started: false };
}

/**
 * Takes one sample: updates `state` in place and returns the torque requested at the joint, N·m.
 * With anti-windup the integral is frozen while the request exceeds the limit and the error would
 * push it further (clamping; Åström & Hägglund, Advanced PID Control, §3.5, from memory).
 * @param reference r(t_k), rad
 * @param measured measured angle at t_k, rad
 * @example sampledPidStep(initialSampledPidState(), gains, 0.5, 0) // n·(kp·0.5 + kd·0.5/T) on error
 */
export function sampledPidStep(state: SampledPidState, gains: SampledPidGains, reference: number, measured: number): number {
  const error = reference - measured;
  const input = gains.derivativeOnError ? error : -measured;
  if (!state.started) {
    state.previousInput = -measured;
    state.started = true;
  }
  const difference = input - state.previousInput;
  const tf = gains.derivativeFilter;
  state.derivative = tf > 0 ? (tf * state.derivative + difference) / (tf + gains.period) : difference / gains.period;
  state.previousInput = input;
  const requested = gains.gearRatio * (gains.kp * error + gains.ki * state.integral + gains.kd * state.derivative);
  const windingUp = gains.antiWindup && Math.abs(requested) > gains.torqueLimit && error * requested > 0;
  if (!windingUp) state.integral += gains.period * error;
  return requested;
}

/**
 * The sampled controller's output: a zero-order hold of its request, optionally one sample
 * late (the compute delay: a request computed at t_k reaches the drive at t_{k+1}).
 */
export interface SampleHold {
  /** The request the drive acts on until the next sample, N·m at the joint. */
  held: number;
  /** The latest request, waiting out the compute delay, N·m. */
  pending: number;
}

/** A hold before the first sample: no torque requested. */
export function initialSampleHold(): SampleHold {
  return { held: 0, pending: 0 };
}

/** Passes a new request through the hold, in place; `computeDelay` holds the previous one instead. */
export function holdRequest(hold: SampleHold, request: number, computeDelay: boolean): void {
  hold.held = computeDelay ? hold.pending : request;
  hold.pending = request;
}
