import { invertScenario } from '../closed-form/inverse-response';
import { jointTransfer } from '../closed-form/joint-transfer';
import { clusterPoles, type PoleCluster } from '../closed-form/pole-clusters';
import { polynomialRoots } from '../closed-form/polynomial-roots';
import { stabilityOf } from '../closed-form/solve-closed-form';
import { DEFAULT_SETTLING_BAND, stepMetrics } from '../closed-form/step-metrics';
import { finalValue, referenceFinalValue, steadyStateErrorOf } from '../closed-form/value-theorems';
import type { Scenario } from '../scenario/scenario-schema';
import { describeFieldErrors } from '../validation/field-errors';
import type { CellMetrics } from './cell-metrics';

/**
 * One cell by the closed form: the parts of solveClosedForm a map needs (inversion, final values,
 * step metrics on the 2 % band) without its terms, LaTeX and evaluator, so a 100 × 100 map stays
 * within a second or so. The metrics are the closed form's own (stepMetrics), not a copy.
 */
export function closedFormCell(scenario: Scenario): { metrics: CellMetrics; reason: string | null } {
  const inverted = invertScenario(scenario);
  if (!inverted.ok) {
    // An unstable cell over a long horizon overflows the inversion; its poles still say so.
    const poles = loopPolesOf(scenario);
    const why = describeFieldErrors(inverted.errors);
    return { metrics: { ...NO_STEP_METRICS, ...poleMetrics(poles) }, reason: poles ? why : `${why}; the loop's poles could not be found` };
  }
  const { pieces, loopPoles } = inverted.value;
  const steadyStateError = steadyStateErrorOf(finalValue(pieces, loopPoles, scenario), referenceFinalValue(scenario));
  const report = stepMetrics(inverted.value, scenario, steadyStateError, DEFAULT_SETTLING_BAND);
  return {
    metrics: {
      overshootPercent: report.metrics.overshootPercent,
      settlingTime: report.metrics.settlingTime,
      steadyStateError,
      ...poleMetrics(loopPoles),
      superpositionPass: null,
    },
    reason: report.reason,
  };
}

const NO_STEP_METRICS: CellMetrics = { overshootPercent: null, settlingTime: null, steadyStateError: null, slowestPoleReal: null, stable: null, superpositionPass: null };

/** The linear loop's poles (roots of its characteristic polynomial), or null when they cannot be found. */
export function loopPolesOf(scenario: Scenario): PoleCluster[] | null {
  const found = polynomialRoots(jointTransfer(scenario).characteristic);
  return found.ok ? clusterPoles(found.roots) : null;
}

/** slowestPoleReal and stable (marginal counts as not stable) from the loop's poles. */
export function poleMetrics(poles: readonly PoleCluster[] | null): Pick<CellMetrics, 'slowestPoleReal' | 'stable'> {
  if (!poles || poles.length === 0) return { slowestPoleReal: null, stable: poles ? true : null };
  return { slowestPoleReal: Math.max(...poles.map((c) => c.center.re)), stable: stabilityOf(poles) === 'stable' };
}
