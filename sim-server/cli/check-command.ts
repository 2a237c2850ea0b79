import { type Scenario } from '../../shared/scenario/scenario-schema';
import { closedFormReport } from './closed-form-report';
import { checkLimits } from './limits-check';
import { type SolvedScenario } from './response-sources';

/** Printed with every check: gains that pass here still leave the tool for real hardware. */
export const SAFETY_NOTICE =
  'A simulation is not a safety validation: limit torque and speed on first hardware runs, keep an emergency stop in reach, and follow ISO 10218, local codes and licensed practice.';

/** Exit codes of the kinetwin command. */
export const EXIT_OK = 0;
export const EXIT_LIMITS_NOT_MET = 1;
export const EXIT_INVALID_INPUT = 2;

/**
 * The JSON document and exit code of `kinetwin check`: 1 when any of the scenario's limits is
 * not met, 0 otherwise.
 */
export function checkReport(scenario: Scenario, solved: SolvedScenario): { document: object; exitCode: number } {
  const limits = checkLimits(scenario.limits, solved.closedForm.metrics, solved.closedForm.metricsReason);
  const passed = limits.every((l) => l.met);
  return {
    document: { ...closedFormReport(solved.closedForm), limits, passed, safety: SAFETY_NOTICE },
    exitCode: passed ? EXIT_OK : EXIT_LIMITS_NOT_MET,
  };
}
