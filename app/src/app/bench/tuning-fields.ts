import type { InputTerm, Scenario } from '@kinetwin/shared/scenario/scenario-schema';

/** One editable quantity of the scenario, named by its dotted path. */
export interface TuningField {
  /** Dotted scenario path, also the input's `name` ("controller.kp"). */
  path: string;
  label: string;
  unit: string;
  /** Choices for a text field (a select); absent for a number. */
  choices?: readonly string[];
}

/** Fields shown together under one heading. */
export interface TuningGroup {
  key: string;
  title: string;
  fields: TuningField[];
}

function termUnit(term: InputTerm): string {
  if (term.shape === 'impulse') return 'N·m·s';
  const base = term.channel === 'reference' ? 'rad' : 'N·m';
  return term.shape === 'ramp' ? `${base}/s` : base;
}

function termFields(term: InputTerm, index: number): TuningField[] {
  const at = (key: string) => `inputs.${index}.${key}`;
  const fields: TuningField[] = [
    { path: at('amplitude'), label: 'Amplitude A', unit: termUnit(term) },
    { path: at('delay'), label: 'Delay a', unit: 's' },
  ];
  if (term.shape === 'pulse') fields.push({ path: at('width'), label: 'Width w', unit: 's' });
  if (term.shape === 'sine' || term.shape === 'cosine') fields.push({ path: at('frequency'), label: 'Frequency ω0', unit: 'rad/s' });
  if (term.shape === 'decay') fields.push({ path: at('rate'), label: 'Rate λ', unit: '1/s' });
  return fields;
}

/**
 * The tuning form's fields for a scenario: joint, controller, initial state and horizon, then
 * each forcing term's amplitude and delay with the extra quantity its shape has.
 */
export function tuningGroups(scenario: Scenario): TuningGroup[] {
  return [
    {
      key: 'joint',
      title: 'Joint',
      fields: [
        { path: 'joint.inertia', label: 'Inertia J', unit: 'kg·m²' },
        { path: 'joint.damping', label: 'Damping b', unit: 'N·m·s/rad' },
        { path: 'joint.stiffness', label: 'Stiffness k', unit: 'N·m/rad' },
        { path: 'joint.gearRatio', label: 'Gear ratio N', unit: '' },
      ],
    },
    {
      key: 'controller',
      title: 'Controller',
      fields: [
        { path: 'controller.mode', label: 'Mode', unit: '', choices: ['pid', 'open-loop'] },
        { path: 'controller.kp', label: 'kp', unit: 'N·m/rad' },
        { path: 'controller.ki', label: 'ki', unit: 'N·m/(rad·s)' },
        { path: 'controller.kd', label: 'kd', unit: 'N·m·s/rad' },
        { path: 'controller.derivativeOn', label: 'Derivative on', unit: '', choices: ['error', 'measurement'] },
        { path: 'controller.derivativeFilter', label: 'Derivative filter Tf', unit: 's' },
      ],
    },
    {
      key: 'run',
      title: 'Initial state and horizon',
      fields: [
        { path: 'initial.angle', label: 'θ(0−)', unit: 'rad' },
        { path: 'initial.velocity', label: "θ'(0−)", unit: 'rad/s' },
        { path: 'horizon', label: 'Horizon', unit: 's' },
      ],
    },
    ...scenario.inputs.map((term, index) => ({
      key: `inputs.${index}`,
      title: `Term ${index}: ${term.channel} ${term.shape}`,
      fields: termFields(term, index),
    })),
  ];
}
