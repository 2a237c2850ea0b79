import { type ClosedFormSolution } from '../../shared/closed-form/index';

/**
 * The summary of a closed-form solution that `response --format json` and `check` print.
 * Stable keys other tools read: poles, finalValue, initialValue, metrics, stable.
 */
export function closedFormReport(solution: ClosedFormSolution) {
  return {
    scenario: solution.scenarioName,
    method: 'closed-form' as const,
    poles: solution.poles,
    zeros: solution.zeros,
    dcGain: solution.dcGain,
    stable: solution.stable,
    stability: solution.stability,
    finalValue: solution.finalValue,
    initialValue: {
      angle: solution.initialValue.angle,
      velocity: solution.initialValue.velocity,
      applies: solution.initialValue.applies,
      reason: solution.initialValue.reason,
      before: solution.initialValue.before,
    },
    metrics: solution.metrics,
    metricsBasis: solution.metricsBasis,
    metricsReason: solution.metricsReason,
    dominantPair: solution.dominantPair,
    notes: solution.notes,
  };
}

export type ClosedFormReport = ReturnType<typeof closedFormReport>;
