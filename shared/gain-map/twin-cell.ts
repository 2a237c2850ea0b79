import { checkDt, zeroStateWith } from '../checks/check-verdict';
import { superpositionCheck } from '../checks/superposition-check';
import { DEFAULT_SETTLING_BAND, firstReferenceStepIndex } from '../closed-form/step-metrics';
import { referenceFinalValue } from '../closed-form/value-theorems';
import type { Scenario } from '../scenario/scenario-schema';
import { simulateTwin, type TwinOptions, type TwinStop } from '../twin/twin-run';
import type { CellMetrics } from './cell-metrics';
import { loopPolesOf, poleMetrics } from './closed-form-cell';
import { SETTLED_TAIL_FRACTION, traceHoldsFrom, traceStepMetrics } from './trace-step-metrics';

/**
 * One cell by the twin, with the scenario's nonlinear effects. Runs (all on checkDt's grid):
 * - the first reference step alone from rest, as the closed form measures it: overshoot and
 *   settling time (traceStepMetrics);
 * - the whole scenario (the same run when the scenario is that step from rest): the steady-state
 *   error r(∞) − θ(horizon), counted only when the angle holds within the settling band (of the
 *   step's final value) over the last fifth of the run;
 * - the superposition check's four runs (superpositionCheck with default options).
 * stable: true when both runs reached the horizon within the twin's bounds and the step settled;
 * false when a run hit a bound (a runaway); null when neither (not settled by the horizon).
 * slowestPoleReal is the linear loop's: a trace has no poles.
 */
export function twinCell(scenario: Scenario): { metrics: CellMetrics; reason: string | null } {
  const twin: TwinOptions = { dt: checkDt(scenario.horizon, {}) };
  const { slowestPoleReal } = poleMetrics(loopPolesOf(scenario));
  const stepIndex = firstReferenceStepIndex(scenario.inputs);
  if (stepIndex === null) {
    const superpositionPass = superpositionCheck(scenario, { twin }).pass;
    const metrics = { overshootPercent: null, settlingTime: null, steadyStateError: null, slowestPoleReal, stable: null, superpositionPass };
    return { metrics, reason: 'no reference step in the scenario: the twin\'s overshoot, settling, steady-state error and stability are read off a step' };
  }
  const step = scenario.inputs[stepIndex]!;
  const stepRun = simulateTwin(zeroStateWith(scenario, [step]), twin);
  // The step alone is the superposition check's u1 run when the scenario holds nothing else.
  const onlyStep = scenario.inputs.length === 1;
  const superpositionPass = superpositionCheck(scenario, { twin, ...(onlyStep ? { u1Run: stepRun } : {}) }).pass;
  const base = { overshootPercent: null, settlingTime: null, steadyStateError: null, slowestPoleReal, superpositionPass };
  if (stepRun.stop) return { metrics: { ...base, stable: false }, reason: stopped('step', stepRun.stop) };
  const band = DEFAULT_SETTLING_BAND;
  const m = traceStepMetrics(stepRun.samples.t, stepRun.samples.angle, step.delay, band);
  // Bounded but not shown settled (slow, or hunting on friction): the trace cannot say which.
  if (m.settlingTime === null) return { metrics: { ...base, stable: null }, reason: m.reason };
  const fromRest = scenario.initial.angle === 0 && scenario.initial.velocity === 0 && onlyStep;
  const whole = fromRest ? stepRun : simulateTwin(scenario, twin);
  const metrics: CellMetrics = { ...base, overshootPercent: m.overshootPercent, settlingTime: m.settlingTime, stable: whole.stop === null };
  if (whole.stop) return { metrics, reason: stopped('whole scenario', whole.stop) };
  const reference = referenceFinalValue(scenario);
  if (!reference.applies) return { metrics, reason: `no steady-state error: ${reference.reason}` };
  const { t, angle } = whole.samples;
  const end = t[t.length - 1]!;
  const holds = traceHoldsFrom(t, angle, end - SETTLED_TAIL_FRACTION * end, band * Math.abs(m.finalValue!));
  if (!holds) return { metrics, reason: 'the whole scenario\'s angle is still moving over the last fifth of the run: no steady-state error' };
  return { metrics: { ...metrics, steadyStateError: reference.value! - angle[angle.length - 1]! }, reason: null };
}

function stopped(run: string, stop: TwinStop): string {
  return `the twin's ${run} run stopped at t = ${stop.time.toFixed(4)} s: ${stop.message}`;
}
