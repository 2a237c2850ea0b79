import { checkDt, scaleTerms } from '../checks/check-verdict';
import { closedFormAngle } from '../checks/closed-form-angle';
import { LINEAR_RANGE_DEFAULTS } from '../checks/linear-range';
import { searchScale } from '../checks/scale-search';
import { compareWithClosedForm } from '../checks/twin-vs-closed-form';
import { solveClosedForm } from '../closed-form';
import type { Scenario } from '../scenario/scenario-schema';
import type { Parsed } from '../validation/field-errors';
import { simulateTwin } from '../twin/twin-run';
import type { LinearizedJoint } from './operating-point';

export interface OperatingRangeOptions {
  /** Largest |twin − linear closed form| relative to the linear response's peak that still agrees, e.g. 0.01. */
  tolerance: number;
  minScale?: number;
  maxScale?: number;
}

export interface OperatingRange {
  /** Largest scale of the moves at which the two agree, or null when none tried does. */
  scale: number | null;
  /** Smallest agreeing scale when small moves disagree and large ones agree (friction); else null. */
  smallestScale: number | null;
  /** Peak |δ| of the linear model's response at `scale`, rad: the largest move that agrees. */
  largestMove: number | null;
  checks: number;
  summary: string;
}

interface Agreement {
  pass: boolean;
  reason: string;
  peak: number;
}

/**
 * How far the linear model about θ0 holds: the largest scale of the scenario's moves at which
 * the nonlinear twin about θ0 and the linear model's closed form agree within `tolerance` of the
 * peak, by the same bisection on log scale as the linear range (shared/checks/scale-search.ts).
 */
export function operatingRange(pair: LinearizedJoint, options: OperatingRangeOptions): Parsed<OperatingRange> {
  const { tolerance } = options;
  if (!(Number.isFinite(tolerance) && tolerance > 0 && tolerance < 1)) return { ok: false, errors: [{ field: 'tolerance', message: 'must be a fraction between 0 and 1, e.g. 0.01 for 1 %' }] };
  if (pair.moves.length === 0) return { ok: false, errors: [{ field: 'inputs', message: 'the scenario has no inputs: there is no move to grow' }] };
  const holdingOf = (s: Scenario) => s.inputs.slice(pair.moves.length);
  const scaled = (s: Scenario, scale: number): Scenario => ({ ...s, inputs: [...scaleTerms(pair.moves, scale), ...holdingOf(s)] });
  const dt = checkDt(pair.linear.horizon, {});
  let unsolvable: string | null = null;
  const agreeAt = (scale: number): Agreement => {
    const solved = solveClosedForm(scaled(pair.linear, scale));
    if (!solved.ok) {
      unsolvable = solved.errors[0]?.message ?? 'the linear model has no closed form';
      return { pass: false, reason: unsolvable, peak: 0 };
    }
    const twin = simulateTwin(scaled(pair.nonlinear, scale), { dt });
    if (twin.stop) return { pass: false, reason: `the twin stopped: ${twin.stop.message}`, peak: 0 };
    const r = compareWithClosedForm(twin.samples, closedFormAngle(solved.value));
    const pass = r.relativeMaxError <= tolerance;
    const percent = (x: number) => `${+(x * 100).toPrecision(3)} %`;
    return { pass, reason: pass ? 'agree' : `they differ by ${percent(r.relativeMaxError)} of the peak at t = ${r.timeOfMaxError.toFixed(3)} s`, peak: r.peak };
  };
  const minScale = options.minScale ?? LINEAR_RANGE_DEFAULTS.minScale;
  const maxScale = options.maxScale ?? LINEAR_RANGE_DEFAULTS.maxScale;
  const found = searchScale(agreeAt, { minScale, maxScale, relativeWidth: LINEAR_RANGE_DEFAULTS.relativeWidth, maxIterations: LINEAR_RANGE_DEFAULTS.maxIterations });
  if (unsolvable !== null) return { ok: false, errors: [{ field: '', message: unsolvable }] };
  const move = (scale: number) => +agreeAt(scale).peak.toPrecision(3);
  const within = `within ${+(tolerance * 100).toPrecision(3)} % of the peak`;
  switch (found.kind) {
    case 'everywhere':
      return { ok: true, value: { scale: maxScale, smallestScale: null, largestMove: move(maxScale), checks: found.checks, summary: `the linear model agrees with the twin ${within} for every move tried, up to ${move(maxScale)} rad` } };
    case 'nowhere':
      return { ok: true, value: { scale: null, smallestScale: null, largestMove: null, checks: found.checks, summary: `the linear model does not agree with the twin ${within} for any move tried: at the smallest, ${found.failure.reason}` } };
    case 'from':
      return { ok: true, value: { scale: maxScale, smallestScale: found.good, largestMove: move(maxScale), checks: found.checks, summary: `small moves disagree (at ×${+found.bad.toPrecision(3)}: ${found.failure.reason}); from ×${+found.good.toPrecision(3)} up the linear model agrees ${within}` } };
    case 'up-to': {
      const largest = move(found.good);
      return { ok: true, value: { scale: found.good, smallestScale: null, largestMove: largest, checks: found.checks, summary: `the linear model agrees with the twin ${within} for moves up to ${largest} rad (×${+found.good.toPrecision(3)}); at ×${+found.bad.toPrecision(3)} ${found.failure.reason}` } };
    }
  }
}
