import type { ClosedFormSolution } from '@kinetwin/shared/closed-form/index';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { FieldError, Parsed } from '@kinetwin/shared/validation/field-errors';
import type { ClosedFormEngine } from './closed-form-engine';

/** Intervals of the closed-form trace over the horizon (4001 points: smooth, cheap for Plotly). */
export const CLOSED_FORM_TRACE_INTERVALS = 4000;

/** The closed-form angle drawn on the chart: t in s, angle in rad, parallel arrays. */
export interface ClosedFormTrace {
  t: Float64Array;
  angle: Float64Array;
}

/** What the bench's closed-form panel and chart show for the current (possibly edited) scenario. */
export type ClosedFormView =
  | { kind: 'loading' }
  | { kind: 'invalid'; errors: FieldError[] }
  | { kind: 'failed'; message: string }
  | { kind: 'solved'; scenario: Scenario; solution: ClosedFormSolution; trace: ClosedFormTrace };

/**
 * Solves the scenario with the engine and samples its angle for the chart. Never throws: an
 * invalid scenario gives its field errors, an engine failure or a non-finite sample a message.
 */
export function closedFormView(engine: ClosedFormEngine | null, scenario: Parsed<Scenario>): ClosedFormView {
  if (!scenario.ok) return { kind: 'invalid', errors: scenario.errors };
  if (!engine) return { kind: 'loading' };
  try {
    const solved = engine.solveClosedForm(scenario.value);
    if (!solved.ok) return { kind: 'invalid', errors: solved.errors };
    const horizon = scenario.value.horizon;
    const evaluated = engine.evaluateClosedForm(solved.value, horizon / CLOSED_FORM_TRACE_INTERVALS, horizon);
    if (!evaluated.ok) return { kind: 'failed', message: `The closed form could not be sampled: ${evaluated.errors.map((error) => error.message).join('; ')}` };
    const sampled = evaluated.value;
    const bad = sampled.angle.findIndex((value) => !Number.isFinite(value));
    if (bad >= 0) return { kind: 'failed', message: `The closed form gave a non-finite angle at t = ${sampled.t[bad]} s, so it is not drawn.` };
    return { kind: 'solved', scenario: scenario.value, solution: solved.value, trace: { t: sampled.t, angle: sampled.angle } };
  } catch (failure) {
    return { kind: 'failed', message: `The closed form could not be computed: ${failure instanceof Error ? failure.message : String(failure)}` };
  }
}
