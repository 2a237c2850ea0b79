import type { InputTerm, Scenario } from '../scenario/scenario-schema';
import type { TwinOptions } from '../twin/twin-run';

/** The outcome of a superposition or shift check, as the CLI and the bench show it. */
export interface CheckVerdict {
  pass: boolean;
  /** Largest deviation found, relative to the peak |angle| of the runs compared (dimensionless). */
  worst: number;
  /** Largest relative deviation that still passes. */
  threshold: number;
  /** When the largest deviation occurs, s (0 when there is none). */
  worstTime: number;
  /** Why it failed, naming the effect and when; or a line saying it holds. */
  reason: string;
}

/** Defaults of the checks; the README quotes these. */
export const CHECK_DEFAULTS = {
  /** Largest deviation relative to the peak that still passes: well above the twin's integration error (≈1e-9 of the peak at its default tolerances), well below anything visible on a plot. */
  threshold: 1e-4,
  /** Output spacing of the check runs, s, unless the twin options set one; long horizons get horizon / maxSamples. */
  dt: 0.001,
  /** Most output samples per check run. */
  maxSamples: 20000,
} as const;

/** Output spacing for a check run over `horizon`, s. */
export function checkDt(horizon: number, options: TwinOptions): number {
  return options.dt ?? Math.max(CHECK_DEFAULTS.dt, horizon / CHECK_DEFAULTS.maxSamples);
}

/** The scenario started from rest (θ(0−) = θ′(0−) = 0) with the given forcing terms. */
export function zeroStateWith(scenario: Scenario, inputs: InputTerm[]): Scenario {
  return { ...scenario, initial: { angle: 0, velocity: 0 }, inputs };
}

/** Terms with every amplitude multiplied by `scale`. */
export function scaleTerms(terms: readonly InputTerm[], scale: number): InputTerm[] {
  return terms.map((term) => ({ ...term, amplitude: term.amplitude * scale }));
}

/** Terms started `shift` seconds later. */
export function delayTerms(terms: readonly InputTerm[], shift: number): InputTerm[] {
  return terms.map((term) => ({ ...term, delay: term.delay + shift }));
}

/** A relative deviation as a short number for messages. */
export function formatRatio(value: number): string {
  return value === 0 ? '0' : value.toExponential(2);
}
