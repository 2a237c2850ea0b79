import { parseScenario } from '../../scenario/parse-scenario';
import type { Scenario, ScenarioInput } from '../../scenario/scenario-schema';

/**
 * A parsed scenario for tests: a light joint under a PD loop stepping 0.5 rad, with `patch`
 * replacing whole top-level fields. Throws on invalid input so a test fails at its cause.
 */
export function buildScenario(patch: Partial<ScenarioInput> = {}): Scenario {
  const parsed = parseScenario({
    kind: 'kinetwin/scenario',
    version: 1,
    name: 'twin test',
    joint: { inertia: 0.05, damping: 0.02, stiffness: 0 },
    controller: { mode: 'pid', kp: 8, kd: 0.6, derivativeOn: 'measurement' },
    inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5 }],
    horizon: 2,
    ...patch,
  });
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.errors));
  return parsed.value;
}
