import type { TwinSettings } from './twin-settings';

/**
 * The runaway bounds of a twin run on angle and velocity (TWIN_DEFAULTS documents the values).
 * A non-finite state counts as out of bounds, so a run stops with a message instead of filling
 * its trace with NaN.
 */

/** The settings the bounds read. */
export type BoundSettings = Pick<TwinSettings, 'angleBound' | 'velocityBound'>;

/**
 * Whether a state has left the bounds.
 * @param angle rad
 * @param velocity rad/s
 */
export function outOfBounds(settings: BoundSettings, angle: number, velocity: number): boolean {
  return !Number.isFinite(angle) || !Number.isFinite(velocity) || Math.abs(angle) > settings.angleBound || Math.abs(velocity) > settings.velocityBound;
}

/** The run's stop message for a state outside the bounds at t, naming the bound it left. */
export function boundMessage(settings: BoundSettings, angle: number, t: number): string {
  return Math.abs(angle) > settings.angleBound || !Number.isFinite(angle)
    ? `angle left ±${settings.angleBound} rad at t = ${t.toFixed(4)} s: the scenario runs away (unstable loop or unbounded forcing)`
    : `velocity left ±${settings.velocityBound} rad/s at t = ${t.toFixed(4)} s: the scenario runs away (unstable loop or unbounded forcing)`;
}
