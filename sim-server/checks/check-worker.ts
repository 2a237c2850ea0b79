import type { CheckResponse } from '../../shared/protocol/check-api';
import type { Scenario } from '../../shared/scenario/scenario-schema';
import { runChecks } from './run-checks';

/**
 * The worker thread's task (piscina calls the default export): every check of one scenario the
 * route has already parsed, answered as plain, structured-clonable data.
 */
export default function checkScenario(scenario: Scenario): CheckResponse {
  return runChecks(scenario);
}
