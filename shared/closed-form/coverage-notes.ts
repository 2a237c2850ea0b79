import type { Scenario } from '../scenario/scenario-schema';

/**
 * What of a scenario the closed form leaves out, in words, for its notes. The one place the
 * closed form's coverage is stated: a continuous loop, the scenario's own input shapes, no twin effects.
 * @example coverageNotes(scenario) // ['controller.samplePeriod (0.001 s) is ignored: …']
 */
export function coverageNotes(scenario: Scenario): string[] {
  const notes: string[] = [];
  if (scenario.controller.samplePeriod !== null) {
    notes.push(`controller.samplePeriod (${scenario.controller.samplePeriod} s) is ignored: the closed form treats the continuous loop`);
  }
  const recorded = scenario.recordedInputs ?? [];
  if (recorded.length > 0) {
    const which = recorded.map((term) => `${term.signal} of log "${term.logId}"`).join(', ');
    notes.push(
      `the closed form does not cover a recorded input (${which}): a logged signal has no Laplace transform among its shapes, so this solution leaves it out; only the twin replays it`,
    );
  }
  const offset = scenario.nonlinear.torqueOffset ?? 0;
  if (offset !== 0) notes.push(`nonlinear.torqueOffset (${offset} N·m) is left out, like the rest of the twin's effects: add it as a torque step at t = 0 to see it here`);
  return notes;
}
