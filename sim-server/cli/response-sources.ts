import { solveClosedForm, type ClosedFormSolution } from '../../shared/closed-form/index';
import { type Parsed } from '../../shared/validation/field-errors';
import { type ResponseMethod } from './cli-arguments';

/** A solved scenario as the commands need it, whatever method produced it. */
export interface SolvedScenario {
  method: ResponseMethod;
  closedForm: ClosedFormSolution;
}

/**
 * Solves a scenario document by the chosen method. The closed form is the only method today;
 * a simulated twin plugs in here as another case.
 */
export function solveByMethod(method: ResponseMethod, document: unknown): Parsed<SolvedScenario> {
  switch (method) {
    case 'closed-form': {
      const solved = solveClosedForm(document);
      return solved.ok ? { ok: true, value: { method, closedForm: solved.value } } : solved;
    }
  }
}
