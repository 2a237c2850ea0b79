import {
  chooseIntegratorRegime,
  frozenRequestRate,
  integralOnLimit,
  integratorEvent,
  onLimit,
  pidRequest,
  slidingIntegralRate,
  type ContinuousPidGains,
} from './continuous-pid';
import { ANGLE, FILTER, INTEGRAL, VELOCITY, type TwinRunState } from './twin-run-state';

/** θ′ and θ″ of the joint under a drive request, in its friction regime as it stands, into `into`. */
export type JointRates = (state: readonly number[], t: number, requested: number, into: number[]) => void;

/**
 * The continuous PID of a run with its anti-windup regime (continuous-pid.ts holds the rule): the
 * request, the derivative term, the sliding motion's integral rate, and the regime's choice at a
 * stop and its event function, all against the run's state object.
 */
export interface ContinuousLoop {
  /** The controller's D: filtered, or x′ itself. */
  derivativeOf(state: readonly number[], t: number, error: number): number;
  /** The request at the joint before limit and dead band, N·m. */
  request(state: readonly number[], t: number, reference?: number): number;
  /**
   * The integral rate that keeps the request on the limit, from θ′ and θ″ with the drive at it:
   * u′ = N·(kp·e′ + ki·I′ + kd·D′) = 0.
   */
  slidingRate(state: readonly number[], t: number, error: number, angleRate: number, acceleration: number): number;
  /** The anti-windup event function at a state: positive once the integrator's regime no longer holds. */
  windupEvent(state: readonly number[], t: number, error: number, requested: number): number;
  /** Puts the request exactly on the limit the integrator slides on (a restart removes the drift). */
  holdOnLimit(): void;
  /** Chooses the regime afresh at the run's time. */
  chooseRegime(): void;
  /**
   * At a stop: where the forcing changed (`forced`) the regime is chosen afresh; elsewhere it
   * holds unless its event function says it ended there.
   */
  reviewRegime(forced: boolean): void;
}

export function createContinuousLoop(gains: ContinuousPidGains, run: TwinRunState, jointRates: JointRates): ContinuousLoop {
  const tf = gains.derivativeFilter;
  const onError = gains.derivativeOnError;
  const limit = gains.torqueLimit;
  const y = run.y;

  const derivativeOf = (state: readonly number[], t: number, error: number): number => {
    if (tf > 0) return ((onError ? error : -state[ANGLE]!) - state[FILTER]!) / tf;
    return onError ? run.stretch.referenceRate(t) - state[VELOCITY]! : -state[VELOCITY]!;
  };

  const request = (state: readonly number[], t: number, reference = run.stretch.reference(t)): number => {
    const error = reference - state[ANGLE]!;
    return pidRequest(gains, error, state[INTEGRAL]!, derivativeOf(state, t, error));
  };

  const slidingRate = (state: readonly number[], t: number, error: number, angleRate: number, acceleration: number): number => {
    const errorRate = run.stretch.referenceRate(t) - angleRate;
    const derivativeRate =
      tf > 0
        ? ((onError ? errorRate : -angleRate) - derivativeOf(state, t, error)) / tf
        : onError
          ? run.stretch.referenceAcceleration(t) - acceleration
          : -acceleration;
    return slidingIntegralRate(gains, frozenRequestRate(gains, errorRate, derivativeRate));
  };

  const probeRates = [0, 0];
  /** slidingRate at any state, with the drive on the limit `side`. */
  const slidingRateAt = (state: readonly number[], t: number, error: number, side: 1 | -1): number => {
    jointRates(state, t, side * limit, probeRates);
    return slidingRate(state, t, error, probeRates[ANGLE]!, probeRates[VELOCITY]!);
  };

  const windupEvent = (state: readonly number[], t: number, error: number, requested: number): number => {
    const rate = run.windup.mode === 'sliding' ? slidingRateAt(state, t, error, run.windup.side) : 0;
    return integratorEvent(gains, run.windup, requested, error, rate);
  };

  const holdOnLimit = () => {
    const error = run.stretch.reference(run.time) - y[ANGLE]!;
    y[INTEGRAL] = integralOnLimit(gains, run.windup.side, error, derivativeOf(y, run.time, error));
  };

  const chooseRegime = () => {
    const error = run.stretch.reference(run.time) - y[ANGLE]!;
    const derivative = derivativeOf(y, run.time, error);
    const requested = pidRequest(gains, error, y[INTEGRAL]!, derivative);
    const reached = onLimit(gains, error, y[INTEGRAL]!, derivative);
    const rate = reached ? slidingRateAt(y, run.time, error, requested >= 0 ? 1 : -1) : 0;
    const next = chooseIntegratorRegime(gains, requested, error, rate, reached);
    if (next.mode !== run.windup.mode || (next.mode !== 'integrating' && next.side !== run.windup.side)) run.windupSwitches++;
    run.windup = next;
    if (run.windup.mode === 'sliding') holdOnLimit();
  };

  const reviewRegime = (forced: boolean) => {
    if (forced) return chooseRegime();
    const error = run.stretch.reference(run.time) - y[ANGLE]!;
    if (windupEvent(y, run.time, error, request(y, run.time)) > 0) chooseRegime();
  };

  return { derivativeOf, request, slidingRate, windupEvent, holdOnLimit, chooseRegime, reviewRegime };
}
