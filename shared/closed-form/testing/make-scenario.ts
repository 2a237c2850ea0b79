import { parseScenario } from '../../scenario/parse-scenario';
import { type Scenario, type ScenarioInput } from '../../scenario/scenario-schema';
import { type ClosedFormOptions } from '../closed-form-options';
import { type ClosedFormSolution } from '../closed-form-solution';
import { solveClosedForm } from '../solve-closed-form';

/** A valid scenario for tests: the fields given override a unit open-loop joint. Throws on invalid input. */
export function makeScenario(patch: Partial<ScenarioInput>): Scenario {
  const parsed = parseScenario({
    kind: 'kinetwin/scenario',
    version: 1,
    name: 'test joint',
    joint: { inertia: 1, damping: 1, stiffness: 1 },
    controller: { mode: 'open-loop' },
    horizon: 10,
    ...patch,
  });
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.errors));
  return parsed.value;
}

/** Solves a test scenario, throwing on errors (the error paths have their own tests). */
export function solved(patch: Partial<ScenarioInput>, options?: ClosedFormOptions): ClosedFormSolution {
  const result = solveClosedForm(makeScenario(patch), options);
  if (!result.ok) throw new Error(JSON.stringify(result.errors));
  return result.value;
}
