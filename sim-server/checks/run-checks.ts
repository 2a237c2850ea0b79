import { performance } from 'node:perf_hooks';
import { checkDt, type CheckVerdict } from '../../shared/checks/check-verdict';
import { twinAgainstClosedForm } from '../../shared/checks/closed-form-angle';
import { LINEAR_RANGE_DEFAULTS, linearRange, type LinearRangeResult } from '../../shared/checks/linear-range';
import { shiftCheck } from '../../shared/checks/shift-check';
import { superpositionCheck } from '../../shared/checks/superposition-check';
import type { CheckResponse, CheckVerdictBody, ClosedFormResidualBody, LinearRangeBody } from '../../shared/protocol/check-api';
import type { Scenario } from '../../shared/scenario/scenario-schema';
import { describeFieldErrors } from '../../shared/validation/field-errors';

/** A verdict with an infinite deviation sent as null; the reason already says which run stopped. */
export function verdictBody(check: CheckVerdict): CheckVerdictBody {
  return {
    pass: check.pass,
    worst: Number.isFinite(check.worst) ? check.worst : null,
    threshold: check.threshold,
    worstTime: check.worstTime,
    reason: check.reason,
  };
}

/** The linear range's figures the bench shows, with the range the search tried. */
export function linearRangeBody(range: LinearRangeResult): LinearRangeBody {
  return {
    scale: range.scale,
    smallestScale: range.smallestScale,
    passesAtMax: range.passesAtMax,
    summary: range.summary,
    triedScales: [LINEAR_RANGE_DEFAULTS.minScale, LINEAR_RANGE_DEFAULTS.maxScale],
  };
}

/**
 * Twin against the closed form of the same scenario, or why they cannot be compared: the closed
 * form refuses the scenario, or it overflows on the twin's grid (compareWithClosedForm throws a
 * RangeError rather than report a figure built on a non-finite value).
 */
export function closedFormResidualBody(scenario: Scenario): ClosedFormResidualBody {
  let compared: ReturnType<typeof twinAgainstClosedForm>;
  try {
    // The checks' output spacing: 1 ms, coarser on long horizons so one run holds at most 20 000 samples.
    compared = twinAgainstClosedForm(scenario, { dt: checkDt(scenario.horizon, {}) });
  } catch (err) {
    if (err instanceof RangeError) return { available: false, reason: `the closed form cannot be compared with the twin: ${err.message}` };
    throw err;
  }
  if (!compared.ok) return { available: false, reason: `the scenario has no closed form: ${describeFieldErrors(compared.errors)}` };
  const r = compared.value;
  return {
    available: true,
    rms: r.rms,
    max: r.maxError,
    timeOfMax: r.timeOfMaxError,
    relativeMax: Number.isFinite(r.relativeMaxError) ? r.relativeMaxError : null,
    twinStop: r.twinStop,
  };
}

/**
 * Every check of one scenario with its default settings, as the checks API answers: the
 * superposition check, the shift check, the linear range and the twin against the closed form.
 * Batch work (dozens of twin runs): the server calls it in a worker thread only.
 * @example runChecks(scenario).superposition.pass // true with every nonlinear effect off
 */
export function runChecks(scenario: Scenario): CheckResponse {
  const started = performance.now();
  const superposition = verdictBody(superpositionCheck(scenario));
  const shift = verdictBody(shiftCheck(scenario));
  const range = linearRangeBody(linearRange(scenario));
  const twinVsClosedForm = closedFormResidualBody(scenario);
  return { superposition, shift, linearRange: range, twinVsClosedForm, elapsedMs: Math.round((performance.now() - started) * 10) / 10 };
}
