import type { CheckVerdict } from '../../shared/checks/check-verdict';
import { linearRange } from '../../shared/checks/linear-range';
import { shiftCheck } from '../../shared/checks/shift-check';
import { superpositionCheck } from '../../shared/checks/superposition-check';
import { SAFETY_CAUTION } from '../../shared/protocol/library-api';
import { type Scenario } from '../../shared/scenario/scenario-schema';
import { closedFormReport } from './closed-form-report';
import { checkLimits } from './limits-check';
import { type SolvedScenario } from './response-sources';

/** Printed with every check: gains that pass here still leave the tool for real hardware (the one caution text). */
export const SAFETY_NOTICE = SAFETY_CAUTION;

/** Exit codes of the kinetwin command. */
export const EXIT_OK = 0;
export const EXIT_LIMITS_NOT_MET = 1;
export const EXIT_INVALID_INPUT = 2;
/** The twin stopped at a bound before the horizon (the samples up to there are printed), or a measured frequency has no figure. */
export const EXIT_TWIN_STOPPED = 3;

/**
 * The JSON document and exit code of `kinetwin check`: 1 when any of the scenario's limits is
 * not met, 0 otherwise.
 */
export function checkReport(scenario: Scenario, solved: SolvedScenario): { document: object; exitCode: number } {
  const closedForm = solved.closedForm!;
  const limits = checkLimits(scenario.limits, closedForm.metrics, closedForm.metricsReason);
  const passed = limits.every((l) => l.met);
  // The twin's checks say how far the closed form can be trusted; they inform, the limits decide.
  const superposition = superpositionCheck(scenario);
  const shift = shiftCheck(scenario);
  const range = linearRange(scenario);
  return {
    document: {
      ...closedFormReport(closedForm),
      limits,
      passed,
      superposition: verdict(superposition),
      shift: verdict(shift),
      linearRange: range.scale,
      linearRangeDetail: { smallestScale: range.smallestScale, passesAtMax: range.passesAtMax, summary: range.summary },
      safety: SAFETY_NOTICE,
    },
    exitCode: passed ? EXIT_OK : EXIT_LIMITS_NOT_MET,
  };
}

/** The four stable keys of a check; an infinite deviation (a run hit a bound) prints as null. */
function verdict(check: CheckVerdict) {
  return { pass: check.pass, worst: Number.isFinite(check.worst) ? check.worst : null, threshold: check.threshold, reason: check.reason };
}
