import type { InputTerm, Scenario } from '@kinetwin/shared/scenario/scenario-schema';

/** One labelled quantity on the bench's scenario panel. */
export interface ScenarioFact {
  /** Stable key for `track`. */
  key: string;
  label: string;
  value: string;
}

/**
 * A number for people: four significant figures, no trailing zeros, exponent only when tiny or huge.
 * @example formatQuantity(0.02, 'kg·m²') // "0.02 kg·m²"
 */
export function formatQuantity(value: number, unit = ''): string {
  const magnitude = Math.abs(value);
  const text =
    value === 0 ? '0' : magnitude >= 1e-3 && magnitude < 1e6 ? String(Number(value.toPrecision(4))) : value.toExponential(3).replace(/\.?0+e/, 'e');
  return unit ? `${text} ${unit}` : text;
}

/** The unit of a term's amplitude: rad or N·m, per second for a ramp, N·m·s for an impulse. */
function amplitudeUnit(term: InputTerm): string {
  const base = term.channel === 'reference' ? 'rad' : 'N·m';
  if (term.shape === 'impulse') return 'N·m·s';
  if (term.shape === 'ramp') return `${base}/s`;
  return base;
}

/**
 * One forcing term in words.
 * @example describeInputTerm({ channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0 }) // "reference step 0.5 rad at t = 0 s"
 */
export function describeInputTerm(term: InputTerm): string {
  const parts = [`${term.channel} ${term.shape} ${formatQuantity(term.amplitude, amplitudeUnit(term))} at t = ${formatQuantity(term.delay, 's')}`];
  if (term.shape === 'pulse' && term.width !== undefined) parts.push(`width ${formatQuantity(term.width, 's')}`);
  if ((term.shape === 'sine' || term.shape === 'cosine') && term.frequency !== undefined) parts.push(`ω0 ${formatQuantity(term.frequency, 'rad/s')}`);
  if (term.shape === 'decay' && term.rate !== undefined) parts.push(`λ ${formatQuantity(term.rate, '1/s')}`);
  return parts.join(', ');
}

/** The joint, controller and run quantities the bench shows beside the twin. */
export function scenarioFacts(scenario: Scenario): ScenarioFact[] {
  const { joint, controller } = scenario;
  const facts: ScenarioFact[] = [
    { key: 'J', label: 'Inertia J', value: formatQuantity(joint.inertia, 'kg·m²') },
    { key: 'b', label: 'Damping b', value: formatQuantity(joint.damping, 'N·m·s/rad') },
    { key: 'k', label: 'Stiffness k', value: formatQuantity(joint.stiffness, 'N·m/rad') },
    { key: 'N', label: 'Gear ratio N', value: formatQuantity(joint.gearRatio) },
    { key: 'mode', label: 'Controller', value: controller.mode === 'pid' ? 'PID loop' : 'open loop' },
  ];
  if (controller.mode === 'pid') {
    facts.push(
      { key: 'kp', label: 'kp', value: formatQuantity(controller.kp, 'N·m/rad') },
      { key: 'ki', label: 'ki', value: formatQuantity(controller.ki, 'N·m/(rad·s)') },
      { key: 'kd', label: 'kd', value: formatQuantity(controller.kd, 'N·m·s/rad') },
      { key: 'derivativeOn', label: 'Derivative on', value: controller.derivativeOn },
      {
        key: 'Tf',
        label: 'Derivative filter Tf',
        value: controller.derivativeFilter === 0 ? 'none' : formatQuantity(controller.derivativeFilter, 's'),
      },
    );
  }
  facts.push(
    { key: 'theta0', label: 'Initial angle', value: formatQuantity(scenario.initial.angle, 'rad') },
    { key: 'omega0', label: 'Initial velocity', value: formatQuantity(scenario.initial.velocity, 'rad/s') },
    { key: 'horizon', label: 'Horizon', value: formatQuantity(scenario.horizon, 's') },
  );
  return facts;
}
