import { inputTermSchema, MAX_INPUT_TERMS, type InputTerm, type Scenario } from '../scenario/scenario-schema';
import { parseWith, type Parsed } from '../validation/field-errors';
import type { KickTerm } from './twin-types';

/** What the kick rule needs to know about the run it would join. */
export interface KickContext {
  /** The run has reached its horizon or stopped at a bound. */
  done: boolean;
  /** Simulated time reached, s. */
  time: number;
  horizon: number;
  closedLoop: boolean;
  /** Forcing terms in the run so far, kicks included. */
  termCount: number;
  /** Stops closer than this are one (the run's merge tolerance), s. */
  mergeEps: number;
}

/**
 * Whether a kick may join a live run, and the term as it would be added: a valid forcing term
 * that starts neither in the run's past nor at or after its horizon, on a channel the loop has,
 * within the term limit. Errors as field errors, so a client can show them beside its input.
 * @example admitKick({ channel: 'torque', shape: 'impulse', amplitude: 0.01 }, context) // delay = context.time
 */
export function admitKick(term: KickTerm, run: KickContext): Parsed<InputTerm> {
  if (run.done) return { ok: false, errors: [{ field: '', message: `the run has ended at t = ${run.time.toFixed(4)} s; a kick needs a live run` }] };
  const parsed = parseWith(inputTermSchema, { ...term, delay: term.delay ?? run.time });
  if (!parsed.ok) return parsed;
  const added = parsed.value;
  if (added.delay < run.time - run.mergeEps) {
    return { ok: false, errors: [{ field: 'delay', message: `a kick cannot start at t = ${added.delay} s: the run is already at t = ${run.time} s` }] };
  }
  if (added.delay >= run.horizon) {
    return { ok: false, errors: [{ field: 'delay', message: `a kick must start before the horizon (${run.horizon} s), got ${added.delay} s` }] };
  }
  if (added.channel === 'reference' && !run.closedLoop) {
    return { ok: false, errors: [{ field: 'channel', message: 'a reference kick needs a closed loop (controller.mode "pid")' }] };
  }
  if (run.termCount >= MAX_INPUT_TERMS) return { ok: false, errors: [{ field: '', message: termLimitMessage() }] };
  // A kick a roundoff before now starts now, so it is not lost between two stops.
  if (added.delay < run.time) added.delay = run.time;
  return { ok: true, value: added };
}

function termLimitMessage(): string {
  return `at most ${MAX_INPUT_TERMS} input terms are allowed in one run, kicks included`;
}

/**
 * The scenario with terms appended to its forcing terms, after the ones it has: how a kick joins
 * a run, so the closed form of a kicked run (by superposition) and a draft that keeps a run's
 * kicks as input terms are the same scenario the twin ran. Refused past the term limit, as a kick is.
 * @example withAppendedTerms(scenario, [kick]) // { ok: true, value: { …, inputs: [...scenario.inputs, kick] } }
 */
export function withAppendedTerms(scenario: Scenario, terms: readonly InputTerm[]): Parsed<Scenario> {
  if (terms.length === 0) return { ok: true, value: scenario };
  if (scenario.inputs.length + terms.length > MAX_INPUT_TERMS) return { ok: false, errors: [{ field: 'inputs', message: termLimitMessage() }] };
  return { ok: true, value: { ...scenario, inputs: [...scenario.inputs, ...terms] } };
}
