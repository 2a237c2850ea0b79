import type { TwinSettings } from './twin-settings';

/**
 * The twin's work budget (TWIN_DEFAULTS.workBase documents its sizing). Paced by simulated time
 * and samples rather than totalled, so a scenario that grinds stops early instead of at its
 * horizon; counted in right-hand-side and event-function evaluations because those are what a
 * stiff or chattering scenario multiplies.
 */

/** The settings the budget reads. */
export type WorkSettings = Pick<TwinSettings, 'workBase' | 'workPerSecond' | 'workPerSample'>;

/** The budget's part of a run's state. */
export interface WorkSpent {
  /** Right-hand-side and event-function evaluations so far. */
  evaluations: number;
}

/**
 * Evaluations a run may have spent by simulated time t.
 * @param samples output and controller samples reached
 */
export function workAllowance(settings: WorkSettings, t: number, samples: number): number {
  return settings.workBase + settings.workPerSecond * t + settings.workPerSample * samples;
}

/** The run's stop message once `evaluations` passed the allowance at t. */
export function workMessage(settings: WorkSettings, evaluations: number, t: number): string {
  return `work budget: ${evaluations.toExponential(2).replace('e+', 'e')} evaluations by t = ${t.toFixed(4)} s, over the twin's allowance of ${settings.workBase} + ${settings.workPerSecond} per simulated second + ${settings.workPerSample} per sample; the scenario is too stiff, or switches friction too often, for the twin to follow (check the gains against the inertia)`;
}
