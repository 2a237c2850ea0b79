import { parseScenario } from '../../scenario/parse-scenario';
import type { Scenario, ScenarioInput } from '../../scenario/scenario-schema';

/** Parses a scenario the specs build by hand; a typo there is the spec's fault, so it throws. */
export function scenarioOf(input: ScenarioInput): Scenario {
  const parsed = parseScenario(input);
  if (!parsed.ok) throw new Error(`spec scenario "${input.name}" is invalid: ${JSON.stringify(parsed.errors)}`);
  return parsed.value;
}

/** All cell indices of a plan of `cells` cells. */
export function allCells(cells: number): number[] {
  return Array.from({ length: cells }, (_, i) => i);
}
