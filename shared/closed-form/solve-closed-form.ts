import { parseScenario } from '../scenario/parse-scenario';
import { type Scenario } from '../scenario/scenario-schema';
import { type Parsed } from '../validation/field-errors';
import { resolveClosedFormOptions, type ClosedFormOptions } from './closed-form-options';
import { poleSummary, type ClosedFormSolution, type PoleSummary, type Stability } from './closed-form-solution';
import { invertScenario } from './inverse-response';
import { channelTransferFunctions } from './joint-transfer';
import { polynomialDegree } from './polynomial';
import { polynomialRoots } from './polynomial-roots';
import { clusterPoles, type PoleCluster } from './pole-clusters';
import { poleLocation } from './pole-location';
import { valueAtZero } from './rational-function';
import { compileResponsePlan } from './response-evaluator';
import { responseLatex } from './response-latex';
import { responseTerms } from './response-terms';
import { dominantPair } from './second-order-estimates';
import { stepMetrics } from './step-metrics';
import { finalValue, initialValue, referenceFinalValue, steadyStateErrorOf } from './value-theorems';
import { plantCautions } from '../scenario/plant-cautions';
import { coverageNotes } from './coverage-notes';

/**
 * The closed-form solution of a scenario: validates it (errors as values, naming the field),
 * inverts every input term and the initial state by partial fractions, and reports terms,
 * LaTeX, theorems, metrics, poles, zeros, DC gain, stability and a compiled evaluator.
 * @example
 * const solved = solveClosedForm(JSON.parse(text));
 * if (solved.ok) evaluateClosedForm(solved.value, 0.001, 2); // { ok: true, value: { t, angle, velocity } } on 0, 1 ms, …, 2 s
 */
export function solveClosedForm(input: unknown, options?: ClosedFormOptions): Parsed<ClosedFormSolution> {
  const opts = resolveClosedFormOptions(options);
  if (!opts.ok) return opts;
  const parsed = parseScenario(input);
  if (!parsed.ok) return parsed;
  return solveScenario(parsed.value, opts.value);
}

function solveScenario(scenario: Scenario, options: Required<ClosedFormOptions>): Parsed<ClosedFormSolution> {
  const inverted = invertScenario(scenario);
  if (!inverted.ok) return inverted;
  const { transfer, loopPoles, pieces } = inverted.value;
  const channels = channelTransferFunctions(transfer);
  const openLoop = scenario.controller.mode === 'open-loop';
  const zerosTorque = zerosOf(transfer.angleFromTorque);
  const zerosReference = openLoop ? [] : zerosOf(transfer.angleFromReference);
  if (zerosTorque === null || zerosReference === null) {
    return { ok: false, errors: [{ field: openLoop ? 'joint' : 'controller', message: 'the loop\'s zeros could not be found (ill-conditioned numerator)' }] };
  }
  const terms = responseTerms(pieces, 'angle');
  const velocityTerms = responseTerms(pieces, 'velocity');
  const angleFinal = finalValue(pieces, loopPoles, scenario);
  const referenceFinal = referenceFinalValue(scenario);
  const steadyStateError = steadyStateErrorOf(angleFinal, referenceFinal);
  const report = stepMetrics(inverted.value, scenario, steadyStateError, options.settlingBand);
  const notes: string[] = [...plantCautions(scenario), ...coverageNotes(scenario)];
  return {
    ok: true,
    value: {
      scenarioName: scenario.name,
      notes,
      poles: loopPoles.map((c) => poleSummary(c.center, c.multiplicity)),
      zeros: { reference: openLoop ? null : zerosReference, torque: zerosTorque },
      dcGain: {
        reference: openLoop ? null : valueAtZero(channels.reference.angle),
        torque: valueAtZero(channels.torque.angle),
      },
      stable: stabilityOf(loopPoles) === 'stable',
      stability: stabilityOf(loopPoles),
      characteristic: transfer.characteristic,
      transferFunctions: { reference: openLoop ? null : channels.reference, torque: channels.torque },
      terms,
      velocityTerms,
      latex: { angle: responseLatex(terms, '\\theta(t)'), velocity: responseLatex(velocityTerms, '\\dot{\\theta}(t)') },
      finalValue: angleFinal,
      initialValue: initialValue(pieces, scenario),
      metrics: report.metrics,
      metricsBasis: report.basis,
      metricsReason: report.reason,
      dominantPair: dominantPair(loopPoles, options.settlingBand),
      plan: compileResponsePlan(pieces),
    },
  };
}

function zerosOf(num: readonly number[]): PoleSummary[] | null {
  if (polynomialDegree(num) <= 0) return [];
  const roots = polynomialRoots(num);
  if (!roots.ok) return null;
  return clusterPoles(roots.roots).map((c) => poleSummary(c.center, c.multiplicity));
}

/** Stable when every loop pole is left of the axis; marginal with simple poles on it; else unstable. */
export function stabilityOf(poles: readonly PoleCluster[]): Stability {
  const where = poles.map((c) => poleLocation(c.center));
  if (where.includes('right')) return 'unstable';
  // A repeated pole on the axis grows like t^(m−1): unstable, not merely marginal.
  if (poles.some((c) => poleLocation(c.center) === 'axis' && c.multiplicity > 1)) return 'unstable';
  return where.includes('axis') ? 'marginal' : 'stable';
}
