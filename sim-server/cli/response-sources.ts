import { solveClosedForm, type ClosedFormSolution } from '../../shared/closed-form/index';
import type { Scenario } from '../../shared/scenario/scenario-schema';
import { simulateTwin, type TwinStop, type TwinTrace } from '../../shared/twin/twin-run';
import { twinScenarioErrors } from '../../shared/twin/twin-scenario-errors';
import { type Parsed } from '../../shared/validation/field-errors';
import { type ResponseMethod } from './cli-arguments';

/** A twin run on the command's grid. */
export interface TwinResponse {
  samples: TwinTrace;
  stop: TwinStop | null;
}

/** A solved scenario as the commands need it: the closed form, the twin, or both. */
export interface SolvedScenario {
  method: ResponseMethod;
  closedForm: ClosedFormSolution | null;
  twin: TwinResponse | null;
}

/**
 * Solves a scenario by the chosen method. The twin runs on the output grid k·dt, so its samples
 * line up with the closed form's row by row.
 * @param dt output spacing, s (the twin's only; the closed form is evaluated later on any grid)
 */
export function solveByMethod(method: ResponseMethod, scenario: Scenario, dt: number): Parsed<SolvedScenario> {
  let closedForm: ClosedFormSolution | null = null;
  let twin: TwinResponse | null = null;
  if (method !== 'sim') {
    const solved = solveClosedForm(scenario);
    if (!solved.ok) return solved;
    closedForm = solved.value;
  }
  if (method !== 'closed-form') {
    const errors = twinScenarioErrors(scenario);
    if (errors.length > 0) return { ok: false, errors };
    twin = simulateTwin(scenario, { dt });
  }
  return { ok: true, value: { method, closedForm, twin } };
}
