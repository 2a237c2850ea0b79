import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { FieldError, Parsed } from '@kinetwin/shared/validation/field-errors';

/** A numeric parameter the scenario page edits, named by its dotted scenario path. */
export interface EditableParameter {
  path: string;
  label: string;
  unit: string;
}

/** What the scenario page lets an editor change before saving a revision (numbers only). */
export const EDITABLE_PARAMETERS: readonly EditableParameter[] = [
  { path: 'joint.inertia', label: 'Inertia J', unit: 'kg·m²' },
  { path: 'joint.damping', label: 'Damping b', unit: 'N·m·s/rad' },
  { path: 'joint.stiffness', label: 'Stiffness k', unit: 'N·m/rad' },
  { path: 'joint.gearRatio', label: 'Gear ratio N', unit: '' },
  { path: 'controller.kp', label: 'kp', unit: 'N·m/rad' },
  { path: 'controller.ki', label: 'ki', unit: 'N·m/(rad·s)' },
  { path: 'controller.kd', label: 'kd', unit: 'N·m·s/rad' },
  { path: 'controller.derivativeFilter', label: 'Derivative filter Tf', unit: 's' },
  { path: 'horizon', label: 'Horizon', unit: 's' },
];

/** Unsaved text of edited parameters, keyed by dotted path; untouched ones have no entry. */
export type ParameterEdits = Readonly<Record<string, string>>;

// Plain decimal notation only: Number() alone would also take "0x10", "" and "Infinity".
const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i;

/** The number at a dotted path of a scenario, or undefined. */
export function parameterValue(scenario: Scenario, path: string): number | undefined {
  let node: unknown = scenario;
  for (const key of path.split('.')) {
    if (node === null || typeof node !== 'object') return undefined;
    node = (node as Record<string, unknown>)[key];
  }
  return typeof node === 'number' ? node : undefined;
}

/**
 * The scenario with the edits applied and validated by the shared scenario schema: text that is
 * not a plain decimal number gets its own message (the schema would only see NaN); every error
 * names the dotted field.
 * @example applyParameterEdits(gantry, { 'controller.kp': '6' }) // { ok: true, value: { …, controller: { …, kp: 6 } } }
 */
export function applyParameterEdits(base: Scenario, edits: ParameterEdits): Parsed<Scenario> {
  const draft = structuredClone(base) as unknown as Record<string, Record<string, unknown>>;
  const errors: FieldError[] = [];
  for (const [path, text] of Object.entries(edits)) {
    const keys = path.split('.');
    const name = keys.at(-1)!;
    const trimmed = text.trim();
    if (parameterValue(base, path) === undefined && !EDITABLE_PARAMETERS.some((p) => p.path === path)) {
      errors.push({ field: path, message: `${path} is not an editable parameter` });
    } else if (trimmed === '') {
      errors.push({ field: path, message: `${name} is required` });
    } else if (!DECIMAL.test(trimmed) || !Number.isFinite(Number(trimmed))) {
      errors.push({ field: path, message: `${name} must be a finite number, got "${text}"` });
    } else if (keys.length === 1) {
      (draft as Record<string, unknown>)[name] = Number(trimmed);
    } else {
      draft[keys[0]!]![name] = Number(trimmed);
    }
  }
  const parsed = parseScenario(draft);
  if (errors.length === 0) return parsed;
  const refused = new Set(errors.map((error) => error.field));
  return { ok: false, errors: [...errors, ...(parsed.ok ? [] : parsed.errors.filter((error) => !refused.has(error.field)))] };
}

/** The edits that still differ from the base scenario (a field typed back to its value is no edit). */
export function effectiveEdits(base: Scenario, edits: ParameterEdits): ParameterEdits {
  return Object.fromEntries(Object.entries(edits).filter(([path, text]) => Number(text.trim()) !== parameterValue(base, path) || text.trim() === ''));
}
