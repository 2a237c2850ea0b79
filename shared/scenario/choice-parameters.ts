/**
 * The scenario's text-valued parameters that forms edit, beside the numeric catalogue
 * (parameter-catalogue.ts): path, label and the choices with the words shown for each. The
 * choices are the schema's own enums (scenario-schema.ts); the spec checks they stay equal.
 */

export interface ChoiceParameter {
  path: string;
  /** Choice parameters have no symbol; "" keeps them usable where catalogue entries are. */
  symbol: '';
  label: string;
  group: 'controller';
  /** Stored value → words shown for it, in the order a select offers them. */
  choices: Readonly<Record<string, string>>;
  /** Whether the bench's tuning form edits it. */
  editable: boolean;
  /** The catalogue path it follows in forms; null to head its group (the mode decides what the gains mean). */
  after: string | null;
}

export const CHOICE_PARAMETERS: readonly ChoiceParameter[] = [
  { path: 'controller.mode', symbol: '', label: 'Controller', group: 'controller', choices: { pid: 'PID loop', 'open-loop': 'open loop' }, editable: true, after: null },
  { path: 'controller.derivativeOn', symbol: '', label: 'Derivative on', group: 'controller', choices: { error: 'error', measurement: 'measurement' }, editable: true, after: 'controller.kd' },
];

const byPath = new Map(CHOICE_PARAMETERS.map((c) => [c.path, c]));

/** The choice parameter at a path, or undefined. */
export function choiceParameterAt(path: string): ChoiceParameter | undefined {
  return byPath.get(path);
}

/**
 * The words for a stored choice; the stored value itself when the list has no words for it.
 * @example choiceText('controller.mode', 'pid') // 'PID loop'
 */
export function choiceText(path: string, value: string): string {
  return byPath.get(path)?.choices[value] ?? value;
}

/**
 * Whether a parameter means anything under a controller mode: an open loop has no controller, so
 * its gains, derivative settings and sample period are neither shown nor offered for editing.
 * @example parameterApplies('controller.kp', 'open-loop') // false
 */
export function parameterApplies(path: string, mode: string): boolean {
  return mode === 'pid' || !path.startsWith('controller.') || path === 'controller.mode';
}
