/**
 * The continuous PID law of the twin and its anti-windup regime (the sampled law is in
 * sampled-pid.ts). With e = r − θ and x = e (derivative on error) or −θ (on measurement):
 *   u = N·(kp·e + ki·I + kd·D),  D = x′, or with the filter Tf: D = (x − F)/Tf, F′ = (x − F)/Tf.
 *
 * Clamping (Åström & Hägglund, Advanced PID Control, §3.5, from memory) freezes I while the
 * request is beyond the torque limit L and the error pushes it further out. As a switch inside
 * the right-hand side that rule chatters on |u| = L: releasing I pushes u out, freezing it pulls
 * u in. Its solution there is Filippov's sliding motion (Filippov, Differential Equations with
 * Discontinuous Righthand Sides, 1988, §2.4, from memory; Utkin's equivalent control): I moves
 * at α·e, α ∈ [0, 1] chosen so that u′ = 0, and the request stays on the limit. So the
 * integrator is in one of three regimes, switched only at located events, like the friction's
 * stick and slip:
 *   integrating  I′ = e        until |u| rises through L with e·u > 0, or e·u turns positive beyond L;
 *   frozen       I′ = 0        until s·u falls to L, or s·e turns negative (s = side of the limit);
 *   sliding      I′ = α·e      with u = s·L held, until α leaves [0, 1] or s·e turns negative.
 * On e·u = 0 the two integral rates agree (e = 0), so that part of the boundary cannot chatter;
 * the regime changes there only to keep the rule's bookkeeping exact.
 */

/** The continuous controller's constants, as the twin resolves them from the scenario. */
export interface ContinuousPidGains {
  kp: number;
  ki: number;
  kd: number;
  /** Derivative filter time constant Tf, s (0: unfiltered). */
  derivativeFilter: number;
  derivativeOnError: boolean;
  /** Gear ratio N: the request is the torque at the joint. */
  gearRatio: number;
  /** Symmetric drive limit at the joint, N·m (Infinity: none). */
  torqueLimit: number;
  antiWindup: boolean;
}

/** How the integral moves; see the file comment. */
export type IntegratorMode = 'integrating' | 'frozen' | 'sliding';

/** The integrator's regime; `side` is the limit (+1 or −1) a frozen or sliding integrator is at. */
export interface IntegratorRegime {
  mode: IntegratorMode;
  side: 1 | -1;
}

/**
 * Relative width of "on the limit" when a regime is chosen, against the size of the request's
 * terms: a located crossing leaves |u| − L at roundoff of those terms, far inside it.
 */
export const ON_LIMIT_TOLERANCE = 1e-9;

/** Whether the anti-windup regime can leave "integrating" at all. */
export function hasWindupRegimes(gains: ContinuousPidGains): boolean {
  return gains.antiWindup && gains.torqueLimit !== Infinity && gains.ki !== 0;
}

/**
 * The request N·(kp·e + ki·I + kd·D), N·m.
 * @example pidRequest(gains, 0.5, 0, 0) // N·kp·0.5
 */
export function pidRequest(g: ContinuousPidGains, error: number, integral: number, derivative: number): number {
  return g.gearRatio * (g.kp * error + (g.ki !== 0 ? g.ki * integral : 0) + g.kd * derivative);
}

/**
 * du/dt with the integral frozen, N·m/s: N·(kp·e′ + kd·D′).
 * @param errorRate e′ = r′ − θ′, rad/s
 * @param derivativeRate D′: (x′ − D)/Tf with the filter, else x″, rad/s²
 */
export function frozenRequestRate(g: ContinuousPidGains, errorRate: number, derivativeRate: number): number {
  return g.gearRatio * (g.kp * errorRate + g.kd * derivativeRate);
}

/**
 * The integral rate that holds u′ = 0: −(frozen request rate)/(N·ki), rad. Sliding uses it while
 * it lies between 0 and e (α = rate/e ∈ [0, 1]).
 */
export function slidingIntegralRate(g: ContinuousPidGains, frozenRate: number): number {
  return -frozenRate / (g.gearRatio * g.ki);
}

/**
 * The integral that puts the request exactly on side·L, rad·s: a sliding regime starts (and
 * resumes after each restart) from it, as a slide ends at exactly zero velocity.
 */
export function integralOnLimit(g: ContinuousPidGains, side: 1 | -1, error: number, derivative: number): number {
  return ((side * g.torqueLimit) / g.gearRatio - g.kp * error - g.kd * derivative) / g.ki;
}

/** I′ in a regime; `slidingRate` is only read while sliding. */
export function integralRate(regime: IntegratorRegime, error: number, slidingRate: number): number {
  return regime.mode === 'integrating' ? error : regime.mode === 'frozen' ? 0 : slidingRate;
}

/**
 * The regime's event function: positive once the regime no longer holds. Its terms mix units
 * (N·m, rad, rad²) because only its sign is used, by the scan and the bisection.
 * @param requested u, N·m
 * @param slidingRate the rate slidingIntegralRate gives at this state (read only while sliding)
 */
export function integratorEvent(g: ContinuousPidGains, regime: IntegratorRegime, requested: number, error: number, slidingRate: number): number {
  const s = regime.side;
  switch (regime.mode) {
    case 'integrating':
      return Math.min(Math.abs(requested) - g.torqueLimit, error * requested);
    case 'frozen':
      return Math.max(g.torqueLimit - s * requested, -s * error);
    case 'sliding': {
      // α·e² = rate·e must stay within [0, e²].
      const q = slidingRate * error;
      return Math.max(-q, q - error * error, -s * error);
    }
  }
}

/** Whether u is on its limit, against the size of its terms (see ON_LIMIT_TOLERANCE). */
export function onLimit(g: ContinuousPidGains, error: number, integral: number, derivative: number): boolean {
  const u = pidRequest(g, error, integral, derivative);
  const scale = g.torqueLimit + g.gearRatio * (Math.abs(g.kp * error) + Math.abs(g.ki * integral) + Math.abs(g.kd * derivative));
  return Math.abs(Math.abs(u) - g.torqueLimit) <= ON_LIMIT_TOLERANCE * scale;
}

/**
 * The regime a state is in. On the limit the flow decides (Filippov): frozen when even a frozen
 * integrator leaves the limit outward (rate·e < 0, α < 0), integrating when even a running one
 * leaves it inward (rate·e > e², α > 1), else sliding. Off the limit the clamping rule decides.
 * The comparisons are those of integratorEvent, so a chosen regime's event is not positive.
 * @param slidingRate slidingIntegralRate at this state with the drive at the limit (read only on the limit)
 */
export function chooseIntegratorRegime(g: ContinuousPidGains, requested: number, error: number, slidingRate: number, limitReached: boolean): IntegratorRegime {
  const side: 1 | -1 = requested >= 0 ? 1 : -1;
  if (!(side * error > 0)) return { mode: 'integrating', side };
  if (limitReached) {
    const q = slidingRate * error;
    if (-q > 0) return { mode: 'frozen', side };
    if (q - error * error > 0) return { mode: 'integrating', side };
    return { mode: 'sliding', side };
  }
  return { mode: side * requested > g.torqueLimit ? 'frozen' : 'integrating', side };
}
