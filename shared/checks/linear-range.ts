import type { Scenario } from '../scenario/scenario-schema';
import type { TwinOptions } from '../twin/twin-run';
import { CHECK_DEFAULTS, delayTerms, scaleTerms } from './check-verdict';
import { searchScale } from './scale-search';
import { SUPERPOSITION_DEFAULTS, superpositionCheck, type SuperpositionResult } from './superposition-check';

/** Defaults of the linear-range search; the README quotes these. */
export const LINEAR_RANGE_DEFAULTS = {
  /** Smallest input scale tried (× the scenario's amplitudes). */
  minScale: 1e-3,
  /** Largest input scale tried. */
  maxScale: 1e3,
  /** The search stops when the bracket's upper end is within this factor of its lower end (1 %). */
  relativeWidth: 0.01,
  /** Bisection cap; log2(log(1e6)/log(1.01)) ≈ 10.4 halvings suffice for the default range. */
  maxIterations: 60,
} as const;

/** Search range and the superposition settings used at each scale; every field has a default. */
export interface LinearRangeOptions {
  minScale?: number;
  maxScale?: number;
  relativeWidth?: number;
  threshold?: number;
  alpha?: number;
  twin?: TwinOptions;
}

/** Where superposition holds along the input scale, and why it stops. */
export interface LinearRangeResult {
  /** Largest input scale found to pass, or null when no scale tried passes. */
  scale: number | null;
  /**
   * Smallest passing scale when small inputs fail and large ones pass (bounded effects such as
   * friction or a dead band dominate small moves and fade relative to large ones); else null.
   */
  smallestScale: number | null;
  /** [last passing, first failing] scale; hi is null when maxScale passes. */
  bracket: [number | null, number | null];
  /** True when every scale up to maxScale passes (the range may reach further). */
  passesAtMax: boolean;
  /** Superposition checks run. */
  checks: number;
  /** The check at the first failing scale found (why linearity ends there), or null. */
  failure: SuperpositionResult | null;
  /** One line for the CLI and the bench. */
  summary: string;
}

/**
 * Linear range: the largest scale s of the scenario's inputs at which the superposition check
 * still passes, by bisection on log s between minScale and maxScale. It assumes one crossing:
 * linear below and not above (saturation), or the reverse (friction, a dead band: bounded
 * torques that dominate small moves), reported as smallestScale. Effects that act at every
 * amplitude (gravity off its rest point) fail at both ends.
 * @example linearRange(scenarioWithTorqueLimit).scale // e.g. 0.62: inputs up to 62 % stay linear
 */
export function linearRange(scenario: Scenario, options: LinearRangeOptions = {}): LinearRangeResult {
  const minScale = options.minScale ?? LINEAR_RANGE_DEFAULTS.minScale;
  const maxScale = options.maxScale ?? LINEAR_RANGE_DEFAULTS.maxScale;
  const u1 = scenario.inputs;
  const u2 = delayTerms(u1, scenario.horizon * SUPERPOSITION_DEFAULTS.secondInputDelayFraction);
  const found = searchScale(
    (scale) =>
      superpositionCheck(scenario, {
        u1: scaleTerms(u1, scale),
        u2: scaleTerms(u2, scale),
        threshold: options.threshold ?? CHECK_DEFAULTS.threshold,
        alpha: options.alpha,
        twin: options.twin,
      }),
    { minScale, maxScale, relativeWidth: options.relativeWidth ?? LINEAR_RANGE_DEFAULTS.relativeWidth, maxIterations: LINEAR_RANGE_DEFAULTS.maxIterations },
  );
  const { checks } = found;
  switch (found.kind) {
    case 'everywhere':
      return { scale: maxScale, smallestScale: null, bracket: [maxScale, null], passesAtMax: true, checks, failure: null, summary: `superposition holds at every end of the range tried, ${minScale} to ${maxScale}` };
    case 'nowhere':
      return { scale: null, smallestScale: null, bracket: [null, minScale], passesAtMax: false, checks, failure: found.failure, summary: `superposition fails at both ends of the range tried (${minScale} and ${maxScale}): ${found.failure.reason}` };
    case 'from': {
      const [g, b] = [+found.good.toPrecision(3), +found.bad.toPrecision(3)];
      return {
        scale: maxScale,
        smallestScale: found.good,
        bracket: [found.good, null],
        passesAtMax: true,
        checks,
        failure: found.failure,
        summary: `superposition fails below input scale ${g} (at ${b}: ${found.failure.reason}) and holds from there up to ${maxScale}: a bounded effect dominates small moves`,
      };
    }
    case 'up-to': {
      const [g, b] = [+found.good.toPrecision(3), +found.bad.toPrecision(3)];
      return {
        scale: found.good,
        smallestScale: null,
        bracket: [found.good, found.bad],
        passesAtMax: false,
        checks,
        failure: found.failure,
        summary: `superposition holds up to input scale ${g} (fails at ${b}: ${found.failure.reason})`,
      };
    }
  }
}
