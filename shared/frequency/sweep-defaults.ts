import type { InputChannel, Scenario } from '../scenario/scenario-schema';

// The measured sweep's defaults, apart from the sweep itself (which runs the twin) so that the
// browser can show them with the server's own rule.

/** The path a sweep measures unless told: the reference in closed loop, the torque in open loop. */
export function defaultSweepChannel(scenario: Scenario): InputChannel {
  return scenario.controller.mode === 'pid' ? 'reference' : 'torque';
}

/**
 * The largest amplitude among the scenario's own terms on that channel (steps, pulses, sines,
 * decays: impulses and ramps have other units), or null when it has none.
 */
export function largestOwnAmplitude(scenario: Scenario, channel: InputChannel): number | null {
  const own = scenario.inputs.filter((t) => t.channel === channel && t.shape !== 'impulse' && t.shape !== 'ramp').map((t) => Math.abs(t.amplitude));
  const largest = Math.max(0, ...own);
  return largest > 0 ? largest : null;
}

/**
 * The injected amplitude unless told: the largest of the scenario's own terms on that channel
 * (so the sweep moves the joint as its scenario does, limits and all), else 1.
 */
export function defaultSweepAmplitude(scenario: Scenario, channel: InputChannel): number {
  return largestOwnAmplitude(scenario, channel) ?? 1;
}
